package faults

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// unit3 builds a 33 kV grid bus, a 33/11/3.3 kV three-winding transformer
// of the given vector group with its LV winding's bus otherwise empty, and
// an 11 kV bus beyond a short cable.
func unit3(group string) *Network {
	g, err := ParseVectorGroup3(group)
	if err != nil {
		panic(err)
	}
	n := &Network{
		Buses: []Bus{{Name: "HV", KV: 33}, {Name: "MV", KV: 11}, {Name: "LV", KV: 3.3}, {Name: "F", KV: 11}},
		Sources: []Source{{Name: "grid", Bus: 0, Earthed: true, Z0Z1: 1.3, X0R0: 6,
			Max: Strength{SCMVA: 900, XR: 12}, Min: Strength{SCMVA: 400, XR: 9}}},
		Lines: []Line{{Name: "C", From: 1, To: 3, Z1Ohm: complex(0.12, 0.09), Z0Ohm: complex(0.5, 0.3)}},
	}
	n.AddTransformer3(Transformer3{
		Name: "T", Buses: [3]int{0, 1, 2}, KV: [3]float64{33, 11, 3.3},
		Pairs: [3]WindingPair{
			HVMV: {MVA: 20, ZPct: 10, RPct: 0.5, Z0Pct: 9, R0Pct: 0.6},
			HVLV: {MVA: 10, ZPct: 8, RPct: 0.6},
			MVLV: {MVA: 10, ZPct: 5, RPct: 0.5},
		},
		Group: g,
	})
	return n
}

// twoWinding is unit3 with the three-winding transformer replaced by the
// two-winding transformer of its HV–MV pair: the equivalent when the LV
// winding carries nothing (positive and negative sequence always; zero
// sequence when the LV winding is no delta).
func twoWinding(group string) *Network {
	g, err := ParseVectorGroup(group)
	if err != nil {
		panic(err)
	}
	z0, r0 := 9.0, 0.6
	return &Network{
		Buses: []Bus{{Name: "HV", KV: 33}, {Name: "MV", KV: 11}, {Name: "F", KV: 11}},
		Sources: []Source{{Name: "grid", Bus: 0, Earthed: true, Z0Z1: 1.3, X0R0: 6,
			Max: Strength{SCMVA: 900, XR: 12}, Min: Strength{SCMVA: 400, XR: 9}}},
		Lines: []Line{{Name: "C", From: 1, To: 2, Z1Ohm: complex(0.12, 0.09), Z0Ohm: complex(0.5, 0.3)}},
		Transformers: []Transformer{{Name: "T", From: 0, To: 1, MVA: 20, KVFrom: 33, KVTo: 11,
			ZPct: 10, XR: math.Sqrt(100-0.25) / 0.5, Z0Pct: z0, X0R0: math.Sqrt(z0*z0-r0*r0) / r0, Group: g}},
	}
}

// TestThreeWindingOneWindingOpen: a three-winding transformer whose LV
// winding feeds nothing behaves as the two-winding transformer of its
// HV–MV pair: the same fault currents at the HV, MV and far 11 kV buses and
// the same currents at measuring points on the HV and MV terminals and on
// the cable, for every fault kind, in both cases (K_T of the HV–MV pair in
// the maximum case), with the MV winding's phase shift, and in the zero
// sequence when the LV winding is an unearthed star (YNyn0y0 against
// YNyn0) or when the HV winding is a delta (Dyn11yn11 against Dyn11: the
// HV delta, not the LV winding, closes the MV side's zero sequence).
func TestThreeWindingOneWindingOpen(t *testing.T) {
	for _, c := range []struct{ three, two string }{{"YNyn0y0", "YNyn0"}, {"Dyn11yn11", "Dyn11"}, {"Yd1y0", "Yd1"}} {
		t.Run(c.three, func(t *testing.T) {
			e3, err := New(unit3(c.three), Settings{EarthFaultOhm: 5, PhaseFaultOhm: 0.2})
			if err != nil {
				t.Fatal(err)
			}
			e2, err := New(twoWinding(c.two), Settings{EarthFaultOhm: 5, PhaseFaultOhm: 0.2})
			if err != nil {
				t.Fatal(err)
			}
			n3 := e3.Network()
			// Buses HV, MV, F and points: HV terminal, MV terminal, cable.
			buses3, buses2 := []int{0, 1, 3}, []int{0, 1, 2}
			pts3 := []Point{{n3.StarBranch(0, HV), From}, {n3.StarBranch(0, MV), From}, {0, From}}
			pts2 := []Point{{1, From}, {1, To}, {0, From}}
			for i := range buses3 {
				for _, cs := range Cases {
					for _, k := range Kinds {
						s3, _ := e3.Solve(e3.CaseFault(AtBus(buses3[i]), k, cs))
						s2, _ := e2.Solve(e2.CaseFault(AtBus(buses2[i]), k, cs))
						where := fmt.Sprintf("%s %s at %s", cs, k, n3.Buses[buses3[i]].Name)
						samePhases(t, where+" fault", s3.FaultCurrents(), s2.FaultCurrents())
						for p := range pts3 {
							samePhases(t, fmt.Sprintf("%s point %d", where, p), s3.At(pts3[p]), s2.At(pts2[p]))
						}
					}
				}
			}
		})
	}
}

// samePhases compares the phase currents of two computations within
// relTol of the larger current.
func samePhases(t *testing.T, where string, got, want Currents) {
	t.Helper()
	g, w := got.Phases(), want.Phases()
	scale := math.Max(got.PhaseMaxA(), want.PhaseMaxA())
	for ph := range g {
		if cmplx.Abs(g[ph]-w[ph]) > relTol*math.Max(scale, 1) {
			t.Errorf("%s: I%c = %.6g A ∠%.3f°, two-winding %.6g A ∠%.3f°", where, 'a'+ph,
				cmplx.Abs(g[ph]), cmplx.Phase(g[ph])*180/math.Pi, cmplx.Abs(w[ph]), cmplx.Phase(w[ph])*180/math.Pi)
			return
		}
	}
}

// TestThreeWindingStarClosedForm: grid equivalents on the HV and MV sides
// of a 132/33/11 kV transformer whose MV star branch comes out negative
// (u_k HV–MV 10 %, HV–LV 21 %, MV–LV 9 % on 100 MVA: Z_MV = ½(10 + 9 −
// 21) % < 0, kept as computed, and still negative after the pairs' K_T). A three-phase fault at the LV bus draws
// E/Z_th with Z_th = Z_LV + (Z_Q1 + Z_HV)‖(Z_Q2 + Z_MV), every impedance
// referred to one side by the rated ratios (bus voltages equal to the rated
// winding voltages here), each pair corrected by its own K_T = 0.95·c_max/
// (1 + 0.6·x_T) before the star conversion in the maximum case
// (IEC 60909-0), uncorrected in the minimum case.
func TestThreeWindingStarClosedForm(t *testing.T) {
	g, _ := ParseVectorGroup3("YNyn0d11")
	n := &Network{
		Buses: []Bus{{Name: "HV", KV: 132}, {Name: "MV", KV: 33}, {Name: "LV", KV: 11}},
		Sources: []Source{
			{Name: "Q1", Bus: 0, Max: Strength{SCMVA: 3000, XR: 15}, Min: Strength{SCMVA: 2000, XR: 12}},
			{Name: "Q2", Bus: 1, Max: Strength{SCMVA: 500, XR: 8}, Min: Strength{SCMVA: 300, XR: 6}},
		},
	}
	pairs := [3]WindingPair{
		HVMV: {MVA: 100, ZPct: 10, RPct: 0.3},
		HVLV: {MVA: 100, ZPct: 21, RPct: 0.5},
		MVLV: {MVA: 100, ZPct: 9, RPct: 0.4},
	}
	n.AddTransformer3(Transformer3{Name: "T", Buses: [3]int{0, 1, 2}, KV: [3]float64{132, 33, 11}, Pairs: pairs, Group: g})
	eng, err := New(n, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	for _, cs := range Cases {
		c := 1.1
		st1, st2 := n.Sources[0].Max, n.Sources[1].Max
		if cs == Min {
			c, st1, st2 = 1.0, n.Sources[0].Min, n.Sources[1].Min
		}
		var zp [3]complex128 // pair impedances in Ω on the LV side
		for p, pr := range pairs {
			k := 1.0
			x := math.Sqrt(pr.ZPct*pr.ZPct-pr.RPct*pr.RPct) / 100
			if cs == Max {
				k = 0.95 * 1.1 / (1 + 0.6*x)
			}
			zp[p] = complex(k*pr.RPct/100*11*11/pr.MVA, k*x*11*11/pr.MVA)
		}
		zHV := (zp[HVMV] + zp[HVLV] - zp[MVLV]) / 2
		zMV := (zp[HVMV] + zp[MVLV] - zp[HVLV]) / 2
		zLV := (zp[HVLV] + zp[MVLV] - zp[HVMV]) / 2
		if imag(zMV) >= 0 {
			t.Fatalf("the data should give a negative MV star reactance, got %v", zMV)
		}
		q1 := polarXR(c*132*132/st1.SCMVA, st1.XR) * complex(11.0*11/(132*132), 0)
		q2 := polarXR(c*33*33/st2.SCMVA, st2.XR) * complex(11.0*11/(33*33), 0)
		a, b := q1+zHV, q2+zMV
		zth := zLV + a*b/(a+b)
		want := c * 11e3 / math.Sqrt(3) / cmplx.Abs(zth)
		sol, _ := eng.Solve(eng.CaseFault(AtBus(2), LLL, cs))
		if got := sol.FaultCurrents().PhaseMaxA(); !near(got, want, relTol) {
			t.Errorf("%s: I\"k3 at LV = %.6g A, want %.6g A", cs, got, want)
		}
		// The LV terminal's measuring point carries the whole fault current
		// (the LV winding is the only path to the LV bus).
		lv := Point{Branch: n.StarBranch(0, LV), End: From}
		if got := sol.At(lv).PhaseMaxA(); !near(got, want, relTol) {
			t.Errorf("%s: LV terminal current %.6g A, want %.6g A", cs, got, want)
		}
	}
}

// TestParseVectorGroup3 checks three-winding clock notation.
func TestParseVectorGroup3(t *testing.T) {
	good := map[string]VectorGroup3{
		"YNyn0d5":  {W: [3]Winding{EarthedStar, EarthedStar, Delta}, Clock: [3]int{0, 0, 5}},
		"YNyn0,d5": {W: [3]Winding{EarthedStar, EarthedStar, Delta}, Clock: [3]int{0, 0, 5}},
		"Dyn11yn1": {W: [3]Winding{Delta, EarthedStar, EarthedStar}, Clock: [3]int{0, 11, 1}},
		"yd1d11":   {W: [3]Winding{Star, Delta, Delta}, Clock: [3]int{0, 1, 11}},
	}
	for s, want := range good {
		got, err := ParseVectorGroup3(s)
		if err != nil || got != want {
			t.Errorf("ParseVectorGroup3(%q) = %+v, %v; want %+v", s, got, err, want)
		}
	}
	if g, _ := ParseVectorGroup3("YNyn0d5"); g.String() != "YNyn0d5" || g.ShiftDeg(LV) != -150 || g.ShiftDeg(MV) != 0 {
		t.Errorf("YNyn0d5: %s, shifts %g° and %g°", g, g.ShiftDeg(MV), g.ShiftDeg(LV))
	}
	for _, s := range []string{"YNynd5", "YNyn0d", "YNyn1d5", "YNyn0d4", "YNyn0d5x", "YNd5", "YNyn0d13", ""} {
		if _, err := ParseVectorGroup3(s); err == nil {
			t.Errorf("ParseVectorGroup3(%q) accepted", s)
		}
	}
}
