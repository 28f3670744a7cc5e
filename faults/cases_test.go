package faults

import (
	"math"
	"math/cmplx"
	"testing"
)

// TestVoltageFactorTable: without overrides the factors are those of
// IEC 60909-0:2016 Table 1 (above 1 kV 1.10/1.00; up to 1 kV 1.05/0.95,
// or 1.10/0.90 for +10 % systems, the 0.90 from memory); CMax and CMin
// replace them at every voltage.
func TestVoltageFactorTable(t *testing.T) {
	cases := []struct {
		name string
		set  Settings
		kv   float64
		want [2]float64 // max, min
	}{
		{"11 kV", Settings{}, 11, [2]float64{1.10, 1.00}},
		{"0.4 kV +6 %", Settings{}, 0.4, [2]float64{1.05, 0.95}},
		{"0.4 kV +10 %", Settings{LVTolerance10: true}, 0.4, [2]float64{1.10, 0.90}},
		{"1 kV is low voltage", Settings{}, 1, [2]float64{1.05, 0.95}},
		{"override at 11 kV", Settings{CMax: 1.0, CMin: 0.95}, 11, [2]float64{1.0, 0.95}},
		{"override at 0.4 kV", Settings{CMax: 1.05, CMin: 1.0, LVTolerance10: true}, 0.4, [2]float64{1.05, 1.0}},
		{"c_max only", Settings{CMax: 1.05}, 11, [2]float64{1.05, 1.00}},
	}
	for _, c := range cases {
		got := [2]float64{c.set.VoltageFactor(c.kv, Max), c.set.VoltageFactor(c.kv, Min)}
		if got != c.want {
			t.Errorf("%s: c_max, c_min = %v, want %v", c.name, got, c.want)
		}
	}
}

// TestVoltageFactorOverride: a study that grades on nominal voltage sets
// c_max = 1.0. The equivalent voltage source is then Un/√3 and a network
// feeder's impedance c·Un²/S"k is taken with the same c (IEC 60909-0 network
// feeder), so the source bus still gives back S"k and the line end gives
// I"k3 = c·Un/(√3·|Z_Q + Z_L|) with c = 1.0 throughout.
func TestVoltageFactorOverride(t *testing.T) {
	n := radial(false)
	set := Settings{CMax: 1.0, CMin: 0.9}
	eng, err := New(n, set)
	if err != nil {
		t.Fatal(err)
	}
	for _, cs := range Cases {
		c, st := 1.0, n.Sources[0].Max
		if cs == Min {
			c, st = 0.9, n.Sources[0].Min
		}
		src, _ := eng.Solve(eng.CaseFault(AtBus(0), LLL, cs))
		if s := math.Sqrt(3) * 11 * src.FaultCurrents().PhaseMaxA() / 1000; !near(s, st.SCMVA, relTol) {
			t.Errorf("%s: source bus gives %g MVA, want S\"k %g MVA", cs, s, st.SCMVA)
		}
		zq := polarXR(c*11*11/st.SCMVA, st.XR)
		want := c * 11e3 / (math.Sqrt(3) * cmplx.Abs(zq+n.Lines[0].Z1Ohm))
		end, _ := eng.Solve(eng.CaseFault(AtBus(1), LLL, cs))
		if got := end.FaultCurrents().PhaseMaxA(); !near(got, want, relTol) {
			t.Errorf("%s: I\"k3 at the line end %g A, want %g A", cs, got, want)
		}
	}
}

// TestFaultReactance: a minimum-case fault impedance R + jX enters the
// sequence connections as a complex impedance (Grainger & Stevenson
// ch. 12): LG I = 3·E/|Z1 + Z2 + Z0 + 3Zf|, LL I = √3·|E/(Z1 + Z2 + Zf)|,
// LLL I = |E/(Z1 + Zf)|. A reactance changes the current differently from
// a resistance of the same size, since the network is mostly reactive.
func TestFaultReactance(t *testing.T) {
	n := radial(true)
	set := Settings{EarthFaultOhm: 4, EarthFaultXOhm: 3, PhaseFaultOhm: 0.3, PhaseFaultXOhm: 0.4}
	eng, err := New(n, set)
	if err != nil {
		t.Fatal(err)
	}
	st := n.Sources[0].Min
	zs := polarXR(1.0*11*11/st.SCMVA, st.XR)
	z1 := zs + n.Lines[0].Z1Ohm
	z0 := polarXR(1.5*cmplx.Abs(zs), 4) + n.Lines[0].Z0Ohm
	e := complex(11e3/math.Sqrt(3), 0)
	zfe, zfp := complex(4, 3), complex(0.3, 0.4)
	want := map[Kind]float64{
		LLL: cmplx.Abs(e / (z1 + zfp)),
		LL:  math.Sqrt(3) * cmplx.Abs(e/(2*z1+zfp)),
		LG:  3 * cmplx.Abs(e/(2*z1+z0+3*zfe)),
	}
	for k, w := range want {
		f := eng.CaseFault(AtBus(1), k, Min)
		if wz := map[bool]complex128{true: zfe, false: zfp}[k.Earth()]; f.ZOhm != wz {
			t.Errorf("%s: fault impedance %v, want %v", k, f.ZOhm, wz)
		}
		sol, err := eng.Solve(f)
		if err != nil {
			t.Fatal(err)
		}
		if got := sol.FaultCurrents().PhaseMaxA(); !near(got, w, relTol) {
			t.Errorf("%s min with Zf: %g A, want %g A", k, got, w)
		}
		if mx := eng.CaseFault(AtBus(1), k, Max); mx.ZOhm != 0 {
			t.Errorf("%s max: fault impedance %v, want bolted", k, mx.ZOhm)
		}
	}
}
