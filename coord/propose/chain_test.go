package propose

import (
	"math"
	"math/cmplx"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
)

// TestRadialChainHandDerived: for a radial chain whose stages all use the
// IEC 60255-151:2009 Table 1 standard inverse curve,
// t = TMS·0.14/((I/Is)^0.02 − 1), the least multipliers are worked by
// hand: the most downstream relay sits at the bottom of its range, and
// each relay above it waits exactly the 0.3 s margin at the largest fault
// of the pair, the three-phase fault in the maximum case close in beyond
// the relay below, where both carry the same current
//
//	I = c·Un/(√3·|Z_Q + Z_lines|),  |Z_Q| = c·Un²/S"k,
//
// (IEC 60909-0: c_max = 1.10 above 1 kV, the network feeder from its
// short-circuit power with its X/R), so
//
//	TMS_U = (0.3 + TMS_D·g(I/Is_D)) / g(I/Is_U),  g(M) = 0.14/(M^0.02 − 1).
func TestRadialChainHandDerived(t *testing.T) {
	s, err := study.Load("../../testdata/propose/chain.toml")
	if err != nil {
		t.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	pr, err := Propose(s, eng, topo, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	// Hand figures.
	const c, un = 1.1, 11000.0
	zq := c * (un / 1000) * (un / 1000) / 250
	rq := zq / math.Sqrt(1+10*10)
	source := complex(rq, 10*rq)
	ab, bc := complex(0.32, 0.2), complex(0.24, 0.15)
	current := func(z complex128) float64 { return c * un / math.Sqrt(3) / cmplx.Abs(z) }
	g := func(i, pickup float64) float64 { return 0.14 / (math.Pow(i/pickup, 0.02) - 1) }
	iC := current(source + ab + bc) // close in beyond R3, at C
	iB := current(source + ab)      // close in beyond R2, at B
	tms3 := 0.05
	tms2 := (0.3 + tms3*g(iC, 200)) / g(iC, 300)
	tms1 := (0.3 + tms2*g(iB, 300)) / g(iB, 400)
	want := map[string]float64{"R1": tms1, "R2": tms2, "R3": tms3}
	// A range without a step is set in steps of 0.001, each multiplier
	// rounded up after the one below it was.
	up := func(x float64) float64 { return math.Ceil(x*1000-1e-6) / 1000 }
	r2 := up((0.3 + tms3*g(iC, 200)) / g(iC, 300))
	r1 := up((0.3 + r2*g(iB, 300)) / g(iB, 400))
	rounded := map[string]float64{"R1": r1, "R2": r2, "R3": tms3}
	// The least multipliers agree with the hand figures to 1e-6 of
	// themselves: the check's own currents agree with the closed form far
	// closer (faults/closedform_test.go), so only a wrong binding fault or
	// margin would move them.
	const tol = 1e-6
	for i, v := range pr.Vars {
		name := s.Devices[v.Device].Name
		if got := pr.Continuous[i]; math.Abs(got-want[name]) > tol*want[name] {
			t.Errorf("%s: least TMS %.8f, hand-derived %.8f (bound by %s)", name, got, want[name], Describe(s, pr.Binding[i].Src))
		}
		if math.Abs(pr.X[i]-rounded[name]) > 1e-12 {
			t.Errorf("%s: proposed %.8f, want %.8f", name, pr.X[i], rounded[name])
		}
	}
	if !pr.Verified() || len(pr.Conflicts) > 0 {
		t.Fatalf("verified %v, %d conflicts: want a verified proposal without conflicts", pr.Verified(), len(pr.Conflicts))
	}
	// Before rounding, each pair's margin is exactly the required
	// interval at its binding fault: the checker's grading findings on
	// the least multipliers show 0.3 s.
	exact := Apply(s, pr.Vars, pr.Continuous)
	t2, err := coord.NewTopology(exact, eng)
	if err != nil {
		t.Fatal(err)
	}
	res, err := coord.Check(exact, eng, t2)
	if err != nil {
		t.Fatal(err)
	}
	pairs := 0
	for _, f := range res.Findings {
		if f.Check == coord.Grading && (f.Device == "R3" && f.Other == "R2" || f.Device == "R2" && f.Other == "R1") {
			pairs++
			if math.Abs(f.Measured-0.3) > 1e-9 {
				t.Errorf("grading %s under %s: margin %.12f s at %s %s @ %s, want exactly 0.3 s", f.Device, f.Other, f.Measured, f.Fault.Kind, f.Fault.Case, f.Fault.Place)
			}
			if f.Fault.Kind.String() != "LLL" || f.Fault.Case.String() != "max" || f.Fault.Interpolated {
				t.Errorf("grading %s under %s: binding fault %s %s @ %s, want the solved three-phase maximum fault", f.Device, f.Other, f.Fault.Kind, f.Fault.Case, f.Fault.Place)
			}
		}
	}
	if pairs != 2 {
		t.Errorf("%d grading findings of the adjacent pairs, want 2", pairs)
	}
	// And the rounded proposal passes every grading margin.
	for _, f := range pr.After.Findings {
		if f.Check == coord.Grading && f.Verdict != coord.Pass {
			t.Errorf("proposal: grading %s under %s %s", f.Device, f.Other, f.Verdict)
		}
	}
}
