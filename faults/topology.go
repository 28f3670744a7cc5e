package faults

import (
	"container/heap"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"
)

// IslandError reports buses that no source can feed.
type IslandError struct {
	Buses []string // names of the buses of the island, sorted
}

func (e *IslandError) Error() string {
	list := e.Buses
	more := ""
	if len(list) > 8 {
		list, more = list[:8], fmt.Sprintf(" and %d more", len(e.Buses)-8)
	}
	return fmt.Sprintf("island with no source: bus %s%s is not connected to any source or generator",
		strings.Join(quoteAll(list), ", "), more)
}

// ShiftLoopError reports transformers whose phase shifts disagree around a
// loop (for example a Dyn11 in parallel with a Dyn1).
type ShiftLoopError struct {
	Branch   string  // the branch that closes the loop
	Bus      string  // where the two routes meet
	Mismatch float64 // degrees between the two routes' phase shifts
}

func (e *ShiftLoopError) Error() string {
	return fmt.Sprintf("branch %q closes a loop whose transformer phase shifts disagree by %.0f° at bus %q; transformers in parallel must have the same clock number",
		e.Branch, e.Mismatch, e.Bus)
}

func quoteAll(s []string) []string {
	q := make([]string, len(s))
	for i, v := range s {
		q[i] = fmt.Sprintf("%q", v)
	}
	return q
}

// branchShiftDeg returns the positive-sequence angle added going from the
// From bus to the To bus of transformer t.
func branchShiftDeg(t *Transformer) float64 {
	lvShift := t.Group.ShiftDeg()
	if t.KVFrom >= t.KVTo {
		return lvShift // From is the HV side
	}
	return -lvShift
}

// ZoneAngles assigns every bus the positive-sequence phase shift of its
// zone in degrees, relative to the first bus of its connected part, and
// returns a *ShiftLoopError when transformers around a loop disagree.
func (n *Network) ZoneAngles() ([]float64, error) {
	nb := len(n.Buses)
	type edge struct {
		to, branch int
		deg        float64
	}
	adj := make([][]edge, nb)
	for b := 0; b < n.BranchCount(); b++ {
		f, t := n.BranchEnds(b)
		d := 0.0
		if t3, w, ok := n.Star(b); ok {
			d = -t3.Group.ShiftDeg(w) // from the winding's terminal to the star point, in the HV frame
		} else if n.IsTransformer(b) {
			d = branchShiftDeg(n.Transformer(b))
		}
		adj[f] = append(adj[f], edge{t, b, d})
		adj[t] = append(adj[t], edge{f, b, -d})
	}
	angle := make([]float64, nb)
	seen := make([]bool, nb)
	queue := make([]int, 0, nb)
	for start := 0; start < nb; start++ {
		if seen[start] {
			continue
		}
		seen[start] = true
		queue = append(queue[:0], start)
		for len(queue) > 0 {
			u := queue[0]
			queue = queue[1:]
			for _, e := range adj[u] {
				want := angle[u] + e.deg
				if !seen[e.to] {
					seen[e.to] = true
					angle[e.to] = normDeg(want)
					queue = append(queue, e.to)
					continue
				}
				if diff := math.Abs(normDeg(want - angle[e.to])); diff > 1e-6 {
					return nil, &ShiftLoopError{Branch: n.BranchName(e.branch), Bus: n.Buses[e.to].Name, Mismatch: diff}
				}
			}
		}
	}
	return angle, nil
}

// normDeg maps an angle to (−180°, 180°].
func normDeg(d float64) float64 {
	d = math.Mod(d, 360)
	if d <= -180 {
		d += 360
	} else if d > 180 {
		d -= 360
	}
	return d
}

// components labels the parts of a network connected through series
// admittances: link[b] says whether branch b joins its two ends. It returns
// a component label per bus.
func components(n *Network, link func(b int) bool) []int {
	parent := make([]int, len(n.Buses))
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(x int) int {
		for parent[x] != x {
			parent[x] = parent[parent[x]]
			x = parent[x]
		}
		return x
	}
	for b := 0; b < n.BranchCount(); b++ {
		if !link(b) {
			continue
		}
		f, t := n.BranchEnds(b)
		rf, rt := find(f), find(t)
		if rf != rt {
			if rf < rt {
				parent[rt] = rf
			} else {
				parent[rf] = rt
			}
		}
	}
	label := make([]int, len(parent))
	for i := range label {
		label[i] = find(i)
	}
	return label
}

// PartLabels labels every bus with the lowest index of the buses its
// branches connect it to: buses of one label make one connected part of
// the network, and no current passes between parts.
func (n *Network) PartLabels() []int {
	return components(n, func(int) bool { return true })
}

// Islands returns, for every connected part of the network (through all
// branches) that has no source and no generator, the sorted names of its
// buses. The parts are ordered by their first bus name.
func (n *Network) Islands() [][]string {
	label := components(n, func(int) bool { return true })
	fed := make(map[int]bool)
	for _, s := range n.Sources {
		fed[label[s.Bus]] = true
	}
	for _, g := range n.Generators {
		if g.InMax || g.InMin {
			fed[label[g.Bus]] = true
		}
	}
	unfed := make(map[int][]string)
	for i, l := range label {
		if !fed[l] {
			unfed[l] = append(unfed[l], n.Buses[i].Name)
		}
	}
	out := make([][]string, 0, len(unfed))
	for _, names := range unfed {
		sort.Strings(names)
		out = append(out, names)
	}
	sort.Slice(out, func(i, j int) bool { return out[i][0] < out[j][0] })
	return out
}

// RatioKV returns, per bus, the voltage of its zone when every transformer
// is taken at its rated winding ratio: each connected part starts from its
// highest-voltage bus at that bus's nominal voltage, lines keep the
// voltage, and a transformer multiplies it by kv_to/kv_from. A current I
// at bus x is I·v[x]/v[y] referred to bus y, as the engine carries it
// across transformers (an off-nominal ratio is modelled as an ideal
// transformer). Where parallel routes disagree (transformers in parallel
// with different ratios) the first route found in breadth-first order from
// the starting bus sets the voltage.
func (n *Network) RatioKV() []float64 {
	nb := len(n.Buses)
	type edge struct {
		to    int
		ratio float64 // v[to] = v[from]·ratio
	}
	adj := make([][]edge, nb)
	for b := 0; b < n.BranchCount(); b++ {
		f, t := n.BranchEnds(b)
		r := 1.0
		if n.IsTransformer(b) {
			tr := n.Transformer(b)
			r = tr.KVTo / tr.KVFrom
		}
		adj[f] = append(adj[f], edge{t, r})
		adj[t] = append(adj[t], edge{f, 1 / r})
	}
	// Start each part from its highest-voltage bus (the first of equals).
	label := components(n, func(int) bool { return true })
	start := map[int]int{}
	for i, l := range label {
		if s, ok := start[l]; !ok || n.Buses[i].KV > n.Buses[s].KV {
			start[l] = i
		}
	}
	v := make([]float64, nb)
	seen := make([]bool, nb)
	var queue []int
	for i := range n.Buses {
		s := start[label[i]]
		if seen[s] {
			continue
		}
		seen[s], v[s] = true, n.Buses[s].KV
		queue = append(queue[:0], s)
		for len(queue) > 0 {
			u := queue[0]
			queue = queue[1:]
			for _, e := range adj[u] {
				if !seen[e.to] {
					seen[e.to], v[e.to] = true, v[u]*e.ratio
					queue = append(queue, e.to)
				}
			}
		}
	}
	return v
}

// SourceDistance returns, per bus, its electrical distance from the grid
// sources: the smallest sum, over a path, of the per-unit magnitudes of
// the maximum-case positive-sequence impedances of a source and the
// branches to the bus (+Inf for a bus no source reaches). Generators do
// not count: the distance, and the direction of the network it gives,
// are the grid's and do not change with the size of embedded generation.
func (e *Engine) SourceDistance() []float64 {
	n := e.net
	d := e.cases[Max][pos].seqData
	dist := make([]float64, len(n.Buses))
	for i := range dist {
		dist[i] = inf
	}
	h := &distHeap{}
	for i, s := range n.Sources {
		if y := d.srcY[i]; y != 0 {
			if z := 1 / cmplx.Abs(y); z < dist[s.Bus] {
				dist[s.Bus] = z
				heap.Push(h, distItem{s.Bus, z})
			}
		}
	}
	adj := make([][]int, len(n.Buses))
	for b := 0; b < n.BranchCount(); b++ {
		f, t := n.BranchEnds(b)
		adj[f] = append(adj[f], b)
		adj[t] = append(adj[t], b)
	}
	for h.Len() > 0 {
		it := heap.Pop(h).(distItem)
		if it.d > dist[it.bus] {
			continue
		}
		for _, b := range adj[it.bus] {
			ft := d.branch[b].ft
			if ft == 0 {
				continue
			}
			f, t := n.BranchEnds(b)
			y := t
			if y == it.bus {
				y = f
			}
			if nd := it.d + 1/cmplx.Abs(ft); nd < dist[y] {
				dist[y] = nd
				heap.Push(h, distItem{y, nd})
			}
		}
	}
	return dist
}

type distItem struct {
	bus int
	d   float64
}

type distHeap []distItem

func (h distHeap) Len() int { return len(h) }
func (h distHeap) Less(i, j int) bool {
	if h[i].d != h[j].d {
		return h[i].d < h[j].d
	}
	return h[i].bus < h[j].bus
}
func (h distHeap) Swap(i, j int) { h[i], h[j] = h[j], h[i] }
func (h *distHeap) Push(x any)   { *h = append(*h, x.(distItem)) }
func (h *distHeap) Pop() any {
	old := *h
	it := old[len(old)-1]
	*h = old[:len(old)-1]
	return it
}
