package faults

import (
	"fmt"
	"math"
	"math/cmplx"
)

// Network is the electrical model of a study in SI units. Elements refer to
// buses by index into Buses. Branches share one index space: branch b <
// len(Lines) is Lines[b], then come the two-winding Transformers, then
// three branches per three-winding transformer, the star branches of its
// HV, MV and LV windings (see Transformer3 and Network.Star).
type Network struct {
	BaseMVA       float64 // per-unit base power; 100 when zero
	Buses         []Bus
	Sources       []Source
	Generators    []Generator
	Motors        []Motor
	Lines         []Line
	Transformers  []Transformer
	Transformers3 []Transformer3
	Earthings     []Earthing
}

// Bus is a node of the network at one nominal voltage.
type Bus struct {
	Name string
	KV   float64 // nominal line-to-line voltage Un
	// Internal marks a node that the models need but the study does not
	// declare: the star point of a three-winding transformer's equivalent
	// circuit. No element other than its transformer connects there, and
	// it is no place for a fault: callers leave it out of fault places and
	// bus tables.
	Internal bool
}

// Source is a grid equivalent (network feeder) at a bus. Its positive and
// negative sequence impedance come either from the short-circuit power,
// |Z| = c·Un²/S"k with the case's voltage factor c (IEC 60909-0, network
// feeder), or from explicit ohms used as given.
type Source struct {
	Name string
	Bus  int
	Max  Strength // maximum case
	Min  Strength // minimum case
	// Earthed says whether the source offers a zero-sequence path.
	Earthed bool
	// Z0Z1 is |Z0|/|Z1|, used when a Strength carries no explicit Z0.
	Z0Z1 float64
	// X0R0 is the zero-sequence X/R; zero means the same as the positive X/R.
	X0R0 float64
}

// Strength is one case's short-circuit strength of a Source.
type Strength struct {
	SCMVA float64    // initial symmetrical short-circuit power S"k; used when Z1Ohm is zero
	XR    float64    // X/R of the positive-sequence impedance when SCMVA is used
	Z1Ohm complex128 // explicit positive-sequence impedance (overrides SCMVA)
	Z0Ohm complex128 // explicit zero-sequence impedance (overrides Z0Z1)
}

// Generator is a synchronous machine connected directly at a bus.
type Generator struct {
	Name  string
	Bus   int
	MVA   float64 // rated apparent power S_rG
	KV    float64 // rated voltage U_rG
	XdPct float64 // sub-transient reactance x"d in % on the rating
	X2Pct float64 // negative-sequence reactance; zero means x"d
	X0Pct float64 // zero-sequence reactance of the winding
	RPct  float64 // stator resistance in % on the rating
	PF    float64 // rated power factor cos φ_rG, for the IEC 60909-0 correction K_G
	InMax bool    // in service in the maximum case
	InMin bool    // in service in the minimum case
	Earth Neutral // star-point earthing
	// Unit makes the generator and its unit transformer one power station
	// unit of IEC 60909-0, corrected together by K_S or K_SO instead of
	// K_G and K_T; nil for a generator connected directly to a network.
	Unit *StationUnit
}

// Neutral describes how a star point is connected to earth. The zero value
// is a solidly earthed star point.
type Neutral struct {
	Isolated bool       // true: the star point is not connected to earth
	ZOhm     complex128 // earthing impedance (zero: solid)
}

// Line is an overhead line or cable between two buses of the same voltage.
type Line struct {
	Name     string
	From, To int
	Z1Ohm    complex128 // positive (= negative) sequence series impedance at 20 °C
	Z0Ohm    complex128 // zero-sequence series impedance at 20 °C
	// EndTempC is the conductor temperature at the end of a fault, for the
	// minimum case resistance (IEC 60909-0: R = [1 + 0.004/K·(θe − 20 °C)]·R20).
	// Zero means the Settings' value.
	EndTempC float64
}

// Transformer is a two-winding transformer. The winding letters of Group
// apply to the higher-voltage side first, as in IEC 60076-1 notation; the
// side with the larger rated kV is the HV side (From when they are equal).
type Transformer struct {
	Name         string
	From, To     int
	MVA          float64 // rated power
	KVFrom, KVTo float64 // rated winding voltages
	ZPct         float64 // short-circuit impedance u_k in % on the rating
	XR           float64 // X/R of the short-circuit impedance
	Z0Pct        float64 // zero-sequence impedance in %; zero means ZPct
	X0R0         float64 // zero-sequence X/R; zero means XR
	Group        VectorGroup
	NeutralFrom  Neutral // earthing of a star winding on the From side
	NeutralTo    Neutral // earthing of a star winding on the To side
	NotCorrected bool    // true: do not apply the IEC 60909-0 K_T (e.g. a unit transformer)
}

// Earthing is a grounding transformer (zig-zag or star–delta) or another
// zero-sequence-only shunt path at a bus: Z0 + 3Zn to earth, open in the
// positive and negative sequence.
type Earthing struct {
	Name     string
	Bus      int
	Z0Ohm    complex128 // zero-sequence impedance per phase
	NeutralZ complex128 // neutral earthing impedance Zn
}

// BranchCount returns the number of branches: lines, two-winding
// transformers and three star branches per three-winding transformer.
func (n *Network) BranchCount() int {
	return len(n.Lines) + len(n.Transformers) + 3*len(n.Transformers3)
}

// BranchName returns the name of branch b; a star branch of a
// three-winding transformer is named after it and its winding, e.g.
// "T3 (MV)".
func (n *Network) BranchName(b int) string {
	if b < len(n.Lines) {
		return n.Lines[b].Name
	}
	if t, w, ok := n.Star(b); ok {
		return t.Name + " (" + WindingName(w) + ")"
	}
	return n.Transformers[b-len(n.Lines)].Name
}

// BranchEnds returns the From and To buses of branch b. A star branch of a
// three-winding transformer runs from its winding's terminal bus (From) to
// the transformer's internal star point (To).
func (n *Network) BranchEnds(b int) (from, to int) {
	if b < len(n.Lines) {
		return n.Lines[b].From, n.Lines[b].To
	}
	if t, w, ok := n.Star(b); ok {
		return t.Buses[w], t.StarBus
	}
	t := n.Transformers[b-len(n.Lines)]
	return t.From, t.To
}

// IsTransformer reports whether branch b is a transformer or a star branch
// of a three-winding transformer: faults only at its terminals.
func (n *Network) IsTransformer(b int) bool { return b >= len(n.Lines) }

// Transformer returns the transformer of branch b, which must be one. For
// a star branch of a three-winding transformer it returns a two-winding
// view of that winding: From its terminal bus To the star point, with the
// winding's rating, its rated voltage (KVFrom) and the rated voltage of the
// HV winding (KVTo, the voltage the star impedances are referred to). The
// view is for ratings and ratios; its impedance fields are zero.
func (n *Network) Transformer(b int) *Transformer {
	if t, w, ok := n.Star(b); ok {
		return &Transformer{Name: n.BranchName(b), From: t.Buses[w], To: t.StarBus,
			MVA: t.WindingMVA(w), KVFrom: t.KV[w], KVTo: t.KV[HV], NotCorrected: t.NotCorrected}
	}
	return &n.Transformers[b-len(n.Lines)]
}

// Star reports whether branch b is a star branch of a three-winding
// transformer, and if so which transformer and winding.
func (n *Network) Star(b int) (t *Transformer3, winding int, ok bool) {
	k := b - len(n.Lines) - len(n.Transformers)
	if k < 0 || k >= 3*len(n.Transformers3) {
		return nil, 0, false
	}
	return &n.Transformers3[k/3], k % 3, true
}

// StarBranch returns the branch index of winding w of three-winding
// transformer i.
func (n *Network) StarBranch(i, w int) int {
	return len(n.Lines) + len(n.Transformers) + 3*i + w
}

func (n *Network) baseMVA() float64 {
	if n.BaseMVA > 0 {
		return n.BaseMVA
	}
	return 100
}

// zFromPower returns the impedance c·Un²/S with the given X/R, in ohms.
func zFromPower(c, kv, mva, xr float64) complex128 {
	mag := c * kv * kv / mva
	return polarXR(mag, xr)
}

// polarXR returns a complex impedance of magnitude mag and ratio X/R = xr;
// xr = +Inf gives a pure reactance. Hypot keeps a very large X/R from
// overflowing into a zero impedance.
func polarXR(mag, xr float64) complex128 {
	if math.IsInf(xr, 1) {
		return complex(0, mag)
	}
	h := math.Hypot(1, xr)
	return complex(mag/h, mag*(xr/h))
}

// Limits of the figures the engine accepts from callers that build a
// Network in code. The study loader holds files to tighter, physical
// limits (coord/study/limits.go); these keep the per-unit arithmetic
// exact, whatever the base: a base power within 1 kVA to 100 GVA, and
// short-circuit powers below 1e9 MVA.
const (
	MinBaseMVA   = 1e-3
	MaxBaseMVA   = 1e5
	maxSCMVA     = 1e9
	maxImpedance = 1e9 // Ω
)

// finiteAll reports whether every figure is a finite number.
func finiteAll(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// sane reports whether an impedance is finite and within maxImpedance.
func sane(z ...complex128) bool {
	for _, x := range z {
		if !finiteAll(real(x), imag(x)) || cmplx.Abs(x) > maxImpedance {
			return false
		}
	}
	return true
}

// check reports the first structural problem of the network: references out
// of range or values the engine cannot use. The study loader gives the
// user-facing messages; this guards callers that build a Network in code.
func (n *Network) check() error {
	nb := len(n.Buses)
	if nb == 0 {
		return fmt.Errorf("network has no buses")
	}
	if n.BaseMVA != 0 && !(n.BaseMVA >= MinBaseMVA && n.BaseMVA <= MaxBaseMVA) {
		return fmt.Errorf("base power %g MVA outside %g to %g MVA", n.BaseMVA, MinBaseMVA, MaxBaseMVA)
	}
	if err := n.checkFigures(); err != nil {
		return err
	}
	for _, b := range n.Buses {
		if !(b.KV > 0) || math.IsInf(b.KV, 0) {
			return fmt.Errorf("bus %q: kv must be > 0 (got %g)", b.Name, b.KV)
		}
	}
	bad := func(kind, name string, idx int) error {
		return fmt.Errorf("%s %q: bus index %d out of range", kind, name, idx)
	}
	for _, s := range n.Sources {
		if s.Bus < 0 || s.Bus >= nb {
			return bad("source", s.Name, s.Bus)
		}
	}
	for _, g := range n.Generators {
		if g.Bus < 0 || g.Bus >= nb {
			return bad("generator", g.Name, g.Bus)
		}
		if !(g.MVA > 0) || !(g.KV > 0) || !(g.XdPct > 0) {
			return fmt.Errorf("generator %q: mva, kv and xd_pct must be > 0", g.Name)
		}
	}
	for _, l := range n.Lines {
		if l.From < 0 || l.From >= nb || l.To < 0 || l.To >= nb {
			return fmt.Errorf("line %q: bus index out of range", l.Name)
		}
		if l.From == l.To {
			return fmt.Errorf("line %q: both ends on the same bus", l.Name)
		}
		if l.Z1Ohm == 0 || cmplx.IsNaN(l.Z1Ohm) || l.Z0Ohm == 0 || cmplx.IsNaN(l.Z0Ohm) {
			return fmt.Errorf("line %q: zero or undefined positive- or zero-sequence impedance", l.Name)
		}
		if n.Buses[l.From].KV != n.Buses[l.To].KV {
			return fmt.Errorf("line %q: joins buses of different nominal voltage", l.Name)
		}
	}
	for _, t := range n.Transformers {
		if t.From < 0 || t.From >= nb || t.To < 0 || t.To >= nb {
			return fmt.Errorf("transformer %q: bus index out of range", t.Name)
		}
		if t.From == t.To {
			return fmt.Errorf("transformer %q: both ends on the same bus", t.Name)
		}
		if !(t.MVA > 0) || !(t.KVFrom > 0) || !(t.KVTo > 0) || !(t.ZPct > 0) {
			return fmt.Errorf("transformer %q: mva, kv and z_pct must be > 0", t.Name)
		}
	}
	for _, e := range n.Earthings {
		if e.Bus < 0 || e.Bus >= nb {
			return bad("earthing", e.Name, e.Bus)
		}
	}
	for i := range n.Motors {
		if err := n.checkMotor(&n.Motors[i]); err != nil {
			return err
		}
	}
	for i := range n.Transformers3 {
		if err := n.checkTransformer3(&n.Transformers3[i]); err != nil {
			return err
		}
	}
	units := map[int]string{}
	for i := range n.Generators {
		if g := &n.Generators[i]; g.Unit != nil {
			if err := n.checkUnit(g, units); err != nil {
				return err
			}
		}
	}
	return n.checkInternal()
}

// checkFigures reports the first element with a figure that is not a
// finite number or lies beyond the engine's limits.
func (n *Network) checkFigures() error {
	strength := func(st Strength) bool {
		return finiteAll(st.SCMVA, st.XR) && st.SCMVA >= 0 && st.SCMVA <= maxSCMVA && (st.XR >= 0 || math.IsInf(st.XR, 1)) && sane(st.Z1Ohm, st.Z0Ohm)
	}
	for _, s := range n.Sources {
		if !strength(s.Max) || !strength(s.Min) || !finiteAll(s.Z0Z1, s.X0R0) || s.Z0Z1 < 0 || s.X0R0 < 0 {
			return fmt.Errorf("source %q: a figure is not finite, negative or beyond the engine's limits", s.Name)
		}
	}
	for _, g := range n.Generators {
		if !finiteAll(g.MVA, g.KV, g.XdPct, g.X2Pct, g.X0Pct, g.RPct, g.PF) || !sane(g.Earth.ZOhm) {
			return fmt.Errorf("generator %q: a figure is not finite or beyond the engine's limits", g.Name)
		}
	}
	for _, l := range n.Lines {
		if !sane(l.Z1Ohm, l.Z0Ohm) || !finiteAll(l.EndTempC) {
			return fmt.Errorf("line %q: an impedance is not finite or beyond %g Ω", l.Name, float64(maxImpedance))
		}
	}
	for _, t := range n.Transformers {
		if !finiteAll(t.MVA, t.KVFrom, t.KVTo, t.ZPct, t.Z0Pct) || t.XR < 0 || t.X0R0 < 0 || math.IsNaN(t.XR) || math.IsNaN(t.X0R0) ||
			!sane(t.NeutralFrom.ZOhm, t.NeutralTo.ZOhm) {
			return fmt.Errorf("transformer %q: a figure is not finite, negative or beyond the engine's limits", t.Name)
		}
	}
	for _, t := range n.Transformers3 {
		ok := finiteAll(t.KV[:]...) && sane(t.Neutral[HV].ZOhm, t.Neutral[MV].ZOhm, t.Neutral[LV].ZOhm)
		for _, p := range t.Pairs {
			ok = ok && finiteAll(p.MVA, p.ZPct, p.RPct, p.Z0Pct, p.R0Pct)
		}
		if !ok {
			return fmt.Errorf("transformer %q: a figure is not finite or beyond the engine's limits", t.Name)
		}
	}
	for _, e := range n.Earthings {
		if !sane(e.Z0Ohm, e.NeutralZ) {
			return fmt.Errorf("earthing %q: an impedance is not finite or beyond %g Ω", e.Name, float64(maxImpedance))
		}
	}
	return nil
}
