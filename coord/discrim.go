package coord

import (
	"math"
	"runtime"
	"sync"
	"sync/atomic"

	"tripgrade/curves"
	"tripgrade/faults"
)

// The fault-by-fault pass. Every fault the study solves — at every bus,
// close in at both ends of every branch and at the line positions, in both
// cases and all four kinds — is judged on its own: which devices must
// clear it (the nearest device that operates on every side from which
// fault current flows into the faulted element), which other devices
// operate and how soon, and when the fault is isolated. Where a fault is
// fed from more than one side the devices open in time order and the
// network is solved again after each opening (faults.Engine.SolveOpen), so
// the remaining devices see the redistributed current.

// node is one fault node: a bus, with its bus fault and the close-in
// faults of the branches there, or a point along a line.
type node struct {
	place faults.Place
	elems []nodeElem
}

// nodeElem is one faulted element's fault at a node.
type nodeElem struct {
	el    element
	place faults.Place // the fault place (the bus, a close-in or a line position)
	index int          // the element's index: buses first, then branches
}

// nodes lists every fault node of the study in a fixed order.
func (x *netIndex) nodes() []node {
	n := x.n
	nb := len(n.Buses)
	var out []node
	for k := range n.Buses {
		if n.Buses[k].Internal {
			continue // a three-winding transformer's star point: no node of the plant
		}
		if !x.region.bus(k) {
			continue
		}
		nd := node{place: faults.AtBus(k), elems: []nodeElem{{el: element{bus: k, branch: -1}, place: faults.AtBus(k), index: k}}}
		for _, b := range x.adj[k] {
			frac := 0.0
			if endAt(n, b, k) == faults.To {
				frac = 1
			}
			nd.elems = append(nd.elems, nodeElem{el: element{bus: -1, branch: b}, place: faults.OnBranch(b, frac), index: nb + b})
		}
		out = append(out, nd)
	}
	for b := range n.Lines {
		if !x.region.branch(n, b) {
			continue
		}
		for _, f := range x.s.Faults.Fractions() {
			out = append(out, node{place: faults.OnBranch(b, f), elems: []nodeElem{{el: element{bus: -1, branch: b}, place: faults.OnBranch(b, f), index: nb + b}}})
		}
	}
	return out
}

// faultKey orders the faults of the pass, so that ties keep the first.
type faultKey struct {
	node, elem int
	cs         faults.Case
	kind       faults.Kind
	sweep      int
}

func (a faultKey) less(b faultKey) bool {
	switch {
	case a.node != b.node:
		return a.node < b.node
	case a.elem != b.elem:
		return a.elem < b.elem
	case a.cs != b.cs:
		return a.cs < b.cs
	case a.kind != b.kind:
		return a.kind < b.kind
	}
	return a.sweep < b.sweep
}

// opRecord is a device's worst operation for a fault outside its zone.
type opRecord struct {
	valid            bool
	slack            float64 // margin − required
	margin, required float64
	key              faultKey
	place            faults.Place
	scale            float64 // share of the bolted current (1: a solved fault)
	dA, reliefA      float64
	dQty, reliefQty  Quantity
	forward          bool // the device's current flows into its branch
	dS, reliefS      float64
	relief           int
	tripped          bool // the device operates before the fault is isolated
	count            int  // faults where it operates outside its zone
}

// worse reports whether a figure of the given slack at the given fault
// would replace the record (the details of a record are costly to build).
// Figures are compared at a nanosecond, then by fault: a total order, so
// the record kept does not depend on which worker judged which fault.
func (r *opRecord) worse(slack float64, key faultKey) bool {
	a, b := toNanosecond(slack), toNanosecond(r.slack)
	return !r.valid || a < b || (a == b && key.less(r.key))
}

// toNanosecond rounds a time in seconds to the nanosecond, for comparing
// figures whose last bits depend on the order of the arithmetic.
func toNanosecond(s float64) float64 {
	if math.IsInf(s, 0) || math.IsNaN(s) {
		return s
	}
	return math.Round(s*1e9) / 1e9
}

// offer keeps o when it is worse than the record (the count of faults is
// kept by the caller).
func (r *opRecord) offer(o opRecord) {
	c := r.count
	if r.worse(o.slack, o.key) {
		*r = o
		r.valid = true
	}
	r.count = c
}

// clearRecord is the slowest clearing of one element's faults.
type clearRecord struct {
	valid    bool
	isoS     float64 // +Inf: not cleared
	key      faultKey
	place    faults.Place
	must     []int
	failed   []int
	sequence []event
	board    int
	count    int
	noDevice bool // fed, but no device of the study acts on any side
	above    int  // the fuse whose last tabulated clearing time is isoS (its current is above its tables), or −1
	// undef is the must-clear device whose curve gives no time at the
	// fault's current (isoS is then NaN) when undefSet; unjudged counts
	// the element's faults left unjudged so.
	undef    int
	undefSet bool
	unjudged int
	// earthBy is 1 + the device whose declared earth-fault protection a
	// fault is left to (0: none); declared counts the element's faults
	// left so, and declaredBy names the first such device (1 + index).
	earthBy, declared, declaredBy int
}

// noteUndef names device d as one whose curve gives no time; of several,
// the first in study order, so that the finding does not depend on which
// worker judged which fault.
func (r *clearRecord) noteUndef(d int) {
	if !r.undefSet || d < r.undef {
		r.undef, r.undefSet = d, true
	}
}

func (r *clearRecord) offer(o clearRecord) {
	if math.IsNaN(o.isoS) && o.earthBy > 0 {
		r.declared++
		if r.declaredBy == 0 || o.earthBy < r.declaredBy {
			r.declaredBy = o.earthBy
		}
		return
	}
	if math.IsNaN(o.isoS) {
		// A fault whose must-clear device's curve gives no time: counted,
		// and named, apart from the judged ones.
		r.unjudged++
		r.noteUndef(o.undef)
		return
	}
	c := r.count + 1
	a, b := toNanosecond(o.isoS), toNanosecond(r.isoS)
	worse, tie := a > b, a == b
	board := -1
	if r.valid {
		board = r.board
	}
	if !r.valid || worse || (tie && o.key.less(r.key)) {
		// The unjudged faults are the element's, not the record's.
		unjudged, undef, undefSet := r.unjudged, r.undef, r.undefSet
		declared, declaredBy := r.declared, r.declaredBy
		*r = o
		r.valid = true
		r.unjudged, r.undef, r.undefSet = unjudged, undef, undefSet
		r.declared, r.declaredBy = declared, declaredBy
	}
	if board >= 0 && r.board < 0 {
		r.board = board
	}
	r.count = c
}

// event is one opening in a fault's sequence: a device's breaker (or a
// fuse), or a source or generator taken out by its own protection.
type event struct {
	dev            int // −1 for an infeed
	infeed         string
	atS            float64 // when it opens
	intactA, openA float64 // the device's current in the intact network and when it opened
}

// tally is one worker's results, merged at the end.
type tally struct {
	ops    []opRecord
	clears []clearRecord
	// outside names, per element, the sources and generators that feed
	// some fault of it with no device of the study between.
	outside map[int][]string
	// ownFaults counts the faults fed directly by each infeed whose own
	// protection the study declares.
	ownFaults map[string]int
	// ownOnly marks the elements some fault of which the study's devices
	// leave entirely to declared own protection.
	ownOnly map[int]bool
	judged  int
}

func (x *netIndex) newTally() *tally {
	return &tally{ops: make([]opRecord, len(x.s.Devices)), clears: make([]clearRecord, len(x.n.Buses)+x.n.BranchCount()),
		outside: map[int][]string{}, ownFaults: map[string]int{}, ownOnly: map[int]bool{}}
}

func (t *tally) merge(o *tally) {
	for i := range o.ops {
		n := t.ops[i].count + o.ops[i].count
		if o.ops[i].valid {
			t.ops[i].offer(o.ops[i])
		}
		t.ops[i].count = n
	}
	for i := range o.clears {
		oc := o.clears[i]
		if oc.valid {
			n := t.clears[i].count + oc.count - 1
			t.clears[i].offer(oc)
			t.clears[i].count = n
		}
		t.clears[i].unjudged += oc.unjudged
		t.clears[i].declared += oc.declared
		if oc.declaredBy > 0 && (t.clears[i].declaredBy == 0 || oc.declaredBy < t.clears[i].declaredBy) {
			t.clears[i].declaredBy = oc.declaredBy
		}
		if oc.undefSet {
			t.clears[i].noteUndef(oc.undef)
		}
	}
	for i, names := range o.outside {
		t.outside[i] = union(t.outside[i], names)
	}
	for i := range o.ownOnly {
		t.ownOnly[i] = true
	}
	for name, n := range o.ownFaults {
		t.ownFaults[name] += n
	}
	t.judged += o.judged
}

// runPass judges every fault of the study on every CPU.
func (x *netIndex) runPass(crit Criteria) (*tally, error) {
	tallies, err := overNodes(x, x.newTally, func(ws *workspace, t *tally, i int, nd node) error {
		for _, cs := range faults.Cases {
			if err := x.judgeNode(ws, t, crit, i, nd, cs); err != nil {
				return err
			}
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	total := x.newTally()
	for _, t := range tallies {
		total.merge(t)
	}
	return total, nil
}

// visitOrder returns the indices of nodes in the order the workers take
// them: each bus, then the points along the lines that leave it, so that
// faults judged in turn lie near one another.
func (x *netIndex) visitOrder(nodes []node) []int {
	order := make([]int, 0, len(nodes))
	lineNodes := make([][]int, len(x.n.Lines))
	for i, nd := range nodes {
		if !nd.place.IsBus() {
			lineNodes[nd.place.Branch] = append(lineNodes[nd.place.Branch], i)
		}
	}
	for i, nd := range nodes {
		if !nd.place.IsBus() {
			continue
		}
		order = append(order, i)
		for _, b := range x.adj[nd.place.Bus] {
			if f, _ := x.n.BranchEnds(b); f == nd.place.Bus && b < len(lineNodes) {
				order = append(order, lineNodes[b]...)
				lineNodes[b] = nil
			}
		}
	}
	for _, ls := range lineNodes { // a line whose From end is no node's bus
		order = append(order, ls...)
	}
	return order
}

// nodeChunk is how many consecutive fault nodes a worker takes at a time:
// nodes numbered near one another lie near one another in the network, and
// a worker that judges them in turn finds the impedance-matrix columns
// they share still in its cache.
const nodeChunk = 32

// overNodes calls visit for every fault node of the study, on every CPU:
// each worker has its own workspace and its own result (made by fresh),
// and the results come back in worker order for the caller to merge. The
// error of a node stops its worker; the first worker's error is returned.
func overNodes[R any](x *netIndex, fresh func() R, visit func(ws *workspace, r R, i int, nd node) error) ([]R, error) {
	nodes := x.nodes()
	order := x.visitOrder(nodes)
	workers := runtime.GOMAXPROCS(0)
	results := make([]R, workers)
	errs := make([]error, workers)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			ws := x.newWorkspace()
			r := fresh()
			results[w] = r
			for {
				start := int(next.Add(nodeChunk) - nodeChunk)
				if start >= len(nodes) {
					return
				}
				for _, i := range order[start:min(start+nodeChunk, len(nodes))] {
					if err := visit(ws, r, i, nodes[i]); err != nil {
						errs[w] = err
						return
					}
				}
			}
		}()
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return results, nil
}

// judgeNode judges the faults of one node in one case.
func (x *netIndex) judgeNode(ws *workspace, t *tally, crit Criteria, ni int, nd node, cs faults.Case) error {
	eng := x.eng
	sol, err := eng.Solve(eng.CaseFault(nd.place, faults.LLL, cs))
	if err != nil || !sol.Energised() {
		return err
	}
	sol = sol.Use(ws.sc).UseColumns(ws.cols)
	p := x.newProbe(&ws.intact, sol, nil)
	i, j, _ := sol.Node()
	p.explore(i, j)
	devs := p.devices(ws.devs[:0])
	ws.devs = devs
	nv := &view{p: p, buf: ws.search, el: nd.elems[0].el, cs: cs}
	for _, k := range faults.Kinds {
		nv.kinds[k] = sol.WithKind(k, eng.CaseFault(nd.place, k, cs).ZOhm)
	}
	for _, k := range faults.Kinds {
		ws.node[k].reset(nv, k)
		for _, d := range devs {
			ws.node[k].get(d)
		}
	}
	clear(ws.swept)
	for ei, ne := range nd.elems {
		v, err := x.elementView(ws, p, sol, ne, cs)
		if err != nil {
			return err
		}
		ws.forgetStates()
		if cs == faults.Max {
			// The sweep runs from the maximum-case fault down to the
			// minimum-case fault at the same place.
			low, err := eng.Solve(eng.CaseFault(ne.place, faults.LLL, faults.Min))
			if err != nil {
				return err
			}
			for _, k := range faults.Kinds {
				v.sweepTo[k] = 0
				if low.Energised() {
					lo := low.WithKind(k, eng.CaseFault(ne.place, k, faults.Min).ZOhm)
					v.sweepTo[k] = faultSize(lo) / faultSize(v.kinds[k])
				}
			}
		}
		big := faultSize(v.kinds[faults.LLL])
		for _, k := range faults.Kinds {
			// An earth fault on a system with no path to earth draws no
			// current: there is nothing to clear.
			if faultSize(v.kinds[k]) <= isolatedShare*big {
				continue
			}
			key := faultKey{node: ni, elem: ei, cs: cs, kind: k}
			if err := x.judge(ws, t, crit, v, devs, ne, k, key); err != nil {
				return err
			}
		}
	}
	return nil
}

// elementView is the view of the faults of one element of a node, whose
// LLL fault of case cs is sol with responses in probe p: a close-in fault
// at a branch end sees that branch's own ends from its side of the
// breaker.
func (x *netIndex) elementView(ws *workspace, p *probe, sol faults.Solution, ne nodeElem, cs faults.Case) (*view, error) {
	eng := x.eng
	// One view per worker, overwritten for each element: an element's
	// view is used only while its faults are judged.
	v := &ws.elem
	*v = view{p: p, buf: ws.search, el: ne.el, cs: cs}
	if !ne.place.IsBus() && (ne.place.Frac == 0 || ne.place.Frac == 1) {
		ci, err := eng.Solve(eng.CaseFault(ne.place, faults.LLL, cs))
		if err != nil {
			return nil, err
		}
		ci = ci.Share(ws.sc)
		v.hasOwn = true
		v.own[faults.From] = ci.Response(faults.Point{Branch: ne.el.branch, End: faults.From})
		v.own[faults.To] = ci.Response(faults.Point{Branch: ne.el.branch, End: faults.To})
	}
	for _, k := range faults.Kinds {
		v.kinds[k] = sol.WithKind(k, eng.CaseFault(ne.place, k, cs).ZOhm)
	}
	return v, nil
}

// faultSize is the largest phase current into a fault.
func faultSize(s faults.Solution) float64 { return s.FaultCurrents().PhaseMaxA() }

// devices appends to out the devices at the points the probe computed.
func (p *probe) devices(out []int) []int {
	for _, pi := range p.w.explored {
		out = append(out, p.x.devAt[pi/2][pi%2]...)
	}
	return out
}

// timing is how one device responds to one fault: the time to its trip
// (a relay's operating time, a fuse's clearing time), the time that counts
// when it is the upstream device of a margin (a relay's operating time, a
// fuse's melting time), and what it sees.
//
// A fuse's tables end somewhere. Below the first current of its clearing
// table it is taken not to operate (its tables start at its minimum
// melting current); above the last, it clears within the last clearing
// time (above: trip is that upper bound) and melts at some time below the
// last melting time that the table does not tell (up is then 0, so that
// nothing is graded against it as if it were slow).
type timing struct {
	trip, up float64
	seen     Seen
	undef    bool // the curve gives no time (a current that is not a number)
	above    bool // a fuse above its tables: trip is an upper bound, the melting time unknown
	// govA is the current that sets the device's time (timeTable.governA),
	// once govSet.
	govA   float64
	govSet bool
}

func (x *netIndex) timeOf(d int, s Seen, band Band) timing {
	tm := x.timers[d]
	t := timing{trip: noTime, up: noTime, seen: s}
	var tr float64
	var st curves.Status
	if tm.Dev.Kind == Relay && band == Nominal {
		tr, st, t.govA = tm.operateGoverning(&s)
		t.govSet = true
	} else {
		tr, st = tm.OperateSeen(&s, band)
	}
	if st == curves.Operates {
		t.trip = tr
	} else if st == curves.Undefined {
		if tm.Dev.Kind == Fuse && !math.IsNaN(s.PhaseA()) {
			if lo, hi := tm.Dev.Clear.Span(); s.PhaseA() > hi {
				pts := tm.Dev.Clear.Points()
				t.trip, t.up, t.above = pts[len(pts)-1].TimeS, 0, true
			} else if s.PhaseA() < lo {
				return t
			}
		}
		if !t.above {
			t.undef = true
		}
	}
	if tm.Dev.Kind == Relay {
		t.up = t.trip
	} else if u, st := tm.MeltSeen(&s, band); st == curves.Operates {
		t.up = u
	}
	return t
}

// breaker returns the time from a device's trip to its opening.
func (x *netIndex) breaker(d int) float64 {
	if x.s.Devices[d].Kind == Relay {
		return x.s.Devices[d].BreakerS
	}
	return 0
}

// required returns the margin device up must keep over device down, whose
// time as the downstream device is tDown (the same rules as grading).
func (x *netIndex) required(crit Criteria, up, down int, tDown float64) float64 {
	u, d := &x.s.Devices[up], &x.s.Devices[down]
	pairS := x.pairMarginS(up, down)
	switch {
	case u.Kind == Fuse:
		return 0 // judged as clearing ≤ FuseMeltRatio × melting: see marginOf
	case pairS > 0:
		return pairS
	case d.Kind == Fuse:
		return crit.MarginFuseS
	case crit.Components != nil:
		k := crit.Components
		return (2*d.Accuracy.ClassPct+k.CTErrorPct)/100*tDown + d.BreakerS + k.OvertravelS + k.SafetyS
	}
	return crit.MarginS
}

// pairMarginS is the margin the study sets for device up over device down,
// as grading takes it: a [[pair]] entry's margin_s, else the upstream
// relay's own margin_s; 0 when the criteria's applies.
func (x *netIndex) pairMarginS(up, down int) float64 {
	if s, ok := x.pairMargins[[2]int{up, down}]; ok {
		return s
	}
	if u := &x.s.Devices[up]; u.Kind == Relay && u.MarginS > 0 {
		return u.MarginS
	}
	return 0
}

// marginOf returns the margin of device up (operating at upS as the
// upstream device) over device down (tripping at downTrip) and the margin
// required. An upstream fuse must not melt before the downstream device
// has cleared, with clearing at most FuseMeltRatio of its melting time.
func (x *netIndex) marginOf(crit Criteria, up, down int, upS, downTrip float64) (margin, req float64) {
	if x.s.Devices[up].Kind == Fuse {
		clear := downTrip + x.breaker(down)
		return timeDiff(upS, clear), (1 - crit.FuseMeltRatio) * upS
	}
	return timeDiff(upS, downTrip), x.required(crit, up, down, downTrip)
}

// timeDiff is a − b, exactly 0 where the two times agree to 1e-12 of
// themselves: two devices with the same curve and current operate at the
// same time, whatever the last bits of the arithmetic that timed them.
func timeDiff(a, b float64) float64 {
	d := a - b
	if math.Abs(d) <= 1e-12*math.Max(math.Abs(a), math.Abs(b)) {
		return 0
	}
	return d
}
