package faults

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sync"
	"sync/atomic"

	"tripgrade/faults/sparse"
)

var inf = math.Inf(1)

// Engine holds the factored sequence networks of both cases of a Network.
// It is read-only after New and safe for concurrent use.
type Engine struct {
	net   *Network
	set   Settings
	rot   []complex128 // e^{jθ} of each bus's zone phase shift
	ibase []float64    // base current at each bus, A
	zbase []float64    // base impedance at each bus, Ω
	cases [2][3]*seqNet
	duty  dutyNets // the peak and steady-state networks, built on first use
}

// seqNet is one factored sequence network.
type seqNet struct {
	*seqData
	row  []int32 // bus → matrix row; −1: no path to the reference in this sequence
	fac  *sparse.Factor
	diag []complex128 // Z_kk by matrix row
	// ends holds, by branch, Z between the branch's two ends, where
	// endsKnown (both ends have a row and the branch couples them).
	ends      []complex128
	endsKnown []bool
	paths     []atomic.Pointer[sparse.Path]
	ws        sync.Pool
}

// New checks the network, builds the positive, negative and zero sequence
// networks of both cases and factors them.
func New(n *Network, set Settings) (*Engine, error) {
	if err := n.check(); err != nil {
		return nil, err
	}
	if isl := n.Islands(); len(isl) > 0 {
		return nil, &IslandError{Buses: isl[0]}
	}
	angle, err := n.ZoneAngles()
	if err != nil {
		return nil, err
	}
	for _, f := range set.LineFractions {
		if !(f > 0 && f < 1) {
			return nil, fmt.Errorf("line fault position %g must lie strictly between 0 and 1", f)
		}
	}
	for _, r := range []float64{set.EarthFaultOhm, set.EarthFaultOhmLV, set.PhaseFaultOhm} {
		if !(r >= 0 && r <= maxImpedance) {
			return nil, fmt.Errorf("fault resistance %g Ω must lie within 0 to %g Ω", r, float64(maxImpedance))
		}
	}
	e := &Engine{net: n, set: set}
	nb := len(n.Buses)
	e.rot = make([]complex128, nb)
	e.ibase = make([]float64, nb)
	e.zbase = make([]float64, nb)
	base := n.baseMVA()
	for i, b := range n.Buses {
		e.rot[i] = cmplx.Rect(1, angle[i]*math.Pi/180)
		e.ibase[i] = base * 1000 / (math.Sqrt(3) * b.KV)
		e.zbase[i] = b.KV * b.KV / base
	}
	for _, cs := range Cases {
		d, err := assemble(n, set, cs)
		if err != nil {
			return nil, err
		}
		for s := range d {
			if s == neg && sameNetwork(d[pos], d[neg]) {
				e.cases[cs][neg] = e.cases[cs][pos]
				continue
			}
			sn, err := factorSeq(n, d[s])
			if err != nil {
				var sb *singularBus
				if errors.As(err, &sb) {
					return nil, conditionError(n, d[s], cs, s, sb.bus)
				}
				return nil, fmt.Errorf("%s case, %s sequence: %w", cs, seqName[s], err)
			}
			if err := sn.checkCondition(n, cs, s); err != nil {
				return nil, err
			}
			e.cases[cs][s] = sn
		}
		if cs == Max {
			for i, r := range e.cases[Max][pos].row {
				if r < 0 {
					return nil, fmt.Errorf("bus %q has no source in service in the maximum case", n.Buses[i].Name)
				}
			}
		}
	}
	return e, nil
}

var seqName = [...]string{zero: "zero", pos: "positive", neg: "negative"}

// singularBus carries the bus of a failed pivot from factorSeq to New,
// which explains it as a *ConditionError.
type singularBus struct{ bus int }

func (e *singularBus) Error() string { return fmt.Sprintf("singular at bus index %d", e.bus) }

// Network returns the network the engine was built from.
func (e *Engine) Network() *Network { return e.net }

// Settings returns the settings the engine was built with.
func (e *Engine) Settings() Settings { return e.set }

// Energised reports whether bus k is fed by a source in case cs.
func (e *Engine) Energised(cs Case, k int) bool { return e.cases[cs][pos].row[k] >= 0 }

// BaseCurrentA returns the per-unit base current at bus k.
func (e *Engine) BaseCurrentA(k int) float64 { return e.ibase[k] }

func sameNetwork(a, b *seqData) bool {
	for i := range a.shunt {
		if a.shunt[i] != b.shunt[i] {
			return false
		}
	}
	for i := range a.branch {
		if a.branch[i] != b.branch[i] {
			return false
		}
	}
	for i := range a.srcY {
		if a.srcY[i] != b.srcY[i] {
			return false
		}
	}
	for i := range a.genY {
		if a.genY[i] != b.genY[i] {
			return false
		}
	}
	return true
}

// factorSeq finds the buses with a path to the reference, numbers them and
// factors their admittance matrix.
func factorSeq(n *Network, d *seqData) (*seqNet, error) {
	nb := len(n.Buses)
	label := components(n, func(b int) bool { return d.branch[b].ft != 0 })
	grounded := make(map[int]bool)
	for i, y := range d.shunt {
		if y != 0 {
			grounded[label[i]] = true
		}
	}
	for b, blk := range d.branch {
		if blk.ft != 0 {
			continue
		}
		f, t := n.BranchEnds(b)
		if blk.ff != 0 {
			grounded[label[f]] = true
		}
		if blk.tt != 0 {
			grounded[label[t]] = true
		}
	}
	sn := &seqNet{seqData: d, row: make([]int32, nb), paths: make([]atomic.Pointer[sparse.Path], nb)}
	m := 0
	for i := range sn.row {
		sn.row[i] = -1
		if grounded[label[i]] {
			sn.row[i] = int32(m)
			m++
		}
	}
	bld := sparse.NewBuilder(m)
	for i, y := range d.shunt {
		if y != 0 && sn.row[i] >= 0 {
			bld.Add(int(sn.row[i]), int(sn.row[i]), y)
		}
	}
	for b, blk := range d.branch {
		f, t := n.BranchEnds(b)
		rf, rt := int(sn.row[f]), int(sn.row[t])
		if blk.ff != 0 && rf >= 0 {
			bld.Add(rf, rf, blk.ff)
		}
		if blk.tt != 0 && rt >= 0 {
			bld.Add(rt, rt, blk.tt)
		}
		if blk.ft != 0 && rf >= 0 && rt >= 0 {
			bld.Add(rf, rt, blk.ft)
		}
	}
	fac, err := bld.Factor()
	if err != nil {
		var se *sparse.SingularError
		if errors.As(err, &se) {
			for i, r := range sn.row {
				if int(r) == se.Index {
					return nil, &singularBus{bus: i}
				}
			}
		}
		return nil, err
	}
	sn.fac = fac
	sn.diag = make([]complex128, m)
	// The transfer impedance between a branch's two ends (a line fault's
	// Thevenin impedance needs it) lies on the pattern the diagonal is
	// computed over.
	var pairs [][2]int
	var branches []int
	for b, blk := range d.branch {
		f, t := n.BranchEnds(b)
		if rf, rt := int(sn.row[f]), int(sn.row[t]); blk.ft != 0 && rf >= 0 && rt >= 0 && rf != rt {
			pairs = append(pairs, [2]int{rf, rt})
			branches = append(branches, b)
		}
	}
	zp, found := make([]complex128, len(pairs)), make([]bool, len(pairs))
	fac.DiagonalAndPairs(sn.diag, pairs, zp, found)
	sn.ends = make([]complex128, len(d.branch))
	sn.endsKnown = make([]bool, len(d.branch))
	for t, b := range branches {
		sn.ends[b], sn.endsKnown[b] = zp[t], found[t]
	}
	sn.ws.New = func() any { return fac.NewWorkspace() }
	return sn, nil
}

// path returns the cached factor path of bus k, or nil when k has no path
// to the reference in this sequence.
func (s *seqNet) path(k int) *sparse.Path {
	r := s.row[k]
	if r < 0 {
		return nil
	}
	if p := s.paths[k].Load(); p != nil {
		return p
	}
	ws := s.ws.Get().(*sparse.Workspace)
	p := s.fac.Path(int(r), ws)
	s.ws.Put(ws)
	s.paths[k].CompareAndSwap(nil, &p)
	return s.paths[k].Load()
}

// ForgetPaths drops the factor paths the engine keeps for impedance
// entries, which on a large network are most of its memory; entries asked
// for later compute their paths again. It must not run while another
// goroutine uses the engine.
func (e *Engine) ForgetPaths() {
	for c := range e.cases {
		for _, sn := range e.cases[c] {
			if sn != nil {
				clear(sn.paths)
			}
		}
	}
}

// z returns the bus impedance matrix entry Z_ab in per unit.
func (s *seqNet) z(a, b int) complex128 {
	if a == b {
		if r := s.row[a]; r >= 0 {
			return s.diag[r]
		}
		return 0
	}
	pa := s.path(a)
	if pa == nil {
		return 0
	}
	pb := s.path(b)
	if pb == nil {
		return 0
	}
	return s.fac.Dot(*pa, *pb)
}
