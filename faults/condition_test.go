package faults

import (
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"

	"tripgrade/faults/sparse"
)

// TestInverseNormEstimate: Hager's estimate (Higham 1988) is a lower bound
// of ‖A⁻¹‖₁ and, on admittance-like matrices, within a small factor of it.
// The exact norm is the largest column sum of the inverse, column by
// column.
func TestInverseNormEstimate(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for trial := range 50 {
		n := 2 + r.IntN(30)
		b := sparse.NewBuilder(n)
		for i := range n { // a chain with random ties and shunts
			b.Add(i, i, complex(r.Float64()*math.Pow(10, r.Float64()*6-3), r.Float64()))
			if i > 0 {
				y := complex(r.Float64(), -r.Float64()*math.Pow(10, r.Float64()*4))
				b.Add(i-1, i, -y)
				b.Add(i-1, i-1, y)
				b.Add(i, i, y)
			}
		}
		f, err := b.Factor()
		if err != nil {
			continue
		}
		exact := 0.0
		col := make([]complex128, n)
		for k := range n {
			f.Column(col, k)
			exact = math.Max(exact, norm1(col))
		}
		est, _ := estimateInverseNorm(f.Solve, n)
		if est > exact*(1+1e-9) || est < exact/10 {
			t.Errorf("trial %d (n=%d): estimate %g, exact %g", trial, n, est, exact)
		}
	}
}

// TestIllConditionedNetworkIsNamed: a network held up by a source of
// 143 kΩ while 5000 MVA transformers sit within it cannot be solved to
// any useful accuracy, although every pivot passes; the engine says so and
// names the weak tie and the strong element.
func TestIllConditionedNetworkIsNamed(t *testing.T) {
	yy, _ := ParseVectorGroup("YNyn0")
	n := &Network{BaseMVA: 63381,
		Buses: []Bus{{Name: "LV", KV: 0.4}, {Name: "MV", KV: 11}, {Name: "MV2", KV: 11}},
		Sources: []Source{{Name: "weak", Bus: 0, Earthed: true,
			Max: Strength{Z1Ohm: 142744, Z0Ohm: 275000i}, Min: Strength{Z1Ohm: 142744, Z0Ohm: 275000i}}},
		Transformers: []Transformer{{Name: "T1", From: 1, To: 0, MVA: 5000, KVFrom: 11, KVTo: 0.4, ZPct: 0.25, XR: 600, Group: yy}},
		Lines:        []Line{{Name: "L1", From: 1, To: 2, Z1Ohm: 0.1 + 0.1i, Z0Ohm: 0.3 + 0.3i}},
	}
	_, err := New(n, Settings{})
	var ce *ConditionError
	if !errors.As(err, &ce) {
		t.Fatalf("got %v, want a *ConditionError", err)
	}
	msg := ce.Error()
	if !strings.Contains(msg, `source "weak"`) || !strings.Contains(msg, "cannot be solved accurately") {
		t.Errorf("message %q does not name the weak source", msg)
	}
	// The same network with a 10 Ω source is well conditioned.
	n.Sources[0].Max = Strength{Z1Ohm: 10, Z0Ohm: 20}
	n.Sources[0].Min = n.Sources[0].Max
	if _, err := New(n, Settings{}); err != nil {
		t.Errorf("well-conditioned network refused: %v", err)
	}
}

// TestResultsDoNotDependOnBase: per unit is internal, so any base power
// within the accepted range gives the same currents, to rounding.
func TestResultsDoNotDependOnBase(t *testing.T) {
	dyn, _ := ParseVectorGroup("Dyn11")
	build := func(base float64) *Network {
		return &Network{BaseMVA: base,
			Buses:   []Bus{{Name: "HV", KV: 33}, {Name: "LV", KV: 11}, {Name: "F", KV: 11}},
			Sources: []Source{{Name: "g", Bus: 0, Earthed: true, Z0Z1: 1.2, Max: Strength{SCMVA: 800, XR: 12}, Min: Strength{SCMVA: 300, XR: 8}}},
			Transformers: []Transformer{{Name: "T", From: 0, To: 1, MVA: 15, KVFrom: 33, KVTo: 11, ZPct: 9.5, XR: 18, Group: dyn,
				NeutralTo: Neutral{ZOhm: 15.9}}},
			Lines: []Line{{Name: "L", From: 1, To: 2, Z1Ohm: 0.3 + 0.2i, Z0Ohm: 0.9 + 0.6i}},
		}
	}
	var ref []complex128
	for _, base := range []float64{MinBaseMVA, 1, 100, MaxBaseMVA} {
		e, err := New(build(base), Settings{EarthFaultOhm: 20})
		if err != nil {
			t.Fatalf("base %g: %v", base, err)
		}
		var got []complex128
		for _, k := range Kinds {
			for _, cs := range Cases {
				sol, err := e.Solve(e.CaseFault(AtBus(2), k, cs))
				if err != nil {
					t.Fatal(err)
				}
				at := sol.At(Point{Branch: 1, End: From})
				fc := sol.FaultCurrents()
				got = append(got, fc.Seq[:]...)
				got = append(got, at.Seq[:]...)
			}
		}
		if ref == nil {
			ref = got
			continue
		}
		for i := range got {
			if d := cmplx.Abs(got[i] - ref[i]); d > 1e-9*math.Max(cmplx.Abs(ref[i]), 1) {
				t.Errorf("base %g: figure %d is %v, at base %g it was %v", base, i, got[i], MinBaseMVA, ref[i])
			}
		}
	}
}
