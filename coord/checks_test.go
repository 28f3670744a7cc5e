package coord_test

import (
	"math"
	"os"
	"slices"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/faults"
)

// The studies under testdata/checks share one radial 11 kV network with
// purely reactive impedances, so every fault current follows by hand from
// the IEC 60909-0 forms I"k3 = c·Un/(√3·X) and I"k2 = c·Un/(2X) (Z2 = Z1):
//
//	grid X = 0.5 Ω (max) / 1.0 Ω (min), L1 A–B X = 1.5 Ω, L2 B–C X = 2.0 Ω
//	c = 1.10 (max), 1.00 (min) above 1 kV (IEC 60909-0 Table 1)
//	bus B, max LLL: 1.1·11000/(√3·2.0) = 3492.97 A
//	bus C, min LL:  1.0·11000/(2·4.5)  = 1222.22 A
const (
	iB3max = 1.1 * 11000 / (1.7320508075688772 * 2.0)
	iC2min = 11000.0 / (2 * 4.5)
)

// handTol is the agreement asked of a figure worked by hand: the hand
// values above are exact, the engine's only differences are rounding.
const handTol = 1e-6

// tSI is the IEC 60255-151 standard-inverse time, TMS·0.14/(M^0.02 − 1).
func tSI(currentA, pickupA, tms float64) float64 {
	return tms * 0.14 / (math.Pow(currentA/pickupA, 0.02) - 1)
}

func checkFile(t *testing.T, path string) *coord.Result {
	t.Helper()
	s, err := study.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	return checkStudy(t, s)
}

// checkStudy runs every check on a loaded study.
func checkStudy(t *testing.T, s *coord.Study) *coord.Result {
	t.Helper()
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	r, err := coord.Check(s, eng, topo)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// onlyFailure returns the single failing finding of a result and checks
// that it is of the expected check and device; nothing else may fail or
// warn, but for the consequences a test names in also (a study whose one
// mistake is a slow device also clears its faults late), and for the
// fault-by-fault view of a grading failure: the discrimination check then
// finds the upstream device operating for the downstream device's fault,
// and must name the same two devices at a margin no better than the
// grading check's.
func onlyFailure(t *testing.T, r *coord.Result, check coord.CheckKind, device string, also ...coord.CheckKind) coord.Finding {
	t.Helper()
	var fails, others []coord.Finding
	for _, f := range r.Findings {
		switch {
		case f.Verdict == coord.Fail && f.Check == check && f.Device == device:
			fails = append(fails, f)
		case f.Verdict == coord.Fail:
			others = append(others, f)
		case f.Verdict == coord.Warn && !slices.Contains(also, f.Check):
			t.Errorf("unexpected warning: %s %s: %s", f.Check, f.Device, f.Note)
		}
	}
	if len(fails) != 1 {
		t.Fatalf("want exactly one failure, %s of %s; got %+v", check, device, append(fails, others...))
	}
	f := fails[0]
	for _, o := range others {
		switch {
		case check == coord.Grading && o.Check == coord.Discrimination && o.Device == f.Other && o.Other == f.Device:
			// The two checks sweep between solved faults in steps of their
			// own; allow for that resolution (3 % of the margin).
			if o.Measured > f.Measured+math.Max(1e-3, 0.03*math.Abs(f.Measured)) {
				t.Errorf("discrimination finds %s over %s at %g s, better than the grading margin %g s", o.Device, o.Other, o.Measured, f.Measured)
			}
		case slices.Contains(also, o.Check):
		default:
			t.Fatalf("want exactly one failure, %s of %s; also got %+v", check, device, o)
		}
	}
	return f
}

func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol*math.Abs(want) }

func TestPassingStudyPasses(t *testing.T) {
	r := checkFile(t, "../testdata/checks/pass.toml")
	if pass, warn, fail := r.Counts(); warn != 0 || fail != 0 || pass == 0 {
		t.Errorf("got %d pass, %d warn, %d fail; want all pass", pass, warn, fail)
	}
	if len(r.Pairs) != 1 || r.Pairs[0] != (coord.Pair{Upstream: 0, Downstream: 1}) {
		t.Errorf("pairs %+v, want R1 backing up R2", r.Pairs)
	}
}

// TestGradingSeriesStandardInverse: two IEC standard-inverse relays in
// series see the same current for a fault just beyond R2 (radial), so the
// margin there is the difference of the two IEC 60255-151 formula times:
// R1 200 A TMS 0.15 and R2 150 A TMS 0.1 at 3492.97 A give
// 0.15·0.14/(17.465^0.02 − 1) − 0.1·0.14/(23.286^0.02 − 1)
// = 0.35670 − 0.21543 = 0.14127 s, below the 0.3 s margin
// (Blackburn & Domin §12.3.4: 0.3 s frequent). It is the smallest margin
// over the zone because both curves flatten towards high currents.
func TestGradingSeriesStandardInverse(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/grading.toml"), coord.Grading, "R2")
	want := tSI(iB3max, 200, 0.15) - tSI(iB3max, 150, 0.1)
	if !near(f.Measured, want, handTol) || f.Required != 0.3 {
		t.Errorf("margin %g s (required %g s), want %g s ≥ 0.3 s", f.Measured, f.Required, want)
	}
	if math.Abs(want-0.14127) > 5e-5 {
		t.Errorf("hand value %g s, want 0.14127 s", want)
	}
	if f.Fault == nil || f.Fault.Kind != faults.LLL || f.Fault.Case != faults.Max || !near(f.Fault.DeviceA, iB3max, handTol) {
		t.Errorf("worst fault %+v, want LLL max at 3492.97 A", f.Fault)
	}
}

// TestGradingSweepFindsCrossingBetweenSolvedFaults: R2's definite-time
// stage (3000 A, 0.05 s) switches on between the solved fault levels of
// its zone, so the two curves come closest just below 3000 A, where no
// fault is solved. At every solved fault the margin is at least 1.759 s
// (the largest LLL current below 3000 A, 2328.6 A at mid-L2:
// 0.9·0.14/(11.643^0.02−1) − 0.3·0.14/(15.524^0.02−1) = 2.504 − 0.745 s);
// just below 3000 A it is 0.9·0.14/(15^0.02−1) − 0.3·0.14/(20^0.02−1) =
// 2.264 − 0.680 = 1.584 s (IEC 60255-151 formula). With margin_s 1.7 s only
// the sweep can catch it.
func TestGradingSweepFindsCrossingBetweenSolvedFaults(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/sweep.toml"), coord.Grading, "R2")
	limit := tSI(3000, 200, 0.9) - tSI(3000, 150, 0.3)
	if f.Fault == nil || !f.Fault.Interpolated {
		t.Fatalf("worst point %+v, want one of the sweep", f.Fault)
	}
	// The sweep samples every knee of both devices just below and just
	// above it (1e-7 of the current away), so it lands on the limit.
	if !near(f.Measured, limit, 1e-5) {
		t.Errorf("worst margin %g s, want the limit %g s", f.Measured, limit)
	}
	if f.Fault.DeviceA >= 3000 {
		t.Errorf("worst point at %g A, want just below the 3000 A definite-time pickup", f.Fault.DeviceA)
	}
}

// TestPrimarySensitivity: R2's zone ends at C, where the minimum-case LL
// fault is I"k2 = 11000/(2·4.5) = 1222.2 A (IEC 60909-0), below
// 1.5 × 900 A = 1350 A (sensitivity factor: common practice 1.5).
func TestPrimarySensitivity(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/primary-sensitivity.toml"), coord.PrimarySensitivity, "R2")
	if !near(f.Measured, iC2min, handTol) || !near(f.Required, 1350, handTol) {
		t.Errorf("got %g A ≥ %g A, want %g A ≥ 1350 A", f.Measured, f.Required, iC2min)
	}
	if f.Fault.Kind != faults.LL || f.Fault.Case != faults.Min {
		t.Errorf("fault %+v, want LL in the minimum case", f.Fault)
	}
}

// TestBackupSensitivity: R1 backs up R2 to the end of R2's zone (C), where
// R1 sees the same 1222.2 A LL minimum fault (radial), below
// 1.2 × 1100 A = 1320 A (common practice 1.2); at R1's own far end (B,
// I"k2 = 11000/(2·2.5) = 2200 A) it is sensitive enough (≥ 1650 A).
func TestBackupSensitivity(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/backup-sensitivity.toml"), coord.BackupSensitivity, "R2")
	if f.Other != "R1" || !near(f.Measured, iC2min, handTol) || !near(f.Required, 1320, handTol) {
		t.Errorf("got %s: %g A ≥ %g A, want R1: %g A ≥ 1320 A", f.Other, f.Measured, f.Required, iC2min)
	}
}

// TestLoadMargin: 130 A of load beyond R2 needs a pickup of at least
// 1.25 × 130 = 162.5 A (common practice 1.25–1.5); R2 is set to 150 A.
func TestLoadMargin(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/load.toml"), coord.LoadMargin, "R2")
	if f.Measured != 150 || !near(f.Required, 162.5, handTol) {
		t.Errorf("got %g A ≥ %g A, want 150 A ≥ 162.5 A", f.Measured, f.Required)
	}
}

// TestInstantaneousReach: R1's 4000 A instantaneous stage must not reach
// R2's location: the maximum through-fault there is 3492.97 A, and
// 1.25 × 3492.97 = 4366.2 A > 4000 A (common practice 1.25–1.3).
func TestInstantaneousReach(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/instantaneous-reach.toml"), coord.InstantaneousReach, "R1")
	if f.Measured != 4000 || !near(f.Required, 1.25*iB3max, handTol) {
		t.Errorf("got %g A ≥ %g A, want 4000 A ≥ %g A", f.Measured, f.Required, 1.25*iB3max)
	}
}

// TestInrush: 1 MVA at 11 kV is 1000/(√3·11) = 52.486 A full load; 12 ×
// that is 629.84 A (common practice: 12 × for 0.1 s), where R's 60 A
// TMS 0.01 standard-inverse stage operates in
// 0.01·0.14/(10.497^0.02 − 1) = 0.02907 s (IEC 60255-151), within 0.1 s.
func TestInrush(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/inrush.toml"), coord.Inrush, "R")
	ia := 12 * 1000 / (math.Sqrt(3) * 11)
	want := tSI(ia, 60, 0.01)
	if !near(f.Measured, want, handTol) || f.Required != 0.1 || math.Abs(want-0.02907) > 5e-5 {
		t.Errorf("got %g s ≥ %g s, want %g s (≈ 0.02907 s) ≥ 0.1 s", f.Measured, f.Required, want)
	}
}

// TestCableDamage: L2 is a 16 mm² copper PVC cable, k = 115 (IEC 60364-5-54
// Table A.54), so it withstands (115·16)² = 3.3856e6 A²s: 0.27750 s at the
// 3492.97 A close-in fault. R2 clears it in its standard-inverse time
// 0.1·0.14/(23.286^0.02 − 1) = 0.21543 s plus its 0.1 s breaker = 0.31543 s.
func TestCableDamage(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/damage.toml"), coord.Damage, "R2")
	withstand := 115 * 16 * 115 * 16 / (iB3max * iB3max)
	clearing := tSI(iB3max, 150, 0.1) + 0.1
	if f.Other != "L2" || !near(f.Measured, clearing, handTol) || !near(f.Required, withstand, handTol) {
		t.Errorf("got %s: %g s ≤ %g s, want L2: %g s ≤ %g s", f.Other, f.Measured, f.Required, clearing, withstand)
	}
}

// TestSettingsAudit: R2's TMS 0.1 is not on the declared steps of 0.02
// from 0.05 (0.05, 0.07, 0.09, 0.11, …); its pickup 150 A is on the steps
// of 25 A from 50 A.
func TestSettingsAudit(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/settings.toml"), coord.SettingsAudit, "R2")
	if f.Stage != "51" || f.Note != "multiplier 0.1 not on a step of 0.02 from 0.05" {
		t.Errorf("got stage %q, note %q", f.Stage, f.Note)
	}
}

// parseVariant checks testdata/checks/pass.toml with some text replaced.
func parseVariant(t *testing.T, replace ...string) *coord.Result {
	t.Helper()
	src, err := os.ReadFile("../testdata/checks/pass.toml")
	if err != nil {
		t.Fatal(err)
	}
	text := string(src)
	for i := 0; i+1 < len(replace); i += 2 {
		if !strings.Contains(text, replace[i]) {
			t.Fatalf("pass.toml has no %q", replace[i])
		}
		text = strings.Replace(text, replace[i], replace[i+1], 1)
	}
	s, err := study.Parse("variant.toml", []byte(text), nil)
	if err != nil {
		t.Fatal(err)
	}
	return checkStudy(t, s)
}

func grading(t *testing.T, r *coord.Result) coord.Finding {
	t.Helper()
	for _, f := range r.Findings {
		if f.Check == coord.Grading {
			return f
		}
	}
	t.Fatal("no grading finding")
	return coord.Finding{}
}

// TestComponentsMargin: with margin components the required interval is
// the Network Protection & Automation Guide ch. 9 form (from memory)
// (2·E_R + E_CT)/100·t_D + t_CB + t_o + t_s. R2 declares a 5 % class and a
// 0.06 s breaker, the criteria 0.05 s overtravel and 0.1 s safety; at the
// worst fault t_D = 0.1·0.14/(23.286^0.02 − 1) = 0.21543 s (IEC 60255-151),
// so the requirement is 0.10·0.21543 + 0.06 + 0.05 + 0.1 = 0.23154 s,
// against a margin of 0.3·0.14/(17.465^0.02 − 1) − 0.21543 = 0.49798 s.
func TestComponentsMargin(t *testing.T) {
	r := parseVariant(t, "margin_s = 0.3", "overtravel_s = 0.05\nsafety_s = 0.1",
		"breaker_s = 0.06\n", "breaker_s = 0.06\naccuracy_class_pct = 5\naccuracy_min_s = 0.04\n")
	f := grading(t, r)
	tD := tSI(iB3max, 150, 0.1)
	want := 0.10*tD + 0.06 + 0.05 + 0.1
	if !near(f.Required, want, handTol) || !near(f.Measured, tSI(iB3max, 200, 0.3)-tD, handTol) {
		t.Errorf("got %g s ≥ %g s, want %g s ≥ %g s", f.Measured, f.Required, tSI(iB3max, 200, 0.3)-tD, want)
	}
}

// TestWorstCaseTimes: grading on the tolerance band takes R1's earliest and
// R2's latest time. Both declare 5 % or 0.04 s, whichever is greater
// (IEC 60255-151 cl. 5.2; above 10× setting the limiting error is the class
// itself): at the worst fault R1's 0.71343 s less max(0.0357, 0.04) s, and
// R2's 0.21543 s plus max(0.0108, 0.04) s, a margin of 0.41798 s.
func TestWorstCaseTimes(t *testing.T) {
	acc := "accuracy_class_pct = 5\naccuracy_min_s = 0.04\n"
	r := parseVariant(t, "margin_s = 0.3", "margin_s = 0.3\nworst_case_times = true",
		"ct_secondary_a = 1\n  [[relay.stage]]", "ct_secondary_a = 1\n"+acc+"  [[relay.stage]]",
		"breaker_s = 0.06\n", "breaker_s = 0.06\n"+acc)
	f := grading(t, r)
	want := (tSI(iB3max, 200, 0.3) - 0.04) - (tSI(iB3max, 150, 0.1) + 0.04)
	if !near(f.Measured, want, handTol) {
		t.Errorf("worst-case margin %g s, want %g s", f.Measured, want)
	}
}
