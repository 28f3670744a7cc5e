package coord

import (
	"math"
	"math/cmplx"

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
	// tau is, per bus, the current·kV below which a branch there leads to
	// no device that could operate (see explore).
	tau []float64
	// infeed lists the sources and generators in service at each bus, per
	// case.
	infeed [2][][]infeedRef
	// board marks the buses where two or more branches have a device at
	// that bus: switchboards, whose circuits each have their own device.
	board []bool
}

func newNetIndex(s *Study, eng *faults.Engine, ratio []float64) *netIndex {
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
		x.timers = append(x.timers, NewTimer(d))
		x.devBus = append(x.devBus, DeviceBus(n, *d))
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
	x.tau = explorationThresholds(s, x.devBus, ratio)
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

// explorationThresholds gives each bus the current·kV below which the
// exploration of a fault stops: half the smallest pickup·kV of the devices
// at that bus's nominal voltage, or, at a voltage with no devices, of the
// devices above 1 kV. With one driving point and branches of similar X/R
// a network carries no circulating current, so a device beyond a branch
// carries no more than the currents that cross into the explored part;
// a branch below half the smallest pickup around it leads to nothing that
// operates.
func explorationThresholds(s *Study, devBus []int, ratio []float64) []float64 {
	n := s.Network
	level := map[float64]float64{}
	hv := math.Inf(1)
	for i := range s.Devices {
		d := &s.Devices[i]
		p := math.Inf(1)
		for _, q := range []Quantity{Phase, Residual} {
			if a := d.Pickup(q); a > 0 {
				p = math.Min(p, a)
			}
		}
		if math.IsInf(p, 1) {
			continue
		}
		pu := p * ratio[devBus[i]]
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
		if math.IsInf(t, 1) {
			t = 0 // no device anywhere above 1 kV: explore everything
		}
		tau[k] = explorationShare * t
	}
	return tau
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
	// The responses, by point index, valid where stamp equals gen; the
	// arrays belong to the worker and are reused from probe to probe.
	stamp *[]uint32
	resp  *[]faults.Response
	gen   uint32
	// explored lists the points whose responses the exploration computed.
	explored []int
	seenBus  map[int]bool
	// seqMax bounds each sequence's fault current over the kinds, per unit.
	seqMax [3]float64
}

// slots hold a probe's responses by point index, valid where stamp equals
// gen; they are reused from probe to probe.
type slots struct {
	stamp []uint32
	resp  []faults.Response
	gen   uint32
}

// workspace is one worker's reusable memory: one cache and one set of
// response slots for the intact network, one for the network with branch
// ends open.
type workspace struct {
	sc, scOpen   *faults.Scratch
	intact, open slots
}

func (x *netIndex) newWorkspace() *workspace {
	np := 2 * x.n.BranchCount()
	mk := func() slots { return slots{stamp: make([]uint32, np), resp: make([]faults.Response, np)} }
	return &workspace{sc: x.eng.NewScratch(), scOpen: x.eng.NewScratch(), intact: mk(), open: mk()}
}

// newProbe starts a probe of solution sol (already attached to a scratch
// cache) in the given response slots, emptying them.
func (x *netIndex) newProbe(w *slots, sol faults.Solution, open []faults.Point) *probe {
	w.gen++
	if w.gen == 0 {
		clear(w.stamp)
		w.gen = 1
	}
	p := &probe{x: x, sol: sol, open: open, stamp: &w.stamp, resp: &w.resp, gen: w.gen, seenBus: map[int]bool{}}
	for _, k := range faults.Kinds {
		s := sol.WithKind(k, x.eng.CaseFault(sol.Fault().Place, k, sol.Fault().Case).ZOhm)
		fc := s.FaultCurrents()
		for q := range p.seqMax {
			p.seqMax[q] = math.Max(p.seqMax[q], cmplx.Abs(fc.Seq[q]))
		}
	}
	return p
}

// at returns the response of point pt.
func (p *probe) at(pt faults.Point) faults.Response {
	i := pointIndex(pt)
	if (*p.stamp)[i] != p.gen {
		(*p.resp)[i] = p.sol.Response(pt)
		(*p.stamp)[i] = p.gen
		p.explored = append(p.explored, i)
	}
	return (*p.resp)[i]
}

// bound is an upper bound on any current (phase or residual) at a point
// over every fault kind, in amperes: |Ix| ≤ Σ|k_q|·|I_q| and |3I0| =
// 3|k_0||I_0|.
func (p *probe) bound(r faults.Response) float64 {
	var sum float64
	for q, k := range r.Coefficients() {
		sum += cmplx.Abs(k) * p.seqMax[q]
	}
	return 3 * sum
}

// explore walks out from the fault node over branches that could carry
// current enough to operate a device, computing the responses of both
// ends of every branch at each bus it reaches. A branch is followed when
// the bound on its current, as current·kV at the far bus, reaches the far
// bus's threshold.
func (p *probe) explore(start ...int) {
	n := p.x.n
	queue := append([]int(nil), start...)
	for _, k := range start {
		p.seenBus[k] = true
	}
	for len(queue) > 0 {
		k := queue[0]
		queue = queue[1:]
		for _, b := range p.x.adj[k] {
			y := farBus(n, b, k)
			rn := p.at(faults.Point{Branch: b, End: endAt(n, b, k)})
			rf := p.at(faults.Point{Branch: b, End: endAt(n, b, y)})
			if p.seenBus[y] {
				continue
			}
			flow := math.Max(p.bound(rn)*p.x.ratio[k], p.bound(rf)*p.x.ratio[y])
			if flow >= p.x.tau[y] {
				p.seenBus[y] = true
				queue = append(queue, y)
			}
		}
	}
}
