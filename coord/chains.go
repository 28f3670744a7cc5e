package coord

import (
	"math"
	"sort"

	"tripgrade/faults"
)

// element is the faulted element: a bus, or a branch (a fault along it or
// close in at one of its terminals).
type element struct {
	bus    int // the faulted bus, or −1
	branch int // the faulted branch, or −1
}

// flowEps is the share of the fault current below which a branch counts as
// carrying none towards the fault.
const flowEps = 1e-6

// view is one fault (an element's fault place in one case and network
// state) as the devices see it.
type view struct {
	p  *probe
	el element
	cs faults.Case
	// own are the responses at the faulted branch's two ends when they
	// differ from the node's (a close-in fault, whose current passes the
	// current transformer at its end).
	own    [2]faults.Response
	hasOwn bool
	kinds  [4]faults.Solution // the fault of each kind
	// sweepTo is, per kind, the share of the fault's current down to which
	// margins are swept (the minimum case's current at the same place);
	// 1 or more: no sweep (the minimum case itself).
	sweepTo [4]float64
}

func (v *view) at(pt faults.Point) faults.Response {
	if v.hasOwn && pt.Branch == v.el.branch {
		return v.own[pt.End]
	}
	return v.p.at(pt)
}

// seen returns what device d sees for the fault of kind k.
func (v *view) seen(d int, k faults.Kind) Seen {
	dev := &v.p.x.s.Devices[d]
	r := v.at(dev.Point)
	sol := v.kinds[k]
	s := NewSeen(r.Currents(sol), r.Voltages(sol), r.Prefault())
	if dev.Dir.ByCurrent {
		s.Pol = v.neutral(dev.Dir.PolarisingPoint, sol)
	}
	if dev.NeutralCT != nil {
		s.Neutral = v.neutral(*dev.NeutralCT, sol)
	}
	return s
}

// neutral returns the current flowing from earth into the star point of
// the transformer whose star-side end is pt: the residual current its
// winding sends out of that terminal. For a fault close in at that
// terminal (between the current transformer and the winding) the fault's
// own residual current is part of it.
func (v *view) neutral(pt faults.Point, sol faults.Solution) complex128 {
	n := -v.at(pt).Currents(sol).Residual()
	if pl := sol.Fault().Place; !pl.IsBus() && pl.Branch == pt.Branch &&
		((pl.Frac == 0 && pt.End == faults.From) || (pl.Frac == 1 && pt.End == faults.To)) {
		n += sol.FaultCurrents().Residual()
	}
	return n
}

// feedsInto reports whether fault current flows out of point pt's branch
// into its bus.
func (v *view) feedsInto(pt faults.Point) bool { return real(v.at(pt).Flow()) < -flowEps }

// feedsFrom reports whether fault current flows from point pt's bus into
// its branch.
func (v *view) feedsFrom(pt faults.Point) bool { return real(v.at(pt).Flow()) > flowEps }

// clearing is who must clear one fault: on every side from which fault
// current flows into the faulted element, the nearest device that operates
// (or, for zones, that sees the fault in its tripping direction).
type clearing struct {
	must []int
	// direct names the sources and generators that feed the fault along a
	// chain without any device of the study: their part of the fault is
	// left to protection outside the study. own lists those among them
	// whose own protection the study declares.
	direct []string
	own    []infeedRef
	// failed lists the devices on chains that reach a source or generator
	// without any device that operates: the fault is not cleared from
	// that side.
	failed []int
	// board is the switchboard bus the faulted branch is fed from without
	// a device of its own there (−1 when none).
	board int
}

// search finds who must clear the fault: ops says whether a device acts
// (operates, or sees the fault); devices in past are passed over as if
// they had failed.
func (v *view) search(ops func(d int) bool, past map[int]bool) clearing {
	x := v.p.x
	n := x.n
	c := clearing{board: -1}
	must := map[int]bool{}
	failed := map[int]bool{}
	direct := map[string]bool{}
	var visited map[int]bool // per side: each side is searched on its own
	act := func(pt faults.Point) bool {
		any := false
		for _, d := range x.devAt[pt.Branch][pt.End] {
			if !past[d] && ops(d) {
				must[d] = true
				any = true
			}
		}
		return any
	}
	owned := map[infeedRef]bool{}
	reached := func(y int, passed []int) {
		undeclared := false
		for _, in := range x.infeed[v.cs][y] {
			switch {
			case in.own && len(passed) == 0:
				owned[in] = true
			case !in.own && len(passed) == 0:
				direct[in.name] = true
			case !in.own:
				undeclared = true
			}
		}
		// Devices on a chain from a source that do not operate fail to
		// clear its infeed (unless its own protection is declared to).
		if undeclared {
			for _, d := range passed {
				failed[d] = true
			}
		}
	}
	var step func(y, via int, passed []int)
	step = func(y, via int, passed []int) {
		if visited[y] {
			return
		}
		visited[y] = true
		reached(y, passed)
		for _, b := range x.adj[y] {
			if b == via {
				continue
			}
			near := faults.Point{Branch: b, End: endAt(n, b, y)}
			if !v.feedsInto(near) || act(near) {
				continue
			}
			far := faults.Point{Branch: b, End: endAt(n, b, farBus(n, b, y))}
			if act(far) {
				continue
			}
			more := append(append(append([]int(nil), passed...), x.devAt[b][near.End]...), x.devAt[b][far.End]...)
			step(farBus(n, b, y), b, more)
		}
	}
	if v.el.bus >= 0 {
		visited = map[int]bool{}
		step(v.el.bus, -1, nil)
	} else {
		b := v.el.branch
		f, t := n.BranchEnds(b)
		for _, e := range [2]faults.End{faults.From, faults.To} {
			visited = map[int]bool{}
			pt := faults.Point{Branch: b, End: e}
			if !v.feedsFrom(pt) || act(pt) {
				continue
			}
			y := f
			if e == faults.To {
				y = t
			}
			if len(x.devAt[b][e]) == 0 && x.board[y] {
				c.board = y
			}
			step(y, b, x.devAt[b][e])
		}
	}
	c.must = sortedKeys(must)
	c.failed = sortedKeys(failed)
	for name := range direct {
		c.direct = append(c.direct, name)
	}
	sort.Strings(c.direct)
	for in := range owned {
		c.own = append(c.own, in)
	}
	sort.Slice(c.own, func(i, j int) bool { return c.own[i].name < c.own[j].name })
	return c
}

func sortedKeys(m map[int]bool) []int {
	out := make([]int, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Ints(out)
	return out
}

// sees reports whether device d sees the fault of kind k in a tripping
// direction of one of its stages: the topological question behind zones,
// whatever the pickups.
func (v *view) sees(d int, k faults.Kind) bool {
	t := v.p.x.timers[d]
	s := v.seen(d, k)
	return t.Sees(&s)
}

// Sees reports whether a device has a stage that looks the way the
// current it sees flows: a fuse or a non-directional stage whenever any
// current of its quantity flows, a directional stage when its element
// decides for its direction.
func (t *Timer) Sees(s *Seen) bool {
	if t.Dev.Kind == Fuse {
		return s.PhaseA() > 0
	}
	var pd [3]Direction
	var gd Direction
	if t.directional {
		pd, gd = t.Directions(s)
	}
	for _, st := range t.Dev.Stages {
		switch {
		case st.Measures == Phase && st.Direction == NonDirectional:
			if s.PhaseA() > 0 {
				return true
			}
		case st.Measures == Phase:
			for _, d := range pd {
				if d == st.Direction {
					return true
				}
			}
		case st.Direction == NonDirectional || st.Direction == gd:
			if s.groundA(t.Dev) > 0 {
				return true
			}
		}
	}
	return false
}

// noTime marks a device that does not operate.
var noTime = math.Inf(1)
