package faults

import (
	"math"
	"math/cmplx"
	"testing"
)

// relTol is the agreement asked of the engine against closed forms: the
// only differences are floating-point rounding in the sparse solves.
const relTol = 1e-9

func near(got, want, tol float64) bool {
	if want == 0 {
		return math.Abs(got) <= tol
	}
	return math.Abs(got-want) <= tol*math.Abs(want)
}

// radial builds source — line — bus B at 11 kV: the textbook single-source
// case.
func radial(earthed bool) *Network {
	return &Network{
		BaseMVA: 100,
		Buses:   []Bus{{Name: "A", KV: 11}, {Name: "B", KV: 11}},
		Sources: []Source{{
			Name: "grid", Bus: 0, Earthed: earthed, Z0Z1: 1.5, X0R0: 4,
			Max: Strength{SCMVA: 250, XR: 10},
			Min: Strength{SCMVA: 120, XR: 8},
		}},
		Lines: []Line{{Name: "L", From: 0, To: 1, Z1Ohm: complex(0.8, 0.9), Z0Ohm: complex(2.1, 2.9)}},
	}
}

// TestClosedFormSingleSource checks every fault kind at the end of a line
// fed by one grid equivalent against the formulas of IEC 60909-0 (I"k3 =
// c·Un/(√3|Z1|), I"k2 = c·Un/|Z1+Z2|, I"k1 = √3·c·Un/|Z1+Z2+Z0|, I"kE2E =
// √3·c·Un·|Z2|/|Z1Z2+Z1Z0+Z2Z0|) and, with a fault impedance, the
// sequence-network connections of Grainger & Stevenson ch. 12.
func TestClosedFormSingleSource(t *testing.T) {
	n := radial(true)
	eng, err := New(n, Settings{EarthFaultOhm: 7, PhaseFaultOhm: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	un := 11.0e3
	for _, cs := range Cases {
		c, st := 1.10, n.Sources[0].Max
		if cs == Min {
			c, st = 1.00, n.Sources[0].Min
		}
		zs := polarXR(c*11*11/st.SCMVA, st.XR)
		zs0 := polarXR(1.5*cmplx.Abs(zs), 4)
		z1 := zs + n.Lines[0].Z1Ohm
		z0 := zs0 + n.Lines[0].Z0Ohm
		z2 := z1
		e := complex(c*un/math.Sqrt(3), 0)
		zf := complex(0, 0)
		zfe := complex(0, 0)
		if cs == Min {
			zf, zfe = 0.5, 7
		}
		i1LG := e / (z1 + z2 + z0 + 3*zfe)
		z03 := z0 + 3*zfe
		i1LLG := e / (z1 + z2*z03/(z2+z03))
		i0LLG := -i1LLG * z2 / (z2 + z03)
		want := map[Kind][2]float64{ // phase, earth
			LLL: {cmplx.Abs(e / (z1 + zf)), 0},
			LL:  {math.Sqrt(3) * cmplx.Abs(e/(z1+z2+zf)), 0},
			LG:  {3 * cmplx.Abs(i1LG), 3 * cmplx.Abs(i1LG)},
			LLG: {-1, 3 * cmplx.Abs(i0LLG)},
		}
		if cs == Max { // the IEC 60909-0 forms, bolted
			k3 := c * un / (math.Sqrt(3) * cmplx.Abs(z1))
			k2 := c * un / cmplx.Abs(z1+z2)
			k1 := math.Sqrt(3) * c * un / cmplx.Abs(z1+z2+z0)
			kE2E := math.Sqrt(3) * c * un * cmplx.Abs(z2) / cmplx.Abs(z1*z2+z1*z0+z2*z0)
			if !near(want[LLL][0], k3, relTol) || !near(want[LL][0], k2, relTol) ||
				!near(want[LG][0], k1, relTol) || !near(want[LLG][1], kE2E, relTol) {
				t.Fatalf("textbook forms disagree with IEC forms: %v vs %g %g %g %g", want, k3, k2, k1, kE2E)
			}
		}
		for _, k := range Kinds {
			sol, err := eng.Solve(eng.CaseFault(AtBus(1), k, cs))
			if err != nil {
				t.Fatal(err)
			}
			at := sol.At(Point{Branch: 0, End: From})
			fc := sol.FaultCurrents()
			w := want[k]
			if w[0] >= 0 && !near(fc.PhaseMaxA(), w[0], relTol) {
				t.Errorf("%s %s at B: phase current %g A, want %g A", cs, k, fc.PhaseMaxA(), w[0])
			}
			if !near(fc.ResidualA(), w[1], relTol) {
				t.Errorf("%s %s at B: earth current %g A, want %g A", cs, k, fc.ResidualA(), w[1])
			}
			// Radial: the relay at the source end carries the whole fault current.
			for q := range at.Seq {
				if cmplx.Abs(at.Seq[q]-fc.Seq[q]) > relTol*cmplx.Abs(fc.Seq[pos]) {
					t.Errorf("%s %s: relay sequence %d current %v, want the fault's %v", cs, k, q, at.Seq[q], fc.Seq[q])
				}
			}
		}
	}
}

// TestSourceBusReproducesShortCircuitPower: a bolted three-phase fault at
// a grid equivalent's own bus gives back its short-circuit power
// S"kQ = √3·Un·I"kQ, because |Z_Q| = c·Un²/S"kQ (IEC 60909-0 network
// feeder) and I"k3 = c·Un/(√3·|Z_Q|).
func TestSourceBusReproducesShortCircuitPower(t *testing.T) {
	n := radial(false)
	eng, err := New(n, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	for _, cs := range Cases {
		sol, _ := eng.Solve(eng.CaseFault(AtBus(0), LLL, cs))
		s := math.Sqrt(3) * 11 * sol.FaultCurrents().PhaseMaxA() / 1000
		want := 250.0
		if cs == Min {
			want = 120.0
		}
		if !near(s, want, relTol) {
			t.Errorf("%s: √3·Un·I\"k3 = %g MVA, want S\"kQ = %g MVA", cs, s, want)
		}
	}
}

// TestUnearthedHasNoEarthFault: with no zero-sequence path an LG fault
// draws nothing and an LLG fault is an LL fault (the sequence connection
// with Z0 open; Grainger & Stevenson ch. 12).
func TestUnearthedHasNoEarthFault(t *testing.T) {
	eng, err := New(radial(false), Settings{})
	if err != nil {
		t.Fatal(err)
	}
	lg, _ := eng.Solve(eng.CaseFault(AtBus(1), LG, Max))
	if a := lg.FaultCurrents().PhaseMaxA(); a != 0 {
		t.Errorf("LG on an unearthed system: %g A, want 0", a)
	}
	llg, _ := eng.Solve(eng.CaseFault(AtBus(1), LLG, Max))
	ll, _ := eng.Solve(eng.CaseFault(AtBus(1), LL, Max))
	if g, w := llg.FaultCurrents().PhaseMaxA(), ll.FaultCurrents().PhaseMaxA(); !near(g, w, relTol) {
		t.Errorf("LLG on an unearthed system: %g A, want the LL current %g A", g, w)
	}
}

// TestLinePositionMatchesInsertedNode checks the bus-impedance building
// rule for a fault part way along a line (Z_ff = (1−p)²Z_ii + p²Z_jj +
// 2p(1−p)Z_ij + p(1−p)z, Grainger & Stevenson ch. 8) against the same line
// split at that point by an explicit bus, in a meshed network with a second
// source so that both ends feed the fault.
func TestLinePositionMatchesInsertedNode(t *testing.T) {
	const p = 0.3
	zl, zl0 := complex(1.2, 2.2), complex(3.1, 6.0)
	build := func(split bool) *Network {
		n := &Network{
			Buses: []Bus{{Name: "A", KV: 33}, {Name: "B", KV: 33}, {Name: "C", KV: 33}},
			Sources: []Source{
				{Name: "S1", Bus: 0, Earthed: true, Z0Z1: 1, Max: Strength{SCMVA: 900, XR: 12}, Min: Strength{SCMVA: 400, XR: 12}},
				{Name: "S2", Bus: 1, Earthed: true, Z0Z1: 2, Max: Strength{SCMVA: 300, XR: 6}, Min: Strength{SCMVA: 150, XR: 6}},
			},
			Lines: []Line{
				{Name: "AB", From: 0, To: 1, Z1Ohm: zl, Z0Ohm: zl0},
				{Name: "BC", From: 1, To: 2, Z1Ohm: complex(0.9, 1.5), Z0Ohm: complex(2, 4)},
				{Name: "CA", From: 2, To: 0, Z1Ohm: complex(0.7, 1.9), Z0Ohm: complex(2, 5)},
			},
		}
		if split {
			n.Buses = append(n.Buses, Bus{Name: "M", KV: 33})
			n.Lines[0] = Line{Name: "AM", From: 0, To: 3, Z1Ohm: p * zl, Z0Ohm: p * zl0}
			n.Lines = append(n.Lines, Line{Name: "MB", From: 3, To: 1, Z1Ohm: (1 - p) * zl, Z0Ohm: (1 - p) * zl0})
		}
		return n
	}
	whole, err := New(build(false), Settings{EarthFaultOhm: 5})
	if err != nil {
		t.Fatal(err)
	}
	split, err := New(build(true), Settings{EarthFaultOhm: 5})
	if err != nil {
		t.Fatal(err)
	}
	for _, cs := range Cases {
		for _, k := range Kinds {
			a, _ := whole.Solve(whole.CaseFault(OnBranch(0, p), k, cs))
			b, _ := split.Solve(split.CaseFault(AtBus(3), k, cs))
			pairs := []struct {
				name   string
				ga, gb Currents
			}{
				{"fault", a.FaultCurrents(), b.FaultCurrents()},
				{"A end", a.At(Point{0, From}), b.At(Point{0, From})},
				{"B end", a.At(Point{0, To}), b.At(Point{3, To})},
				{"BC at B", a.At(Point{1, From}), b.At(Point{1, From})},
				{"CA at C", a.At(Point{2, From}), b.At(Point{2, From})},
			}
			for _, pr := range pairs {
				scale := cmplx.Abs(b.FaultCurrents().Seq[pos])
				for q := range pr.ga.Seq {
					if d := cmplx.Abs(pr.ga.Seq[q] - pr.gb.Seq[q]); d > relTol*scale {
						t.Errorf("%s %s %s seq %d: along-line %v, inserted node %v", cs, k, pr.name, q, pr.ga.Seq[q], pr.gb.Seq[q])
					}
				}
			}
		}
	}
}
