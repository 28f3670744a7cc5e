package faults

import (
	"math"
	"math/cmplx"
	"testing"
)

// motorAlone is an 11 kV grid bus A feeding, through a cable, bus B where
// the only other element is an asynchronous motor.
func motorAlone(m Motor) *Network {
	m.Bus = 1
	return &Network{
		Buses: []Bus{{Name: "A", KV: 11}, {Name: "B", KV: 11}},
		Sources: []Source{{Name: "grid", Bus: 0, Earthed: true, Z0Z1: 1,
			Max: Strength{SCMVA: 250, XR: 10}, Min: Strength{SCMVA: 150, XR: 10}}},
		Lines:  []Line{{Name: "C", From: 0, To: 1, Z1Ohm: complex(0.3, 0.2), Z0Ohm: complex(1.2, 0.8)}},
		Motors: []Motor{m},
	}
}

// TestMotorAloneOnBus: a motor group alone on a bus behind a cable, against
// the IEC 60909-0 motor impedance worked by hand: Z_M =
// (1/(I_LR/I_rM))·U_rM²/S_rM with S_rM = P_rM/(η·cos φ), X_M =
// Z_M/√(1 + (R_M/X_M)²), divided by the number of motors. A three-phase
// fault at the grid bus draws E/(Z_C + Z_M) through the cable from the
// motor side in the maximum case and nothing in the minimum case (motors
// are left out); an earth fault draws no residual current from it (no
// zero-sequence path).
func TestMotorAloneOnBus(t *testing.T) {
	cases := []struct {
		name string
		m    Motor
		rx   float64 // the default R_M/X_M the rule gives
	}{
		// 1.5 MW per pair of poles, medium voltage: 0.10.
		{"MV large", Motor{Name: "M", MW: 3, KV: 11, PF: 0.86, Eff: 0.96, LockedRotor: 6, PolePairs: 2, Count: 1}, 0.10},
		// 0.4 MW per pair of poles: 0.15.
		{"MV small", Motor{Name: "M", MW: 0.8, KV: 11, PF: 0.84, Eff: 0.95, LockedRotor: 5.5, PolePairs: 2, Count: 3}, 0.15},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			eng, err := New(motorAlone(c.m), Settings{})
			if err != nil {
				t.Fatal(err)
			}
			s := c.m.MW / (c.m.Eff * c.m.PF)
			z := c.m.KV * c.m.KV / (c.m.LockedRotor * s) / float64(max(c.m.Count, 1))
			x := z / math.Sqrt(1+c.rx*c.rx)
			zm := complex(c.rx*x, x)
			if got := c.m.ZOhm(); cmplx.Abs(got-zm) > relTol*z {
				t.Fatalf("Z_M = %v Ω, want %v Ω", got, zm)
			}
			e := 1.1 * 11e3 / math.Sqrt(3)
			want := e / cmplx.Abs(complex(0.3, 0.2)+zm)
			cable := Point{Branch: 0, End: To}
			sol, _ := eng.Solve(eng.CaseFault(AtBus(0), LLL, Max))
			if got := sol.At(cable).PhaseMaxA(); !near(got, want, relTol) {
				t.Errorf("max LLL at A: %g A from the motor side, want %g A", got, want)
			}
			sol, _ = eng.Solve(eng.CaseFault(AtBus(0), LLL, Min))
			if got := sol.At(cable).PhaseMaxA(); got != 0 {
				t.Errorf("min LLL at A: %g A from the motor side, want 0 (motors left out)", got)
			}
			sol, _ = eng.Solve(eng.CaseFault(AtBus(0), LG, Max))
			if got := sol.At(cable).ResidualA(); got != 0 {
				t.Errorf("max LG at A: residual %g A from the motor side, want 0", got)
			}
		})
	}
}

// TestDefaultMotorRX: the standard's R_M/X_M by voltage and power per
// pair of poles (IEC 60909-0, from memory): 0.10, 0.15, 0.42.
func TestDefaultMotorRX(t *testing.T) {
	for _, c := range []struct{ kv, m, want float64 }{
		{10, 5, 0.10}, {10, 1, 0.10}, {6.6, 0.99, 0.15}, {0.4, 0.05, 0.42}, {0.69, 2, 0.42},
	} {
		if got := DefaultMotorRX(c.kv, c.m); got != c.want {
			t.Errorf("DefaultMotorRX(%g kV, %g MW/pair) = %g, want %g", c.kv, c.m, got, c.want)
		}
	}
}

// stationUnit is a 132 kV bus fed only by a power station unit: a 60 MVA
// generator on its own 11 kV bus behind a 132/11 kV unit transformer.
func stationUnit(u StationUnit) *Network {
	u.Transformer = 0
	g, _ := ParseVectorGroup("YNd11")
	return &Network{
		Buses: []Bus{{Name: "HV", KV: 132}, {Name: "G", KV: 11}},
		Generators: []Generator{{Name: "G", Bus: 1, MVA: 60, KV: 11, XdPct: 18, RPct: 0.4, PF: 0.8,
			InMax: true, InMin: true, Earth: Neutral{Isolated: true}, Unit: &u}},
		Transformers: []Transformer{{Name: "UT", From: 0, To: 1, MVA: 65, KVFrom: 138, KVTo: 11,
			ZPct: 13, XR: 40, Group: g}},
	}
}

// TestStationUnitClosedForm: a three-phase fault at the HV bus of a power
// station unit alone draws c·U_n/(√3·|Z_S|) with Z_S = K·(t_r²·Z_G + Z_THV)
// in the maximum case (K_S with an on-load tap changer, K_SO without, the
// IEC 60909-0 forms worked by hand here) and the uncorrected impedance in
// the minimum case.
func TestStationUnitClosedForm(t *testing.T) {
	sin := 0.6 // cos φ_rG 0.8
	xT := 0.13 * 40 / math.Sqrt(1+40*40)
	zG := complex(0.004, 0.18) * complex(11*11/60.0, 0)
	zT := polarXR(0.13*138*138/65, 40)
	tr2 := complex(138*138/(11*11.0), 0)
	for _, c := range []struct {
		name string
		u    StationUnit
		k    float64
	}{
		{"K_S", StationUnit{OnLoadTapChanger: true},
			(132.0 / 11 * 11 / 138) * (132.0 / 11 * 11 / 138) * 1.1 / (1 + math.Abs(0.18-xT)*sin)},
		{"K_SO", StationUnit{TapPct: -2.5, PGPct: 5},
			132.0 / (11 * 1.05) * 11 / 138 * (1 - 0.025) * 1.1 / (1 + 0.18*sin)},
	} {
		t.Run(c.name, func(t *testing.T) {
			n := stationUnit(c.u)
			eng, err := New(n, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			for _, cs := range Cases {
				k, volt := c.k, 1.1
				if cs == Min {
					k, volt = 1, 1.0
				}
				want := volt * 132e3 / math.Sqrt(3) / cmplx.Abs(complex(k, 0)*(tr2*zG+zT))
				sol, _ := eng.Solve(eng.CaseFault(AtBus(0), LLL, cs))
				if got := sol.FaultCurrents().PhaseMaxA(); !near(got, want, relTol) {
					t.Errorf("%s: I\"k3 at HV = %g A, want %g A", cs, got, want)
				}
			}
		})
	}
}

// TestDecayFactors: μ and q of IEC 60909-0:2016 eqs. (70) and (73) (from
// memory) at their tabulated delays, the far-fault rule μ = 1 for a share
// of at most twice the rated current, the bounds μ ≤ 1 and 0 ≤ q ≤ 1, and
// linear interpolation between delays.
func TestDecayFactors(t *testing.T) {
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"μ(2, 0.02)", DecayMu(2, 0.02), 1},
		{"μ(6, 0.02)", DecayMu(6, 0.02), 0.84 + 0.26*math.Exp(-0.26*6)},
		{"μ(6, 0.05)", DecayMu(6, 0.05), 0.71 + 0.51*math.Exp(-0.30*6)},
		{"μ(6, 0.10)", DecayMu(6, 0.10), 0.62 + 0.72*math.Exp(-0.32*6)},
		{"μ(6, 0.25)", DecayMu(6, 0.25), 0.56 + 0.94*math.Exp(-0.38*6)},
		{"μ(6, 1.0)", DecayMu(6, 1.0), 0.56 + 0.94*math.Exp(-0.38*6)},
		{"μ(1.5, 0.25)", DecayMu(1.5, 0.25), 1},
		{"μ(6, 0.075)", DecayMu(6, 0.075), (DecayMu(6, 0.05) + DecayMu(6, 0.10)) / 2},
		{"q(1, 0.02)", DecayQ(1, 0.02), 1},
		{"q(0.1, 0.10)", DecayQ(0.1, 0.10), 0.57 + 0.12*math.Log(0.1)},
		{"q(0.01, 0.25)", DecayQ(0.01, 0.25), 0},
		{"q(1, 0.25)", DecayQ(1, 0.25), 0.26},
	} {
		if math.Abs(c.got-c.want) > 1e-12 {
			t.Errorf("%s = %.12g, want %.12g", c.name, c.got, c.want)
		}
	}
}

// TestDutyClosedForm: a grid equivalent alone gives κ from its own R/X
// (method C scales X and R/X back by the same f_c/f, so a single R–L
// branch keeps its ratio), i_p = κ·√2·I"k, and no decay (I_b = I_k =
// I"k). A generator alone at its terminals decays by (X_K/|Z_K|)·(1 −
// μ)·I"k with μ from I"k/I_rG (IEC 60909-0 I_b of a meshed network
// reduced to one machine).
func TestDutyClosedForm(t *testing.T) {
	n := radial(true)
	eng, err := New(n, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	d, err := eng.Duty(0)
	if err != nil {
		t.Fatal(err)
	}
	ik := 1.1 * 11e3 / math.Sqrt(3) / (1.1 * 11 * 11 / 250)
	wantK := 1.02 + 0.98*math.Exp(-3*0.1)
	if !near(d.IkA, ik, relTol) || !near(d.Kappa, wantK, relTol) || !near(d.PeakA, wantK*math.Sqrt2*ik, relTol) ||
		!near(d.BreakingA, ik, relTol) || !near(d.SteadyA, ik, relTol) {
		t.Errorf("grid alone: %+v; want I\"k = I_b = I_k = %g A, κ %g", d, ik, wantK)
	}

	g := Network{Buses: []Bus{{Name: "G", KV: 11}}, Generators: []Generator{{Name: "G", Bus: 0, MVA: 20, KV: 11,
		XdPct: 15, PF: 0.85, InMax: true, Earth: Neutral{Isolated: true}}}}
	for _, tmin := range []float64{0.02, 0.1, 0.3} {
		eng, err := New(&g, Settings{MinTimeDelayS: tmin})
		if err != nil {
			t.Fatal(err)
		}
		d, err := eng.Duty(0)
		if err != nil {
			t.Fatal(err)
		}
		kg := 1.1 / (1 + 0.15*math.Sqrt(1-0.85*0.85))
		zk := complex(kg, 0) * complex(0.07*15, 15) * complex(11*11/20.0/100, 0) // R_Gf = 0.07·X"d below 100 MVA
		ik := 1.1 * 11e3 / math.Sqrt(3) / cmplx.Abs(zk)
		mu := DecayMu(ik/(20e3/(math.Sqrt(3)*11)), tmin)
		want := ik - imag(zk)/cmplx.Abs(zk)*(1-mu)*ik
		if !near(d.IkA, ik, relTol) || !near(d.BreakingA, want, relTol) {
			t.Errorf("generator alone, t_min %g s: I\"k %g A, I_b %g A; want %g A, %g A", tmin, d.IkA, d.BreakingA, ik, want)
		}
	}
}
