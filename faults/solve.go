package faults

import (
	"fmt"
	"math/cmplx"
)

// End names one end of a branch.
type End uint8

// Branch ends.
const (
	From End = iota
	To
)

// String returns "from" or "to".
func (e End) String() string {
	if e == From {
		return "from"
	}
	return "to"
}

// Point is a measuring point: the current transformer at one end of a
// branch, measuring the current flowing from that end's bus into the
// branch.
type Point struct {
	Branch int
	End    End
}

// Place is where a fault is applied: at a bus, or on a branch at a
// fraction of its length from the From end. Frac 0 and 1 on a branch are
// the close-in positions just inside the branch at its From and To end
// (beyond the current transformer there); a transformer branch has only
// those two positions.
type Place struct {
	Branch int // −1 for a bus fault
	Bus    int // the faulted bus when Branch is −1
	Frac   float64
}

// AtBus returns the place of a fault at bus k.
func AtBus(k int) Place { return Place{Branch: -1, Bus: k} }

// OnBranch returns the place of a fault on branch b at fraction frac of
// its length from the From end.
func OnBranch(b int, frac float64) Place { return Place{Branch: b, Frac: frac} }

// IsBus reports whether the place is a bus.
func (p Place) IsBus() bool { return p.Branch < 0 }

// Fault is one short circuit to solve.
type Fault struct {
	Place Place
	Kind  Kind
	Case  Case
	// ZOhm is the fault impedance: per phase for LLL, between the two
	// phases for LL, from the faulted phase(s) to earth for LG and LLG.
	ZOhm complex128
}

// PlaceBus returns the bus whose voltage and phase frame a fault at p
// uses: the bus itself, the branch end of a close-in fault, or the From bus
// of a line.
func (e *Engine) PlaceBus(p Place) int {
	if p.IsBus() {
		return p.Bus
	}
	from, to := e.net.BranchEnds(p.Branch)
	if p.Frac == 1 {
		return to
	}
	return from
}

// Solution is a solved fault. Its methods give the currents at any
// measuring point; it is a small value, safe to copy and to use from
// several goroutines.
type Solution struct {
	e     *Engine
	fault Fault
	i, j  int           // the fault node is (1−p)·i + p·j for transfer impedances
	p     float64       // 0 for a bus or close-in fault
	fbus  int           // bus whose zone and base the fault uses
	zff   [3]complex128 // Thevenin impedance of the fault node per sequence
	open  [3]bool       // no path to the reference in that sequence
	iseq  [3]complex128 // fault currents per sequence, per unit, fault frame
	live  bool
	// out describes the open branch ends of a solution from SolveOpen (nil
	// for the intact network).
	out *outageFault
	// sc caches transfer impedances per bus (see Use); nil: no cache.
	sc *Scratch
	// cols caches columns of the impedance matrices (see UseColumns).
	cols *Columns
}

// Solve computes the sequence currents of fault f.
func (e *Engine) Solve(f Fault) (Solution, error) {
	s := Solution{e: e, fault: f}
	n := e.net
	pl := f.Place
	switch {
	case pl.IsBus():
		if pl.Bus < 0 || pl.Bus >= len(n.Buses) {
			return s, fmt.Errorf("fault bus %d out of range", pl.Bus)
		}
		s.i, s.j, s.fbus = pl.Bus, pl.Bus, pl.Bus
	case pl.Branch >= n.BranchCount():
		return s, fmt.Errorf("fault branch %d out of range", pl.Branch)
	case !(pl.Frac >= 0 && pl.Frac <= 1):
		return s, fmt.Errorf("fault position %g on branch %q must lie in [0, 1]", pl.Frac, n.BranchName(pl.Branch))
	default:
		from, to := n.BranchEnds(pl.Branch)
		switch {
		case pl.Frac == 0:
			s.i, s.j, s.fbus = from, from, from
		case pl.Frac == 1:
			s.i, s.j, s.fbus = to, to, to
		case n.IsTransformer(pl.Branch):
			return s, fmt.Errorf("transformer %q: faults only at its terminals (position 0 or 1)", n.BranchName(pl.Branch))
		default:
			s.i, s.j, s.p, s.fbus = from, to, pl.Frac, from
		}
	}
	nets := &e.cases[f.Case]
	if !e.Energised(f.Case, s.fbus) {
		return s, nil
	}
	s.live = true
	for q := range nets {
		if nets[q].row[s.i] < 0 {
			s.open[q] = true
			continue
		}
		s.zff[q] = s.selfImpedance(q)
	}
	return s.WithKind(f.Kind, f.ZOhm), nil
}

// selfImpedance returns the Thevenin impedance of the fault node in
// sequence q.
func (s *Solution) selfImpedance(q int) complex128 {
	sn := s.e.cases[s.fault.Case][q]
	if s.p == 0 {
		return sn.z(s.i, s.i)
	}
	p := complex(s.p, 0)
	b := s.fault.Place.Branch
	zl := sn.series[b]
	zij := sn.ends[b]
	if !sn.endsKnown[b] {
		zij = sn.z(s.i, s.j)
	}
	return (1-p)*(1-p)*sn.z(s.i, s.i) + p*p*sn.z(s.j, s.j) + 2*p*(1-p)*zij + p*(1-p)*zl
}

// transfer returns Z_xf, the transfer impedance from bus x to the fault
// node, in sequence q, from the scratch cache when one is attached.
func (s *Solution) transfer(q, x int) complex128 {
	if s.sc != nil {
		return s.sc.transfer(s, q, x)
	}
	return s.transferUncached(q, x)
}

// transferUncached computes Z_xf in sequence q.
func (s *Solution) transferUncached(q, x int) complex128 {
	if s.out != nil {
		return s.out.transfer(q, x)
	}
	sn := s.e.cases[s.fault.Case][q]
	if s.p == 0 {
		return s.cols.z(sn, x, s.i)
	}
	p := complex(s.p, 0)
	return (1-p)*s.cols.z(sn, x, s.i) + p*s.cols.z(sn, x, s.j)
}

// sequenceCurrents returns I0, I1, I2 at the fault for driving voltage e,
// Thevenin impedances z (open[q]: no path in that sequence) and fault
// impedance zf, all per unit.
func sequenceCurrents(k Kind, e complex128, z [3]complex128, open [3]bool, zf complex128) [3]complex128 {
	var i [3]complex128
	if open[pos] || open[neg] {
		return i
	}
	switch k {
	case LLL:
		i[pos] = e / (z[pos] + zf)
	case LL:
		i[pos] = e / (z[pos] + z[neg] + zf)
		i[neg] = -i[pos]
	case LG:
		if open[zero] {
			return i
		}
		i[pos] = e / (z[pos] + z[neg] + z[zero] + 3*zf)
		i[neg], i[zero] = i[pos], i[pos]
	case LLG:
		if open[zero] {
			i[pos] = e / (z[pos] + z[neg])
			i[neg] = -i[pos]
			return i
		}
		z0 := z[zero] + 3*zf
		i[pos] = e / (z[pos] + z[neg]*z0/(z[neg]+z0))
		i[neg] = -i[pos] * z0 / (z[neg] + z0)
		i[zero] = -i[pos] * z[neg] / (z[neg] + z0)
	}
	return i
}

// XR returns X/R of the positive-sequence Thevenin impedance at the fault
// (+Inf for a purely reactive network, 0 when the place is not fed): the
// ratio that sets the DC offset a current transformer must carry.
func (s Solution) XR() float64 {
	z := s.zff[pos]
	if !s.live || z == 0 {
		return 0
	}
	if real(z) == 0 {
		return inf
	}
	return imag(z) / real(z)
}

// Fault returns the fault that was solved.
func (s Solution) Fault() Fault { return s.fault }

// Energised reports whether the faulted place is fed in the fault's case;
// when it is not, every current is zero.
func (s Solution) Energised() bool { return s.live }

// FaultBus returns the bus whose zone, voltage and phase labels the fault
// uses (the faulted bus, or the branch end of a close-in fault, or the From
// bus of a line).
func (s Solution) FaultBus() int { return s.fbus }

// FaultCurrents returns the currents flowing into the fault, in amperes at
// the fault's voltage.
func (s Solution) FaultCurrents() Currents {
	var c Currents
	ib := complex(s.e.ibase[s.fbus], 0)
	for q := range c.Seq {
		c.Seq[q] = s.iseq[q] * ib
	}
	return c
}

// At returns the currents at measuring point pt, positive from the point's
// bus into its branch, in amperes at the point's voltage and in the
// point's phase frame.
func (s Solution) At(pt Point) Currents {
	return s.response(pt, s.iseq, false).Currents(s)
}

// negligibleShare is the share of a fault's own sequence current below
// which a point's current in that sequence is rounding residue of the
// solves, not a current: a point that carries less than 1e-10 of the
// fault's current (a zero-sequence current that an open path cannot carry,
// a source on the far side of a delta winding) carries none. The share is
// a ratio of currents, so it does not depend on base_mva, and a fault that
// itself draws a tiny current still gives honest tiny currents.
const negligibleShare = 1e-10

// Response is how the sequence currents at one measuring point follow the
// sequence currents of faults at one place in one case: the network is
// linear, so the point's current in each sequence is a fixed multiple of
// the fault's. Computing it once serves every fault kind at that place
// (see WithKind).
type Response struct {
	k    [3]complex128 // amperes at the point per per-unit fault current, point frame
	v    voltageResponse
	flow complex128
}

// Flow returns the point's share of the fault's positive-sequence current:
// the positive-sequence current flowing from the point's bus into its
// branch per unit of the current into the fault, in the fault's frame.
// Its real part is positive where fault current flows from the bus into
// the branch towards the fault and negative where it flows out of the
// branch into the bus; the magnitude is the share of the fault current the
// branch carries (at most about 1 in a network with one fault).
func (r Response) Flow() complex128 { return r.flow }

// Coefficients returns the point's current in each sequence (I0, I1, I2)
// in amperes, in the point's frame, per unit of the fault's current in
// that sequence.
func (r Response) Coefficients() [3]complex128 { return r.k }

// Prefault returns the pre-fault voltages at the point's bus.
func (r Response) Prefault() Voltages { return Voltages{Seq: [3]complex128{pos: r.v.pre}} }

// Response returns the point's response to faults at this solution's
// place and case, whatever their kind.
func (s Solution) Response(pt Point) Response {
	return s.response(pt, [3]complex128{1, 1, 1}, true)
}

// response computes the response in the sequences where want is not zero,
// and the voltages at the point's bus when asked.
func (s Solution) response(pt Point, want [3]complex128, voltages bool) Response {
	var r Response
	if !s.live {
		return r
	}
	from, to := s.e.net.BranchEnds(pt.Branch)
	bus := from
	if pt.End == To {
		bus = to
	}
	for q := range r.k {
		if want[q] != 0 && !s.open[q] {
			r.k[q] = s.branchCurrent(q, pt, from, to)
			if k := r.k[q]; real(k)*real(k)+imag(k)*imag(k) < negligibleShare*negligibleShare {
				r.k[q] = 0
			}
		}
	}
	r.flow = r.k[pos]
	// Rotate from the fault's frame to the point's frame: positive
	// sequence by the zone shift between them, negative by its opposite.
	rot := s.e.rot[bus] * cmplx.Conj(s.e.rot[s.fbus])
	ib := complex(s.e.ibase[bus], 0)
	r.k[zero] *= ib
	r.k[pos] *= rot * ib
	r.k[neg] *= cmplx.Conj(rot) * ib
	if voltages {
		r.v = s.voltageResponse(bus)
	}
	return r
}

// Voltages returns the voltages at the point's bus for solution s, which
// must be of the place and case the response was made for.
func (r Response) Voltages(s Solution) Voltages { return r.v.voltages(s) }

// Currents returns the point's currents for solution s, which must be of
// the place and case the response was made for.
func (r Response) Currents(s Solution) Currents {
	var c Currents
	for q := range c.Seq {
		c.Seq[q] = r.k[q] * s.iseq[q]
	}
	return c
}

// WithKind returns the solution of a fault of another kind and fault
// impedance at the same place and in the same case, reusing the Thevenin
// impedances: no factor is touched.
func (s Solution) WithKind(k Kind, zOhm complex128) Solution {
	s.fault.Kind, s.fault.ZOhm = k, zOhm
	if !s.live {
		return s
	}
	c := s.e.set.VoltageFactor(s.e.net.Buses[s.fbus].KV, s.fault.Case)
	s.iseq = sequenceCurrents(k, complex(c, 0), s.zff, s.open, zOhm/complex(s.e.zbase[s.fbus], 0))
	return s
}

// branchCurrent returns the current of sequence q flowing from the point's
// bus into branch pt.Branch, in the shift-free frame, per unit of the
// fault's current in that sequence.
func (s *Solution) branchCurrent(q int, pt Point, from, to int) complex128 {
	sn := s.e.cases[s.fault.Case][q]
	if sn.row[from] < 0 && sn.row[to] < 0 {
		return 0
	}
	if s.out != nil {
		if c, done := s.out.branchCurrent(s, q, pt); done {
			return c
		}
	}
	const ifault = 1
	dv := func(x int) complex128 {
		if sn.row[x] < 0 {
			return 0
		}
		return -s.transfer(q, x) * ifault
	}
	vf, vt := dv(from), dv(to)
	blk := sn.branch[pt.Branch]
	intoFrom := blk.ff*vf + blk.ft*vt
	intoTo := blk.ft*vf + blk.tt*vt
	pl := s.fault.Place
	if pl.Branch != pt.Branch {
		if pt.End == From {
			return intoFrom
		}
		return intoTo
	}
	switch {
	case pl.Frac == 0: // close-in at the From terminal: the fault node sits between the From CT and the branch
		if pt.End == From {
			return ifault + intoFrom
		}
		return intoTo
	case pl.Frac == 1:
		if pt.End == To {
			return ifault + intoTo
		}
		return intoFrom
	}
	// Interior of a line: two sections i–f (p·z) and f–j ((1−p)·z). Take
	// the longer section's current from its voltage drop and the shorter
	// one's from Kirchhoff's current law at the fault node, so neither
	// divides by a small impedance.
	z := sn.series[pt.Branch]
	if z == 0 {
		return 0
	}
	vfault := -s.zff[q] * ifault
	p := complex(pl.Frac, 0)
	var fromSide, toSide complex128 // currents into the fault node from each end
	if pl.Frac >= 0.5 {
		fromSide = (vf - vfault) / (p * z)
		toSide = ifault - fromSide
	} else {
		toSide = (vt - vfault) / ((1 - p) * z)
		fromSide = ifault - toSide
	}
	if pt.End == From {
		return fromSide
	}
	return toSide
}
