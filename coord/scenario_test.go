package coord_test

import (
	"math"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/faults"
)

// The scenario tests check four small invented studies under
// testdata/scenarios (hand-*.toml), each with one scenario, against
// figures worked in closed form by testdata/scenarios/handcheck.py (its
// docstring names the sources: IEC 60909-0 for the fault currents and
// the corrections K_T and K_G, the current divider, the delta–star
// distribution of IEEE Std 242 / C37.91, IEC 60255-151 for the times).
// scenarioFigures (scenariofigures_test.go, written by the script's --go
// mode) embeds them; TestScenarioHandcheckScript runs the script where
// Python with numpy is available and asks that the two agree. The
// engine and the script solve the same equations by different routes
// (a sparse factorisation of the whole network against a closed form of
// its few paths), so they agree to rounding: handRel, handAbs.

const scenarioScript = "../testdata/scenarios/handcheck.py"

// scenarioHand returns an embedded figure of handcheck.py.
func scenarioHand(t *testing.T, key string) float64 {
	t.Helper()
	v, ok := scenarioFigures[key]
	if !ok {
		t.Fatalf("handcheck.py gives no figure %q", key)
	}
	return v
}

// TestScenarioHandcheckScript runs testdata/scenarios/handcheck.py and
// checks that it gives exactly the figures scenariofigures_test.go embeds.
func TestScenarioHandcheckScript(t *testing.T) {
	crossRun(t, scenarioScript, scenarioFigures, "scenariofigures_test.go")
}

// checkedScenarios loads a study and checks it as drawn and in every
// scenario, returning each scenario's result by name.
func checkedScenarios(t *testing.T, path string) map[string]*coord.Result {
	t.Helper()
	s, err := study.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]*coord.Result{}
	err = coord.CheckScenarios(s, eng, topo, nil, func(c coord.Checked) error {
		out[c.Scenario] = c.Result
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// gradingOf returns the grading finding of a pair, or nil.
func gradingOf(r *coord.Result, downstream, upstream string) *coord.Finding {
	for i, f := range r.Findings {
		if f.Check == coord.Grading && f.Device == downstream && f.Other == upstream {
			return &r.Findings[i]
		}
	}
	return nil
}

// handPair is what a grading finding must show: its worst fault and the
// handcheck.py keys of its figures.
type handPair struct {
	scenario, downstream, upstream string
	kind                           faults.Kind
	place                          string
	// Keys of the downstream and upstream currents and times and of the
	// margin.
	downA, upA, downS, upS, margin string
}

// checkHandPair asks that the pair's grading finding in its scenario was
// found at the stated solved fault (not a swept point) of the maximum
// case, with every figure as handcheck.py has it, and the verdict that
// margin gives against 0.3 s.
func checkHandPair(t *testing.T, results map[string]*coord.Result, p handPair) {
	t.Helper()
	r, ok := results[p.scenario]
	if !ok {
		t.Fatalf("no scenario %q checked", p.scenario)
	}
	f := gradingOf(r, p.downstream, p.upstream)
	if f == nil {
		t.Fatalf("%s: no grading finding for %s under %s", p.scenario, p.downstream, p.upstream)
	}
	if f.Scenario != p.scenario {
		t.Errorf("%s: the finding names scenario %q", p.scenario, f.Scenario)
	}
	ft := f.Fault
	if ft == nil || ft.Kind != p.kind || ft.Case != faults.Max || ft.Place != p.place || ft.Interpolated {
		t.Fatalf("%s: %s under %s: worst fault %+v, want %s max @ %s, a solved fault", p.scenario, p.downstream, p.upstream, ft, p.kind, p.place)
	}
	for _, c := range []struct {
		what string
		got  float64
		key  string
	}{
		{p.downstream + " current (A)", ft.DeviceA, p.downA},
		{p.upstream + " current (A)", ft.OtherA, p.upA},
		{p.downstream + " time (s)", ft.DeviceS, p.downS},
		{p.upstream + " time (s)", ft.OtherS, p.upS},
		{"margin (s)", f.Measured, p.margin},
	} {
		if want := scenarioHand(t, c.key); !agrees(c.got, want) {
			t.Errorf("%s: %s under %s: %s %.9g, handcheck.py %.9g", p.scenario, p.downstream, p.upstream, c.what, c.got, want)
		}
	}
	wantVerdict := coord.Pass
	if scenarioHand(t, p.margin) < 0.3 {
		wantVerdict = coord.Fail
	}
	if f.Verdict != wantVerdict {
		t.Errorf("%s: %s under %s: %v, want %v (margin %.3f s against 0.3 s)", p.scenario, p.downstream, p.upstream, f.Verdict, wantVerdict, f.Measured)
	}
}

// TestHandParallelUnitOut: Harrow Fen's two identical 10 MVA units in
// parallel, TB taken out. For a line-to-line fault at the feeder's
// sending end (the worst fault of the pair: the delta–star unit puts
// 2/√3 of the referred LV current in one HV phase, while the feeder sees
// √3/2 of the three-phase level) each unit carries half of the fault
// current by symmetry, so TA-HV sees ½ · (11/33) · (2/√3) = 0.19245 of
// F1's current; with TB out TA carries all of it, 0.38490 of F1's
// current: the share doubles. The fault level falls (IEC 60909-0
// I"k2 = c·Un/|Z1 + Z2| with Z1 = Z_Q + Z_TK/2, then Z_Q + Z_TK), and the
// margin of TA-HV over F1 with it: 0.324 s as drawn, 0.236 s with TB out,
// a failure against 0.3 s.
func TestHandParallelUnitOut(t *testing.T) {
	res := checkedScenarios(t, "../testdata/scenarios/hand-parallel.toml")
	place := "F1-CABLE, HF-11 end"
	for _, sc := range []struct{ name, key string }{{coord.AsDrawn, "drawn"}, {"TB out", "out"}} {
		k := "parallel." + sc.key + "."
		checkHandPair(t, res, handPair{sc.name, "F1", "TA-HV", faults.LL, place,
			k + "F1_A", k + "TA-HV_A", k + "F1_s", k + "TA-HV_s", k + "margin_s"})
	}
	drawn, out := scenarioHand(t, "parallel.drawn.share"), scenarioHand(t, "parallel.out.share")
	if math.Abs(out/drawn-2) > 1e-12 {
		t.Errorf("handcheck.py: TA's share of F1's current goes from %.6f to %.6f, want double", drawn, out)
	}
	if math.Abs(drawn-1/(3*math.Sqrt(3))) > 1e-12 {
		t.Errorf("handcheck.py: share as drawn %.9f, want ½·(1/3)·(2/√3) = %.9f", drawn, 1/(3*math.Sqrt(3)))
	}
	if f := gradingOf(res["TB out"], "F1", "TB-HV"); f != nil {
		t.Errorf("TB out: TB-HV, out of service with its transformer, still has a finding: %+v", f)
	}
}

// TestHandBusSectionOpen: Marlow Strand's 11 kV board with its bus
// section closed is fed by TA (10 MVA, 10 %) and TB (15 MVA, 12 %) in
// parallel, which share a fault on section A by the current divider
// Z_TB/(Z_TA + Z_TB) and Z_TA/(Z_TA + Z_TB) (K_T-corrected impedances,
// IEC 60909-0); the bus section open, TA alone feeds section A, its
// current rises while the fault level falls, and TA-HV's margin over F1
// falls from 0.329 s to 0.231 s (IEC 60255-151 SI times). TB-HV no
// longer backs up F1.
func TestHandBusSectionOpen(t *testing.T) {
	res := checkedScenarios(t, "../testdata/scenarios/hand-section.toml")
	k := "section.drawn."
	for _, up := range []string{"TA-HV", "TB-HV"} {
		checkHandPair(t, res, handPair{coord.AsDrawn, "F1", up, faults.LL, "F1-CABLE, MS-11A+MS-11B end",
			k + "F1_A", k + up + "_A", k + "F1_s", k + up + "_s", k + "margin_" + up + "_s"})
	}
	k = "section.open."
	checkHandPair(t, res, handPair{"section open", "F1", "TA-HV", faults.LL, "F1-CABLE, MS-11A end",
		k + "F1_A", k + "TA-HV_A", k + "F1_s", k + "TA-HV_s", k + "margin_TA-HV_s"})
	if f := gradingOf(res["section open"], "F1", "TB-HV"); f != nil {
		t.Errorf("section open: TB-HV, which no longer feeds section A, is still graded over F1: %+v", f)
	}
}

// TestHandGeneratorOff: Coldharbour's generator half-way along the
// feeder. For a three-phase fault at the generator's bus, the grid
// (through L1) and the generator are two paths from the fault to the
// equivalent source c·Un/√3 (IEC 60909-0): each feeds E/Z of its own
// path, so R1's current is the same with the generator on or off
// (2491 A), while R2 carries both (3911 A as drawn, with the generator's
// K_G-corrected impedance), then R1's current alone: R1's margin over R2
// falls from 0.440 s to 0.405 s (IEC 60255-151 SI times).
func TestHandGeneratorOff(t *testing.T) {
	res := checkedScenarios(t, "../testdata/scenarios/hand-generator.toml")
	place := "L2, CH-2 end"
	for _, sc := range []struct{ name, key string }{{coord.AsDrawn, "drawn"}, {"generator off", "off"}} {
		k := "generator." + sc.key + "."
		checkHandPair(t, res, handPair{sc.name, "R2", "R1", faults.LLL, place,
			k + "R2_A", k + "R1_A", k + "R2_s", k + "R1_s", k + "margin_s"})
	}
}

// TestHandTieClosed: Brackley Vale's normally open tie closed makes the
// two feeders a ring. For a three-phase fault at the spur's sending end
// (BV-N, tied to BV-S) the board feeds it through L1 and L2 in parallel:
// the fault level rises from E/|Z_Q + Z_L1| to E/|Z_Q + Z_L1∥Z_L2|
// (IEC 60909-0) and L1 and L2 share it by the current divider. R1's
// current falls while R3's rises, so R1's margin over R3 rises from
// −0.037 s (a failure as drawn) to +0.018 s, and R2 becomes R3's backup
// too, with a margin of 0.402 s, in the ring only.
func TestHandTieClosed(t *testing.T) {
	res := checkedScenarios(t, "../testdata/scenarios/hand-tie.toml")
	k := "tie.drawn."
	checkHandPair(t, res, handPair{coord.AsDrawn, "R3", "R1", faults.LLL, "L3, BV-N end",
		k + "R3_A", k + "R1_A", k + "R3_s", k + "R1_s", k + "margin_R1_s"})
	k = "tie.closed."
	for _, up := range []string{"R1", "R2"} {
		checkHandPair(t, res, handPair{"tie closed", "R3", up, faults.LLL, "L3, BV-N+BV-S end",
			k + "R3_A", k + up + "_A", k + "R3_s", k + up + "_s", k + "margin_" + up + "_s"})
	}
	if f := gradingOf(res[coord.AsDrawn], "R3", "R2"); f != nil {
		t.Errorf("as drawn: R2, on the other feeder, is graded over R3: %+v", f)
	}
}
