package coord

import (
	"math"
	"math/cmplx"
	"sort"
	"strconv"

	"tripgrade/faults"
)

// netIndex is what the fault-by-fault pass needs of a study, computed
// once: who sits where, what feeds each bus, and how far to look for
// devices that could operate.
type netIndex struct {
	s      *Study
	eng    *faults.Engine
	n      *faults.Network
	adj    [][]int    // branches at each bus
	devAt  [][2][]int // devices at each branch end
	timers []*Timer
	devBus []int
	ratio  []float64 // bus voltage by winding ratios
	// tauPhase and tauGround are, per bus, the phase and residual
	// current·kV below which a branch there leads to no device that could
	// operate (see explore).
	tauPhase, tauGround []float64
	// region, when not nil, is the part of the network whose faults the
	// pass judges (an outage's island: see reusable).
	region *region
	// infeed lists the sources and generators in service at each bus, per
	// case.
	infeed [2][][]infeedRef
	// board marks the buses where two or more branches have a device at
	// that bus: switchboards, whose circuits each have their own device.
	board []bool
	// limits hold each device's lowest phase and ground pickups, for a
	// quick test that it cannot operate.
	limits []pickupLimits
	// topo is the study's topology, once it is known (the zone pass that
	// builds it runs without).
	topo *Topology
	// isl tells whether an opening cuts a fault off from every infeed.
	isl *islands
	// pairMargins are the [[pair]] entries' own margins by (upstream,
	// downstream) device.
	pairMargins map[[2]int]float64
	// hook, when not nil, receives every margin judged (Options.Margins;
	// margins.go).
	hook func(*MarginSample)
}

// pickupLimits are a relay's lowest pickups (+Inf where it has no stage of
// that quantity); cheap is false where the quick test does not apply (a
// fuse, a relay with a neutral CT or current polarisation).
type pickupLimits struct {
	phaseA, groundA float64
	cheap           bool
}

// newNetIndex indexes the study's network and devices for the pass; timers
// are the devices' timers when the caller has them (nil: made here).
func newNetIndex(s *Study, eng *faults.Engine, ratio []float64, timers []*Timer) *netIndex {
	n := s.Network
	x := &netIndex{s: s, eng: eng, n: n, ratio: ratio,
		adj: make([][]int, len(n.Buses)), devAt: make([][2][]int, n.BranchCount())}
	for b := 0; b < n.BranchCount(); b++ {
		f, t := n.BranchEnds(b)
		x.adj[f] = append(x.adj[f], b)
		x.adj[t] = append(x.adj[t], b)
	}
	for i := range s.Devices {
		d := &s.Devices[i]
		x.devAt[d.Point.Branch][d.Point.End] = append(x.devAt[d.Point.Branch][d.Point.End], i)
		x.devBus = append(x.devBus, DeviceBus(n, *d))
	}
	if timers == nil {
		for i := range s.Devices {
			timers = append(timers, NewTimer(&s.Devices[i]))
		}
	}
	x.timers = timers
	x.limits = make([]pickupLimits, len(s.Devices))
	for i := range s.Devices {
		d := &s.Devices[i]
		if d.Kind != Relay || d.NeutralCT != nil || d.Dir.ByCurrent {
			continue
		}
		lim := pickupLimits{phaseA: math.Inf(1), groundA: math.Inf(1), cheap: true}
		if a := d.Pickup(Phase); a > 0 {
			lim.phaseA = a
		}
		if a := d.Pickup(Residual); a > 0 {
			lim.groundA = a
		}
		x.limits[i] = lim
	}
	x.board = make([]bool, len(n.Buses))
	for k := range n.Buses {
		with := 0
		for _, b := range x.adj[k] {
			if len(x.devAt[b][endAt(n, b, k)]) > 0 {
				with++
			}
		}
		x.board[k] = with >= 2
	}
	own := map[string]bool{}
	for _, name := range s.OwnProtection {
		own[name] = true
	}
	for _, cs := range faults.Cases {
		x.infeed[cs] = make([][]infeedRef, len(n.Buses))
		for i, src := range n.Sources {
			x.infeed[cs][src.Bus] = append(x.infeed[cs][src.Bus], infeedRef{name: src.Name, source: true, index: i, own: own[src.Name]})
		}
		for i, g := range n.Generators {
			if (cs == faults.Max && g.InMax) || (cs == faults.Min && g.InMin) {
				x.infeed[cs][g.Bus] = append(x.infeed[cs][g.Bus], infeedRef{name: g.Name, index: i, own: own[g.Name]})
			}
		}
	}
	x.tauPhase, x.tauGround = explorationThresholds(s, x.devBus, ratio)
	x.isl = newIslands(n, x.adj)
	byName := map[string]int{}
	for i, d := range s.Devices {
		byName[d.Name] = i
	}
	x.pairMargins = map[[2]int]float64{}
	for _, r := range s.Pairs {
		u, okU := byName[r.Upstream]
		d, okD := byName[r.Downstream]
		if _, seen := x.pairMargins[[2]int{u, d}]; okU && okD && !seen && !r.Exclude && r.MarginS > 0 {
			x.pairMargins[[2]int{u, d}] = r.MarginS
		}
	}
	return x
}

// infeedRef is a source or generator at a bus.
type infeedRef struct {
	name   string
	source bool // a [[source]] (else a generator)
	index  int  // in the network's list of its kind
	// own is true when the study declares that its own protection (the
	// supply's, or the machine's) removes its infeed of faults that no
	// device of the study stands between.
	own bool
}

// explorationShare: a branch is followed while its current could be at
// least this share of the smallest pickup of the devices at its voltage
// level (referred by winding ratios).
const explorationShare = 0.5

// explorationThresholds gives each bus, for phase currents and for
// residual currents, the current·kV below which the exploration of a fault
// stops: half the smallest pickup·kV of the stages of that quantity (a
// fuse's lowest melting current counts as a phase pickup) at that bus's
// nominal voltage, or, at a voltage with no such stages, of those above
// 1 kV. With one driving point and branches of similar X/R a network
// carries no circulating current, so a device beyond a branch carries no
// more than the currents that cross into the explored part; a branch
// below half the smallest pickup around it leads to nothing that
// operates.
func explorationThresholds(s *Study, devBus []int, ratio []float64) (phase, ground []float64) {
	n := s.Network
	one := func(q Quantity) []float64 {
		level := map[float64]float64{}
		hv := math.Inf(1)
		for i := range s.Devices {
			a := s.Devices[i].Pickup(q)
			if !(a > 0) {
				continue
			}
			pu := a * ratio[devBus[i]]
			kv := n.Buses[devBus[i]].KV
			if old, ok := level[kv]; !ok || pu < old {
				level[kv] = pu
			}
			if kv > 1 {
				hv = math.Min(hv, pu)
			}
		}
		tau := make([]float64, len(n.Buses))
		for k, b := range n.Buses {
			t, ok := level[b.KV]
			if !ok {
				t = hv
			}
			tau[k] = explorationShare * t // +Inf: no such stage anywhere, nothing to find
		}
		return tau
	}
	return one(Phase), one(Residual)
}

// endAt returns the end of branch b at bus k.
func endAt(n *faults.Network, b, k int) faults.End {
	if f, _ := n.BranchEnds(b); f == k {
		return faults.From
	}
	return faults.To
}

// farBus returns the bus at the other end of branch b from bus k.
func farBus(n *faults.Network, b, k int) int {
	f, t := n.BranchEnds(b)
	if f == k {
		return t
	}
	return f
}

// pointIndex numbers branch ends: 2·branch + end.
func pointIndex(pt faults.Point) int { return 2*pt.Branch + int(pt.End) }

// probe holds one fault node's solution in one network state (intact or
// with branch ends open) and the responses of the points asked about.
type probe struct {
	x    *netIndex
	sol  faults.Solution
	open []faults.Point
	off  faults.Opening // what the network state has taken out
	// w holds the responses, by point index, valid where its stamp equals
	// gen, the points computed and the buses the exploration reached; its
	// arrays belong to the worker and are reused from probe to probe.
	w   *slots
	gen uint32
	// seqMax bounds each sequence's fault current over the kinds, per unit
	// (the response coefficients are amperes per unit of fault current).
	seqMax [3]float64
}

// slots hold a probe's responses by point index, valid where stamp equals
// gen, the points computed (in the order computed) and the buses the
// exploration reached (where busStamp equals gen); they are reused from
// probe to probe.
type slots struct {
	stamp    []uint32
	resp     []faults.Response
	explored []int
	busStamp []uint32
	gen      uint32
}

// workspace is one worker's reusable memory: one cache and one set of
// response slots for the intact network, one for the network with branch
// ends open.
type workspace struct {
	sc     *faults.Scratch
	cols   *faults.Columns
	intact slots
	// tables hold the timings of the intact network and of the states of a
	// sequence (two, used in turn).
	tables [3]*timeTable
	// node holds, per fault kind, the timings of a node's devices as its
	// bus (or line) fault sees them, which every element of the node
	// shares but for the devices on a close-in fault's own branch.
	node [4]*timeTable
	// swept marks the sweeps done at the current node.
	swept  map[sweepKey]bool
	seq    *seqState
	search *searchBuf
	// devs holds the devices of the node being judged.
	devs []int
	// elem is the view of the element being judged (elementView).
	elem view
	// scales holds the shares of a sweep (sweepScales).
	scales []float64
	// states remember the network states (open branch ends) the sequences
	// of one element's faults reach: the four fault kinds usually open the
	// same devices, and a state's responses serve them all.
	states   [stateCacheSize]*stateEntry
	nextSlot int
}

// columnCacheSize is how many impedance-matrix columns a worker remembers:
// the fault nodes and opened branch ends of the faults it judges in turn,
// which lie near one another.
const columnCacheSize = 16

// stateCacheSize is how many network states a worker remembers.
const stateCacheSize = 4

// stateEntry is one remembered network state.
type stateEntry struct {
	key   string
	valid bool
	sol   faults.Solution
	sc    *faults.Scratch
	slots slots
	probe *probe
}

// forgetStates empties the state cache (a new element or case).
func (ws *workspace) forgetStates() {
	for _, e := range ws.states {
		e.valid = false
	}
}

// openingKey names a set of openings.
func openingKey(o faults.Opening) string {
	ends := append([]faults.Point(nil), o.Ends...)
	sort.Slice(ends, func(i, j int) bool { return pointIndex(ends[i]) < pointIndex(ends[j]) })
	b := make([]byte, 0, 8*len(ends)+8)
	for _, pt := range ends {
		b = strconv.AppendInt(b, int64(pointIndex(pt)), 36)
		b = append(b, ',')
	}
	b = append(b, '|')
	for _, i := range o.Sources {
		b = strconv.AppendInt(b, int64(i), 36)
		b = append(b, ',')
	}
	b = append(b, '|')
	for _, i := range o.Generators {
		b = strconv.AppendInt(b, int64(i), 36)
		b = append(b, ',')
	}
	return string(b)
}

// state returns the probe of fault place pl (case cs) in the network with
// opening o, from the cache or solved now; ok is false when the fault is
// not energised there.
func (x *netIndex) state(ws *workspace, pl faults.Place, cs faults.Case, o faults.Opening) (*probe, error) {
	key := openingKey(o)
	for _, e := range ws.states {
		if e.valid && e.key == key {
			return e.probe, nil
		}
	}
	sol, err := x.eng.SolveOpenWith(x.eng.CaseFault(pl, faults.LLL, cs), o, ws.cols)
	if err != nil {
		return nil, err
	}
	e := ws.states[ws.nextSlot]
	ws.nextSlot = (ws.nextSlot + 1) % stateCacheSize
	e.key, e.valid, e.sol = key, true, sol.Use(e.sc)
	e.probe = x.newProbe(&e.slots, e.sol, o.Ends)
	e.probe.off = o
	return e.probe, nil
}

func (x *netIndex) newWorkspace() *workspace {
	np := 2 * x.n.BranchCount()
	mk := func() slots {
		return slots{stamp: make([]uint32, np), resp: make([]faults.Response, np), busStamp: make([]uint32, len(x.n.Buses))}
	}
	ws := &workspace{sc: x.eng.NewScratch(), cols: x.eng.NewColumns(columnCacheSize), intact: mk(), seq: x.newSeqState(), search: x.newSearchBuf(), swept: map[sweepKey]bool{}}
	for i := range ws.tables {
		ws.tables[i] = x.newTimeTable()
	}
	for i := range ws.node {
		ws.node[i] = x.newTimeTable()
	}
	for i := range ws.states {
		ws.states[i] = &stateEntry{sc: x.eng.NewScratch(), slots: mk()}
	}
	return ws
}

// newProbe starts a probe of solution sol (already attached to a scratch
// cache) in the given response slots, emptying them.
func (x *netIndex) newProbe(w *slots, sol faults.Solution, open []faults.Point) *probe {
	w.gen++
	if w.gen == 0 {
		clear(w.stamp)
		clear(w.busStamp)
		w.gen = 1
	}
	w.explored = w.explored[:0]
	p := &probe{x: x, sol: sol, open: open, w: w, gen: w.gen}
	for _, k := range faults.Kinds {
		s := sol.WithKind(k, x.eng.CaseFault(sol.Fault().Place, k, sol.Fault().Case).ZOhm)
		fc := s.FaultCurrents()
		base := x.eng.BaseCurrentA(s.FaultBus())
		for q := range p.seqMax {
			p.seqMax[q] = math.Max(p.seqMax[q], cmplx.Abs(fc.Seq[q])/base)
		}
	}
	return p
}

// at returns the response of point pt.
func (p *probe) at(pt faults.Point) faults.Response {
	i := pointIndex(pt)
	w := p.w
	if w.stamp[i] != p.gen {
		w.resp[i] = p.sol.Response(pt)
		w.stamp[i] = p.gen
		w.explored = append(w.explored, i)
	}
	return w.resp[i]
}

// bounds are upper bounds on a point's phase and residual currents over
// every fault kind, in amperes: |Ix| ≤ Σ|k_q|·|I_q| and |3I0| =
// 3|k_0||I_0|.
func (p *probe) bounds(r faults.Response) (phase, residual float64) {
	k := r.Coefficients()
	for q := range k {
		phase += abs(k[q]) * p.seqMax[q]
	}
	return phase, 3 * abs(k[0]) * p.seqMax[0]
}

// removed reports whether a source or generator is out of the probe's
// network state (taken out by its own protection).
func (p *probe) removed(in infeedRef) bool {
	list := p.off.Generators
	if in.source {
		list = p.off.Sources
	}
	for _, i := range list {
		if i == in.index {
			return true
		}
	}
	return false
}

// couldOperate reports whether a point at bus k carries, for some fault
// kind, current enough to be worth following: at least the bus's
// exploration threshold of phase or residual current.
func (p *probe) couldOperate(r faults.Response, k int) bool {
	ph, res := p.bounds(r)
	return ph*p.x.ratio[k] >= p.x.tauPhase[k] || res*p.x.ratio[k] >= p.x.tauGround[k]
}

// explore walks out from the fault node over branches that could carry
// current enough to operate a device, computing the responses of both
// ends of every branch at each bus it reaches. A branch is followed when
// the bound on its phase or residual current, as current·kV, reaches the
// far bus's threshold for that quantity.
func (p *probe) explore(start ...int) {
	x := p.x
	n := x.n
	queue := append([]int(nil), start...)
	seen := p.w.busStamp
	for _, k := range start {
		seen[k] = p.gen
	}
	for len(queue) > 0 {
		k := queue[0]
		queue = queue[1:]
		for _, b := range x.adj[k] {
			y := farBus(n, b, k)
			rn := p.at(faults.Point{Branch: b, End: endAt(n, b, k)})
			rf := p.at(faults.Point{Branch: b, End: endAt(n, b, y)})
			if seen[y] == p.gen {
				continue
			}
			phN, resN := p.bounds(rn)
			phF, resF := p.bounds(rf)
			ph := math.Max(phN*x.ratio[k], phF*x.ratio[y])
			res := math.Max(resN*x.ratio[k], resF*x.ratio[y])
			if ph >= x.tauPhase[y] || res >= x.tauGround[y] {
				seen[y] = p.gen
				queue = append(queue, y)
			}
		}
	}
}
