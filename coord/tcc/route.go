package tcc

import (
	"tripgrade/coord"
	"tripgrade/faults"
)

// route returns the branches between upstream device u and downstream
// device d: from what u looks into (its branch, or its bus when it is an
// incomer looking into the bus) to the bus where d sits. It prefers a
// route that only runs downstream (the way the fault current flows) and
// falls back to any route; nil when none joins them. Routes are found
// breadth first in branch order, so the same study gives the same route.
func (a *Atlas) route(u, d int) []int { return a.routeOf(u, d, coord.Phase) }

// routeOf is route between the two devices' currents of quantity q: for
// the ground stages of a relay on a neutral CT, from or to the star-side
// bus of its transformer (busFor).
func (a *Atlas) routeOf(u, d int, q coord.Quantity) []int {
	a.mu.Lock()
	defer a.mu.Unlock()
	key := routeKey{u, d, q}
	if r, ok := a.routes[key]; ok {
		return r
	}
	r := a.findRoute(u, d, q)
	a.routes[key] = r
	return r
}

// routeKey names a route: its two devices and the quantity it joins.
type routeKey struct {
	u, d int
	q    coord.Quantity
}

func (a *Atlas) findRoute(u, d int, q coord.Quantity) []int {
	s, t := a.in.Study, a.in.Topology
	n := s.Network
	du := s.Devices[u]
	start := a.busFor(u, q)
	var first []int
	if neutral := q == coord.Residual && du.NeutralCT != nil; !neutral && t.IntoBranch(du.Point) {
		b := du.Point.Branch
		first = []int{b}
		start = endBus(n, b, t.Downstream[b])
	}
	target := a.busFor(d, q)
	for _, downOnly := range []bool{true, false} {
		if r, ok := a.walk(start, target, downOnly); ok {
			return append(append([]int(nil), first...), r...)
		}
	}
	return nil
}

// walk finds the branches from bus start to bus target, breadth first.
func (a *Atlas) walk(start, target int, downOnly bool) ([]int, bool) {
	t := a.in.Topology
	n := a.in.Study.Network
	if start == target {
		return nil, true
	}
	type step struct{ bus, via, prev int }
	steps := []step{{bus: start, via: -1, prev: -1}}
	seen := map[int]bool{start: true}
	for k := 0; k < len(steps); k++ {
		x := steps[k].bus
		for _, b := range t.BranchesAt(x) {
			from, to := n.BranchEnds(b)
			y := from
			if y == x {
				y = to
			}
			if downOnly && endBus(n, b, t.Downstream[b]) != y {
				continue
			}
			if seen[y] {
				continue
			}
			seen[y] = true
			steps = append(steps, step{bus: y, via: b, prev: k})
			if y == target {
				var out []int
				for j := len(steps) - 1; steps[j].via >= 0; j = steps[j].prev {
					out = append([]int{steps[j].via}, out...)
				}
				return out, true
			}
		}
	}
	return nil, false
}

// endBus returns the bus at end e of branch b.
func endBus(n *faults.Network, b int, e faults.End) int {
	from, to := n.BranchEnds(b)
	if e == faults.From {
		return from
	}
	return to
}

// transformersBetween returns the transformers on the route from u down
// to d.
func (a *Atlas) transformersBetween(u, d int) []int {
	n := a.in.Study.Network
	var out []int
	for _, b := range a.route(u, d) {
		if n.IsTransformer(b) {
			out = append(out, b)
		}
	}
	return out
}

// passesZero reports whether transformer b carries zero-sequence current
// from one side to the other: only a star–star unit with both star points
// earthed does; a delta winding (or an unearthed star) stops it.
func passesZero(n *faults.Network, b int) bool {
	tr := n.Transformer(b)
	g := tr.Group
	return g.HV == faults.EarthedStar && g.LV == faults.EarthedStar && !tr.NeutralFrom.Isolated && !tr.NeutralTo.Isolated
}

// starDelta reports whether transformer b joins a star winding to a delta
// winding: a phase-to-phase or earth fault on one side appears on the
// other with another distribution among the phases (the 2/√3 and 1/√3 of
// IEEE Std 242, ch. 3).
func starDelta(n *faults.Network, b int) bool {
	g := n.Transformer(b).Group
	return (g.HV == faults.Delta) != (g.LV == faults.Delta)
}

// zeroBlocked reports whether a transformer between u and d stops
// zero-sequence current.
func (a *Atlas) zeroBlocked(u, d int) bool {
	n := a.in.Study.Network
	for _, b := range a.routeOf(u, d, coord.Residual) {
		if n.IsTransformer(b) && !passesZero(n, b) {
			return true
		}
	}
	return false
}

// starDeltaBetween returns the first star–delta transformer between u and
// d, or −1.
func (a *Atlas) starDeltaBetween(u, d int) int {
	n := a.in.Study.Network
	for _, b := range a.transformersBetween(u, d) {
		if starDelta(n, b) {
			return b
		}
	}
	return -1
}
