package faults

import (
	"math"
	"math/cmplx"
	"testing"
)

// substation builds a 33 kV grid equivalent, one 33/11 kV transformer of
// the given vector group and an 11 kV bus, with an optional neutral
// resistor on the 11 kV star point.
func substation(group string, rnOhm float64) *Network {
	g, err := ParseVectorGroup(group)
	if err != nil {
		panic(err)
	}
	return &Network{
		Buses: []Bus{{Name: "HV", KV: 33}, {Name: "LV", KV: 11}},
		Sources: []Source{{Name: "grid", Bus: 0, Earthed: true, Z0Z1: 1.2,
			Max: Strength{SCMVA: 750, XR: 14}, Min: Strength{SCMVA: 300, XR: 10}}},
		Transformers: []Transformer{{Name: "T", From: 0, To: 1, MVA: 20, KVFrom: 33, KVTo: 11,
			ZPct: 10, XR: 20, Group: g, NeutralTo: Neutral{ZOhm: complex(rnOhm, 0)}, NeutralFrom: Neutral{}}},
	}
}

// TestDeltaStarReferral checks the delta–star facts of IEEE Std 242
// ch. 15 and the IEEE C37.91 current-distribution tables: behind a Dyn
// transformer an LV LG fault appears on the HV side in two phases at 1/√3
// of the ratio-referred LV current and zero in the third; an LV LL fault
// appears as one HV phase at 2/√3 and two at 1/√3; no HV residual current
// flows for any LV fault.
func TestDeltaStarReferral(t *testing.T) {
	for _, group := range []string{"Dyn11", "Dyn1", "Dyn5"} {
		eng, err := New(substation(group, 0), Settings{})
		if err != nil {
			t.Fatal(err)
		}
		hv := Point{Branch: 0, End: From}
		ratio := 11.0 / 33.0
		for _, k := range Kinds {
			sol, _ := eng.Solve(eng.CaseFault(AtBus(1), k, Max))
			if r := sol.At(hv).ResidualA(); r != 0 {
				t.Errorf("%s %s on LV: HV residual %g A, want 0", group, k, r)
			}
		}
		lg, _ := eng.Solve(eng.CaseFault(AtBus(1), LG, Max))
		ref := lg.FaultCurrents().PhaseMaxA() * ratio
		got := sortedMags(lg.At(hv).Phases())
		want := [3]float64{0, ref / math.Sqrt(3), ref / math.Sqrt(3)}
		checkMags(t, group+" LG", got, want, ref)

		ll, _ := eng.Solve(eng.CaseFault(AtBus(1), LL, Max))
		ref = ll.FaultCurrents().PhaseMaxA() * ratio
		got = sortedMags(ll.At(hv).Phases())
		want = [3]float64{ref / math.Sqrt(3), ref / math.Sqrt(3), 2 * ref / math.Sqrt(3)}
		checkMags(t, group+" LL", got, want, ref)
	}
}

func sortedMags(p [3]complex128) [3]float64 {
	m := [3]float64{cmplx.Abs(p[0]), cmplx.Abs(p[1]), cmplx.Abs(p[2])}
	for i := 0; i < 3; i++ {
		for j := i + 1; j < 3; j++ {
			if m[j] < m[i] {
				m[i], m[j] = m[j], m[i]
			}
		}
	}
	return m
}

func checkMags(t *testing.T, name string, got, want [3]float64, scale float64) {
	t.Helper()
	for i := range got {
		if math.Abs(got[i]-want[i]) > relTol*scale {
			t.Errorf("%s: HV phase magnitudes %v A, want %v A", name, got, want)
			return
		}
	}
}

// TestPhaseShiftAngles: a bolted LLL fault on the LV side of a Dyn11
// transformer shows on the HV side 30° behind the LV current (the LV side
// leads by 30°, IEC 60076-1 clock notation), Dyn1 30° ahead, and YNyn0 in
// phase.
func TestPhaseShiftAngles(t *testing.T) {
	for group, hvMinusLV := range map[string]float64{"Dyn11": -30, "Dyn1": 30, "YNyn0": 0, "Dyn5": 150, "Yd7": -150} {
		eng, err := New(substation(group, 0), Settings{})
		if err != nil {
			t.Fatal(err)
		}
		sol, _ := eng.Solve(eng.CaseFault(AtBus(1), LLL, Max))
		lv := sol.FaultCurrents().Phases()[0]
		hv := sol.At(Point{Branch: 0, End: From}).Phases()[0]
		d := normDeg((cmplx.Phase(hv) - cmplx.Phase(lv)) * 180 / math.Pi)
		if math.Abs(d-hvMinusLV) > 1e-9 {
			t.Errorf("%s: HV current angle − LV current angle = %.6f°, want %g°", group, d, hvMinusLV)
		}
	}
}

// TestResistanceEarthing: an LG fault on a system earthed through a
// neutral resistor stays near Un/(√3·R_N) (common practice: 11 kV with
// 15.9 Ω gives about 400 A), with the voltage factor c of the case, here
// within 3 % because the source and transformer impedances are small
// beside 3·R_N.
func TestResistanceEarthing(t *testing.T) {
	const rn = 15.9
	eng, err := New(substation("Dyn11", rn), Settings{})
	if err != nil {
		t.Fatal(err)
	}
	for _, cs := range Cases {
		sol, _ := eng.Solve(eng.CaseFault(AtBus(1), LG, cs))
		c := eng.Settings().VoltageFactor(11, cs)
		approx := c * 11e3 / (math.Sqrt(3) * rn)
		got := sol.FaultCurrents().PhaseMaxA()
		if math.Abs(got-approx) > 0.03*approx {
			t.Errorf("%s: LG current %g A, want within 3 %% of c·Un/(√3·R_N) = %g A", cs, got, approx)
		}
	}
	// At c = 1 the rule's own figure: 11 kV / (√3·15.9 Ω) ≈ 399 A.
	if v := 11e3 / (math.Sqrt(3) * rn); math.Abs(v-399.4) > 0.1 {
		t.Errorf("Un/(√3·R_N) = %g A, want about 400 A", v)
	}
}

// TestTransformerClosedForm checks an LV fault against the hand formula
// with the IEC 60909-0 transformer correction K_T = 0.95·c_max/(1+0.6·x_T)
// in the maximum case and none in the minimum case, for a Dyn11 unit with
// a solidly earthed LV star point (Z0 of the LV side = Z_T).
func TestTransformerClosedForm(t *testing.T) {
	n := substation("Dyn11", 0)
	eng, err := New(n, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	tr := n.Transformers[0]
	zt := polarXR(tr.ZPct/100*11*11/tr.MVA, tr.XR) // Ω at 11 kV
	for _, cs := range Cases {
		c := eng.Settings().VoltageFactor(11, cs)
		st, k := n.Sources[0].Max, TransformerCorrection(1.10, tr.ZPct, tr.XR)
		if cs == Min {
			st, k = n.Sources[0].Min, 1
		}
		zq := polarXR(c*33*33/st.SCMVA, st.XR) * complex(11.0*11.0/(33*33), 0) // referred to 11 kV
		z1 := zq + complex(k, 0)*zt
		z0 := complex(k, 0) * zt
		k3 := c * 11e3 / (math.Sqrt(3) * cmplx.Abs(z1))
		k1 := math.Sqrt(3) * c * 11e3 / cmplx.Abs(2*z1+z0)
		for kind, want := range map[Kind]float64{LLL: k3, LG: k1} {
			sol, _ := eng.Solve(eng.CaseFault(AtBus(1), kind, cs))
			if got := sol.FaultCurrents().PhaseMaxA(); !near(got, want, relTol) {
				t.Errorf("%s %s on LV: %g A, want %g A", cs, kind, got, want)
			}
		}
	}
}

// TestZeroSequenceByConnection checks the textbook zero-sequence paths
// (Grainger & Stevenson ch. 11, transformer connection table): an earth
// fault on the HV side draws zero-sequence current through the
// transformer only for YNd (shunt on the YN side) and YNyn with an earthed
// LV source; never for Dyn, Yy or Dd.
func TestZeroSequenceByConnection(t *testing.T) {
	cases := []struct {
		group   string
		through bool // HV earth fault drives 3I0 through the HV terminals
	}{
		{"YNd1", true}, {"YNd11", true}, {"Dyn11", false}, {"Dyn1", false},
		{"Yy0", false}, {"Dd0", false}, {"YNyn0", false}, {"Yd11", false},
	}
	for _, c := range cases {
		eng, err := New(substation(c.group, 0), Settings{})
		if err != nil {
			t.Fatal(err)
		}
		sol, _ := eng.Solve(eng.CaseFault(AtBus(0), LG, Max))
		// The transformer's HV terminal relay looks into the transformer.
		r := sol.At(Point{Branch: 0, End: From}).ResidualA()
		if got := r > 1e-6; got != c.through {
			t.Errorf("%s: HV earth fault gives transformer residual %g A; want flow %v", c.group, r, c.through)
		}
	}
}

// TestSymmetricalIdentities checks the facts of Fortescue's components:
// a bolted LLL fault gives three equal currents 120° apart that sum to
// zero; an LL fault gives I0 = 0 and I1 = −I2.
func TestSymmetricalIdentities(t *testing.T) {
	eng, err := New(substation("Dyn11", 10), Settings{})
	if err != nil {
		t.Fatal(err)
	}
	pts := []Point{{0, From}, {0, To}}
	for _, cs := range Cases {
		lll, _ := eng.Solve(eng.CaseFault(AtBus(1), LLL, cs))
		for _, pt := range pts {
			p := lll.At(pt).Phases()
			m := cmplx.Abs(p[0])
			for i := 0; i < 3; i++ {
				if !near(cmplx.Abs(p[i]), m, relTol) {
					t.Errorf("LLL: |I%d| = %g, want %g", i, cmplx.Abs(p[i]), m)
				}
				step := normDeg((cmplx.Phase(p[i]) - cmplx.Phase(p[(i+1)%3])) * 180 / math.Pi)
				if math.Abs(step-120) > 1e-7 {
					t.Errorf("LLL: phase %d leads phase %d by %g°, want 120°", i, (i+1)%3, step)
				}
			}
			if s := cmplx.Abs(p[0] + p[1] + p[2]); s > relTol*m {
				t.Errorf("LLL: Ia+Ib+Ic = %g A, want 0", s)
			}
		}
		// In the fault's own zone I1 = −I2; across the Dyn11 the two
		// sequences turn by opposite angles, so only |I1| = |I2| remains.
		ll, _ := eng.Solve(eng.CaseFault(AtBus(1), LL, cs))
		for _, s := range [][3]complex128{ll.FaultCurrents().Seq, ll.At(Point{0, To}).Seq} {
			if s[zero] != 0 || cmplx.Abs(s[pos]+s[neg]) > relTol*cmplx.Abs(s[pos]) {
				t.Errorf("LL: I0 = %v, I1+I2 = %v; want both 0", s[zero], s[pos]+s[neg])
			}
		}
		s := ll.At(Point{0, From}).Seq
		if s[zero] != 0 || !near(cmplx.Abs(s[pos]), cmplx.Abs(s[neg]), relTol) {
			t.Errorf("LL seen on HV: I0 = %v, |I1| = %g, |I2| = %g; want 0 and equal", s[zero], cmplx.Abs(s[pos]), cmplx.Abs(s[neg]))
		}
	}
}
