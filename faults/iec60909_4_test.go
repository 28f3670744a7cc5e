package faults_test

import (
	"fmt"
	"math"
	"runtime"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/faults"
)

// The high-voltage test network of IEC TR 60909-4 (380/110/30/10 kV, fault
// locations F1–F8 at buses B1–B8), entered element by element in
// ../testdata/iec60909-4/network.toml: two network feeders, two power
// station units (one with an on-load tap changer, K_S; one without, K_SO),
// a generator on a busbar (K_G), two three-winding network transformers
// whose MV star branch has a negative reactance, two two-winding network
// transformers, six lines and cables and two asynchronous motor groups.
//
// IEC TR 60909-4 itself was not at hand. The published values below were
// read from the test suites of open-source projects that transcribe the
// TR, cited per list:
//
//	PP  e2nIEE/pandapower @ cea232038682e2014908be4066c35774ef17a5b8,
//	    pandapower/test/shortcircuit/test_iec60909_4.py
//	PS  powsybl/powsybl-incubator @ ff063478dccc90ddb3a9a7bed04b6802e3b51c94,
//	    simulator/short-circuit/src/test/.../ShortCircuitBalancedTest.java,
//	    ShortCircuitMonophasedTest.java, and util/.../ReferenceNetwork.java
//	RW  rwl/iec60909 @ f20c52edf942456b9e685d57c4df54dfbab11005,
//	    src/tests/iec60909_4_6.rs
//
// where "PP, PS" means both give the figure independently.

// iecTestNetwork loads the test network through the study loader, as a
// user's study is loaded, and builds its engine with t_min = 0.1 s.
func iecTestNetwork(t *testing.T) (*coord.Study, *faults.Engine) {
	t.Helper()
	s, err := study.Load("../testdata/iec60909-4/network.toml")
	if err != nil {
		t.Fatal(err)
	}
	set := s.Faults
	set.MinTimeDelayS = iecMinTimeDelayS
	eng, err := faults.New(s.Network, set)
	if err != nil {
		t.Fatal(err)
	}
	return s, eng
}

// iecMinTimeDelayS is the minimum time delay of the breaking currents
// below. The sources do not state it; 0.1 s is the one of the standard's
// four tabulated delays whose results come nearest (t_min 0.02 s and 0.25 s
// miss by up to 7.6 % and 4.8 % at F7).
const iecMinTimeDelayS = 0.1

// iecBus returns the index of bus name.
func iecBus(t *testing.T, n *faults.Network, name string) int {
	t.Helper()
	for i, b := range n.Buses {
		if b.Name == name {
			return i
		}
	}
	t.Fatalf("no bus %q", name)
	return -1
}

// iecRelTol is the agreement the issue asks of I"k3 and I"k1. The engine
// reproduces them within 3.9e-6 (the published figures carry six
// significant digits).
const iecRelTol = 1e-4

// TestIEC60909_4InitialCurrents: I"k3 at F1–F8 and I"k1 at F1–F5 of the
// maximum case (c_max = 1.1, motors in service).
func TestIEC60909_4InitialCurrents(t *testing.T) {
	s, eng := iecTestNetwork(t)
	var worst float64
	defer func() { t.Logf("largest relative difference from the published I\"k3 and I\"k1: %.1e", worst) }()
	// I"k3 in kA: PP (first eight entries of ikss in test_iec_60909_4_3ph)
	// and PS (shortCircuitIec31TestNetwork, "expected in doc").
	ik3 := []float64{40.6447, 31.7831, 19.6730, 16.2277, 33.1894, 37.5629, 25.5895, 13.5778}
	// I"k1 in kA: F2–F5 PP and PS (shortCircuitIecTestNetworkMono); F1 PP
	// only (the skipped test_iec_60909_4_1ph).
	ik1 := []float64{24.6526, 15.9722, 10.4106, 9.0498, 17.0452}
	for i, want := range ik3 {
		k := iecBus(t, s.Network, fmt.Sprintf("B%d", i+1))
		sol, err := eng.Solve(eng.CaseFault(faults.AtBus(k), faults.LLL, faults.Max))
		if err != nil {
			t.Fatal(err)
		}
		got := sol.FaultCurrents().PhaseMaxA() / 1000
		worst = math.Max(worst, math.Abs(got/want-1))
		if math.Abs(got/want-1) > iecRelTol {
			t.Errorf("F%d: I\"k3 = %.4f kA, published %.4f kA (difference %.1e)", i+1, got, want, got/want-1)
		}
	}
	for i, want := range ik1 {
		k := iecBus(t, s.Network, fmt.Sprintf("B%d", i+1))
		sol, err := eng.Solve(eng.CaseFault(faults.AtBus(k), faults.LG, faults.Max))
		if err != nil {
			t.Fatal(err)
		}
		got := sol.FaultCurrents().PhaseMaxA() / 1000
		worst = math.Max(worst, math.Abs(got/want-1))
		if math.Abs(got/want-1) > iecRelTol {
			t.Errorf("F%d: I\"k1 = %.4f kA, published %.4f kA (difference %.1e)", i+1, got, want, got/want-1)
		}
	}
}

// TestIEC60909_4PeakAndBreaking: i_p by κ method C and I_b at every fault
// location, against the lists PP gives in test_iec_60909_4_3ph. Their
// provenance is weaker than that of I"k (no second source): the κ-c list
// (ip_standard_kappa_c) is named there as the standard's and PP asserts its
// own result against it to 1e-3 kA; the I_b list carries no comment and
// no stated t_min, and at F1 and F8 it equals I"k to its printed digits,
// where the standard's decay terms take off a few amperes. So i_p is held
// to the published digits and I_b to 2e-3 (the engine's largest difference
// is 1.7e-3, at F7).
func TestIEC60909_4PeakAndBreaking(t *testing.T) {
	s, eng := iecTestNetwork(t)
	ip := []float64{100.5677, 80.6079, 45.8111, 36.8427, 83.4033, 98.1434, 51.6899, 36.9227}
	ib := []float64{40.645, 31.570, 19.388, 16.017, 32.795, 34.028, 23.212, 13.578}
	const ipTol, ibTol = 1e-5, 2e-3
	for i := range ip {
		k := iecBus(t, s.Network, fmt.Sprintf("B%d", i+1))
		d, err := eng.Duty(k)
		if err != nil {
			t.Fatal(err)
		}
		if got := d.PeakA / 1000; math.Abs(got/ip[i]-1) > ipTol {
			t.Errorf("F%d: i_p = %.4f kA (κ %.5f), published %.4f kA", i+1, got, d.Kappa, ip[i])
		}
		if got := d.BreakingA / 1000; math.Abs(got/ib[i]-1) > ibTol {
			t.Errorf("F%d: I_b = %.4f kA, published %.3f kA", i+1, got, ib[i])
		}
		if !(d.BreakingA <= d.IkA) || !(d.SteadyA <= d.IkA) {
			t.Errorf("F%d: I_b %.1f A and I_k %.1f A must not exceed I\"k %.1f A", i+1, d.BreakingA, d.SteadyA, d.IkA)
		}
	}
}

// printed compares a value with a figure printed to digits decimals: it
// must round to it.
func printed(t *testing.T, what string, got, want float64, digits int) {
	t.Helper()
	half := 0.5 * math.Pow(10, -float64(digits))
	if math.Abs(got-want) > half*(1+1e-9) {
		t.Errorf("%s = %.*f, printed %.*f", what, digits+2, got, digits, want)
	}
}

// printedZ compares an impedance with one printed to six decimals.
func printedZ(t *testing.T, what string, got, want complex128) {
	t.Helper()
	printed(t, what+" R", real(got), real(want), 6)
	printed(t, what+" X", imag(got), imag(want), 6)
}

// TestIEC60909_4CorrectedImpedances: the correction factors and corrected
// impedances the TR prints, to their printed digits, from the raw data as
// the study loader reads it (RW's impedance tests and PS's network data,
// which agree wherever both give a figure; Z_TC's resistance is RW's).
func TestIEC60909_4CorrectedImpedances(t *testing.T) {
	s, _ := iecTestNetwork(t)
	n := s.Network
	const cmax = 1.1
	find := func(name string) int {
		for b := 0; b < n.BranchCount(); b++ {
			if n.BranchName(b) == name {
				return b
			}
		}
		t.Fatalf("no branch %q", name)
		return -1
	}

	// Network feeders: |Z_Q| = c·U_nQ²/S"kQ with R/X = 0.1 (Ω at 380 and 110 kV).
	zq := func(i int) complex128 {
		src := n.Sources[i]
		un := n.Buses[src.Bus].KV
		mag := cmax * un * un / src.Max.SCMVA
		x := mag / math.Sqrt(1+1/(src.Max.XR*src.Max.XR))
		return complex(x/src.Max.XR, x)
	}
	printedZ(t, "Z_Q1", zq(0), complex(0.631933, 6.319335))
	printedZ(t, "Z_Q2", zq(1), complex(0.434454, 4.344543))

	// Three-winding T3: K_T per pair, then the star (Ω on the 120 kV side,
	// the star branches being referred to 400 kV by the engine).
	t3, _, _ := n.Star(find("T3 (HV)"))
	var kt [3]float64
	for p := range kt {
		kt[p] = t3.PairCorrection(p, cmax)
	}
	printed(t, "K_TAB", kt[faults.HVMV], 0.928072, 6)
	printed(t, "K_TAC", kt[faults.HVLV], 0.985856, 6)
	printed(t, "K_TBC", kt[faults.MVLV], 1.002890, 6)
	z1, _ := t3.StarOhm(kt)
	to120 := complex(120.0*120/(400*400), 0)
	printedZ(t, "Z_TA", z1[faults.HV]*to120, complex(0.045714, 8.096989))
	printedZ(t, "Z_TB", z1[faults.MV]*to120, complex(0.053563, -0.079062))
	printedZ(t, "Z_TC", z1[faults.LV]*to120, complex(0.408568, 20.292035))
	// T4 seen from its earthed MV side in the zero sequence: its MV and
	// delta (LV) star branches in series (PS; the rule R(0) = R_AB, X(0) =
	// 2.1·X_AB corrected by K_TBC reproduces it, see the network file).
	t4, _, _ := n.Star(find("T4 (MV)"))
	_, z0 := t4.StarOhm(kt)
	printedZ(t, "Z(0) of T4 from MV", (z0[faults.MV]+z0[faults.LV])*to120, complex(0.107281, 18.195035))

	// Network transformers T5, T6: K_T and Z_TK on the 115 kV side.
	t5 := n.Transformer(find("T5"))
	k5 := faults.TransformerCorrection(cmax, t5.ZPct, t5.XR)
	printed(t, "K_T5", k5, 0.974870, 6)
	printedZ(t, "Z_T5K", twoWindingOhm(t5, t5.KVFrom)*complex(k5, 0), complex(2.046454, 49.072241))

	// Power station units: K_S of S1 and K_SO of S2, and Z_S = K·(t_r²·Z_G +
	// Z_THV) on the 110 kV side.
	for _, c := range []struct {
		gen       string
		k         float64
		z, z0     complex128
		hasZ0     bool
		neutralXN float64
	}{
		{gen: "G1", k: 0.995975, z: complex(0.498795, 26.336676), z0: complex(0.439059, 79.340874), hasZ0: true, neutralXN: 22},
		{gen: "G2", k: 0.876832, z: complex(1.203944, 35.340713)},
	} {
		var g *faults.Generator
		for i := range n.Generators {
			if n.Generators[i].Name == c.gen {
				g = &n.Generators[i]
			}
		}
		tr := &n.Transformers[g.Unit.Transformer]
		hv := tr.From
		xT := tr.ZPct * tr.XR / math.Sqrt(1+tr.XR*tr.XR)
		k := faults.UnitCorrection(*g.Unit, n.Buses[hv].KV, g.KV, tr.KVFrom, tr.KVTo, cmax, g.XdPct, xT, g.PF)
		printed(t, "K_S of "+c.gen, k, c.k, 6)
		tr2 := complex(tr.KVFrom*tr.KVFrom/(tr.KVTo*tr.KVTo), 0)
		zg := complex(g.RPct, g.XdPct) * complex(g.KV*g.KV/g.MVA/100, 0)
		printedZ(t, "Z_S of "+c.gen, complex(k, 0)*(tr2*zg+twoWindingOhm(tr, tr.KVFrom)), c.z)
		if c.hasZ0 {
			z0T := polar(tr.Z0Pct/100*tr.KVFrom*tr.KVFrom/tr.MVA, tr.X0R0)
			printedZ(t, "Z(0)S of "+c.gen, complex(k, 0)*z0T+complex(0, 3*c.neutralXN), c.z0)
		}
	}

	// G3 on the 10 kV busbar: K_G = (Un/U_rG)·c_max/(1 + x"d·sin φ_rG).
	g3 := n.Generators[2]
	kg := faults.GeneratorCorrection(10, g3.KV, cmax, g3.XdPct, g3.PF)
	printed(t, "K_G of G3", kg, 0.988320, 6)
	printedZ(t, "Z_G3K", complex(kg, 0)*complex(g3.RPct, g3.XdPct)*complex(g3.KV*g3.KV/g3.MVA/100, 0), complex(0.017790, 1.089623))

	// Asynchronous motors, R_M/X_M left to the default rule (Ω at 10 kV).
	printedZ(t, "Z_M1", n.Motors[0].ZOhm(), complex(0.341497, 3.414968))
	printedZ(t, "Z_M2 (both)", n.Motors[1].ZOhm(), complex(0.412137, 4.121368))
}

// twoWindingOhm returns a two-winding transformer's uncorrected positive-
// sequence impedance in ohms on its winding of rated voltage kv.
func twoWindingOhm(tr *faults.Transformer, kv float64) complex128 {
	return polar(tr.ZPct/100*kv*kv/tr.MVA, tr.XR)
}

// polar returns the impedance of magnitude mag and ratio X/R = xr.
func polar(mag, xr float64) complex128 {
	r := mag / math.Sqrt(1+xr*xr)
	return complex(r, r*xr)
}

// TestAllDutiesMatchDuty: the all-bus computation (a column of the bus
// impedance matrix per machine bus) gives every bus the figures of the
// single-bus one (transfer impedances one by one), on the test network and
// on a generated network with three-winding transformers, motors and power
// station units, and does not depend on the number of CPUs.
func TestAllDutiesMatchDuty(t *testing.T) {
	_, iec := iecTestNetwork(t)
	net, _ := generateMachineNetwork(5, 300)
	gen, err := faults.New(net, faults.Settings{MinTimeDelayS: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	for _, eng := range []*faults.Engine{iec, gen} {
		all, err := eng.AllDuties()
		if err != nil {
			t.Fatal(err)
		}
		decayed := 0
		for k, d := range all {
			one, err := eng.Duty(k)
			if err != nil {
				t.Fatal(err)
			}
			if eng.Network().Buses[k].Internal {
				one = faults.Duty{Bus: k}
			}
			if d.IkA != one.IkA || d.PeakA != one.PeakA || d.SteadyA != one.SteadyA || math.Abs(d.BreakingA-one.BreakingA) > 1e-9*d.IkA {
				t.Errorf("bus %s: AllDuties %+v, Duty %+v", eng.Network().Buses[k].Name, d, one)
			}
			if d.BreakingA < d.IkA {
				decayed++
			}
		}
		if decayed == 0 {
			t.Error("no bus's breaking current decays: the comparison checks nothing")
		}
		prev := runtime.GOMAXPROCS(1)
		one, err := eng.AllDuties()
		runtime.GOMAXPROCS(prev)
		if err != nil {
			t.Fatal(err)
		}
		for k := range all {
			if one[k] != all[k] {
				t.Errorf("bus %d: %+v on one CPU, %+v on %d", k, one[k], all[k], prev)
			}
		}
	}
}
