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

// Beyond the faulted element's own ends, the search follows a path back
// only while it carries current enough to operate a device at that
// voltage level (the exploration's threshold, see probe.explore): a path
// below it leads to no device that operates. It is left to the sequence:
// when the fault is still fed through it once the devices on the larger
// paths have opened, it then carries more and the search of that state
// follows it.

// view is one fault (an element's fault place in one case and network
// state) as the devices see it.
type view struct {
	p   *probe
	buf *searchBuf
	el  element
	cs  faults.Case
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

// neutral returns the neutral current of the transformer whose star-side
// end is pt (see neutralCurrent).
func (v *view) neutral(pt faults.Point, sol faults.Solution) complex128 {
	return neutralCurrent(sol, v.at(pt).Currents(sol), pt)
}

// feedsInto reports whether at least share of the fault current flows out
// of point pt's branch into its bus.
func (v *view) feedsInto(pt faults.Point, share float64) bool { return real(v.at(pt).Flow()) < -share }

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
	// earthBy lists the devices passed on chains to an infeed that name
	// the protection clearing the earth faults they cannot see
	// (earth_faults_cleared_by).
	earthBy []int
	// board is the switchboard bus the faulted branch is fed from without
	// a device of its own there (−1 when none).
	board int
	// sides counts the faulted element's ends, or the branches at a
	// faulted bus, through which fault current flows into it.
	sides int
}

// searchBuf is a worker's reusable memory for search.
type searchBuf struct {
	busStamp  []uint32 // visited buses, per side
	devStamp  []uint32 // devices already listed as must
	failStamp []uint32 // devices already listed as failed
	gen       uint32
	passed    []int
}

func (x *netIndex) newSearchBuf() *searchBuf {
	return &searchBuf{busStamp: make([]uint32, len(x.n.Buses)), devStamp: make([]uint32, len(x.s.Devices)),
		failStamp: make([]uint32, len(x.s.Devices))}
}

func (b *searchBuf) next() uint32 {
	b.gen++
	if b.gen == 0 {
		clear(b.busStamp)
		clear(b.devStamp)
		clear(b.failStamp)
		b.gen = 1
	}
	return b.gen
}

// search finds who must clear the fault: ops says whether a device acts
// (operates, or sees the fault); a device for which past is true is
// passed over as if it had failed (past may be nil).
func (v *view) search(ops func(d int) bool, past func(d int) bool) clearing {
	x := v.p.x
	n := x.n
	buf := v.buf
	c := clearing{board: -1}
	listGen := buf.next() // must and failed lists for this search
	var sideGen uint32
	act := func(pt faults.Point) bool {
		any := false
		for _, d := range x.devAt[pt.Branch][pt.End] {
			if (past == nil || !past(d)) && ops(d) {
				if buf.devStamp[d] != listGen {
					buf.devStamp[d] = listGen
					c.must = append(c.must, d)
				}
				any = true
			}
		}
		return any
	}
	reached := func(y int) {
		for _, d := range buf.passed {
			if x.s.Devices[d].EarthFaultsBy != "" && !contains(c.earthBy, d) {
				c.earthBy = append(c.earthBy, d)
			}
		}
		undeclared := false
		for _, in := range x.infeed[v.cs][y] {
			if v.p.removed(in) {
				continue
			}
			switch {
			case in.own:
				// Its own protection removes the infeed no device of the
				// study operates for (on this chain none does).
				c.own = appendInfeed(c.own, in)
			case len(buf.passed) == 0:
				c.direct = appendName(c.direct, in.name)
			case !in.own:
				undeclared = true
			}
		}
		// Devices on a chain from a source that do not operate fail to
		// clear its infeed (unless its own protection is declared to).
		if undeclared {
			for _, d := range buf.passed {
				if buf.failStamp[d] != listGen {
					buf.failStamp[d] = listGen
					c.failed = append(c.failed, d)
				}
			}
		}
	}
	var step func(y, via int)
	step = func(y, via int) {
		if buf.busStamp[y] == sideGen {
			return
		}
		buf.busStamp[y] = sideGen
		reached(y)
		for _, b := range x.adj[y] {
			if b == via {
				continue
			}
			near := faults.Point{Branch: b, End: endAt(n, b, y)}
			own := via < 0 || via == v.el.branch // the faulted element's own sides
			if !v.feedsInto(near, flowEps) || (!own && !v.p.couldOperate(v.at(near), y)) {
				continue
			}
			if via < 0 {
				c.sides++
			}
			if act(near) {
				continue
			}
			far := faults.Point{Branch: b, End: endAt(n, b, farBus(n, b, y))}
			if act(far) {
				continue
			}
			mark := len(buf.passed)
			buf.passed = append(append(buf.passed, x.devAt[b][near.End]...), x.devAt[b][far.End]...)
			step(farBus(n, b, y), b)
			buf.passed = buf.passed[:mark]
		}
	}
	buf.passed = buf.passed[:0]
	if v.el.bus >= 0 {
		sideGen = buf.next()
		step(v.el.bus, -1)
	} else {
		b := v.el.branch
		f, t := n.BranchEnds(b)
		for _, e := range [2]faults.End{faults.From, faults.To} {
			pt := faults.Point{Branch: b, End: e}
			if !v.feedsFrom(pt) {
				continue
			}
			c.sides++
			if act(pt) {
				continue
			}
			y := f
			if e == faults.To {
				y = t
			}
			if len(x.devAt[b][e]) == 0 && x.board[y] {
				c.board = y
			}
			sideGen = buf.next()
			buf.passed = append(buf.passed[:0], x.devAt[b][e]...)
			step(y, b)
		}
	}
	sort.Ints(c.must)
	sort.Ints(c.failed)
	sort.Ints(c.earthBy)
	sort.Strings(c.direct)
	sort.Slice(c.own, func(i, j int) bool { return c.own[i].name < c.own[j].name })
	return c
}

func appendName(list []string, name string) []string {
	for _, s := range list {
		if s == name {
			return list
		}
	}
	return append(list, name)
}

func appendInfeed(list []infeedRef, in infeedRef) []infeedRef {
	for _, s := range list {
		if s == in {
			return list
		}
	}
	return append(list, in)
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
	if t.Directional() {
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
