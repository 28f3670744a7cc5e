package coord_test

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/faults"
)

// TestNoInstantaneousSettingWorks: in instantaneous-no-setting.toml L1 is
// X 0.1 Ω behind a 0.5 Ω grid, so R1's 50 stage must stay above
// 1.25 × 1.1·11000/(√3·0.6) = 14554 A (the maximum fault at B, IEC 60909-0;
// common practice 1.25), while the largest fault in its own zone, at its
// own terminals, is 1.1·11000/(√3·0.5) = 13972 A. No pickup can both stay
// out of R2's zone and operate in its own: the finding says so.
func TestNoInstantaneousSettingWorks(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/instantaneous-no-setting.toml"), coord.InstantaneousReach, "R1")
	need := 1.25 * 1.1 * 11000 / (math.Sqrt(3) * 0.6)
	own := 1.1 * 11000 / (math.Sqrt(3) * 0.5)
	if !near(f.Required, need, handTol) || f.Measured != 12000 {
		t.Errorf("got %g A ≥ %g A, want 12000 A ≥ %g A", f.Measured, f.Required, need)
	}
	for _, w := range []string{"no setting works", "at least 14554 A", "own zone is 13972 A (LLL max @ L1, A end)"} {
		if !strings.Contains(f.Note, w) {
			t.Errorf("note %q lacks %q", f.Note, w)
		}
	}
	if math.Abs(need-14554) > 0.5 || math.Abs(own-13972) > 0.5 {
		t.Errorf("hand values %g A, %g A", need, own)
	}
}

// TestGroundInstantaneousMeasuresResidual: a 50N stage is judged on the
// residual current of earth faults, never on a three-phase fault's zero.
// In ground-instantaneous.toml the grid's zero-sequence impedance is 1 Ω
// and the largest residual current at B is the bolted line-to-earth fault
// 3·E/|Z1 + Z2 + Z0| with E = 1.1·11000/√3, Z1 = Z2 = j2.0 Ω and
// Z0 = 1 + j4.5 Ω (Grainger & Stevenson ch. 12): 2449 A, more than the
// double-line-to-earth fault's 3·|E·Z2/(Z1·Z2 + (Z1 + Z2)·Z0)| = 1875 A.
// R1's 50N at 4000 A is above 1.25 × 2449 A = 3061 A. R3's 50N sits on
// the delta side of a Dyn11 unit: no 400 V earth fault drives residual
// current through it, so there is nothing it could overreach into.
func TestGroundInstantaneousMeasuresResidual(t *testing.T) {
	r := checkFile(t, "../testdata/checks/ground-instantaneous.toml")
	if _, warn, fail := r.Counts(); warn != 0 || fail != 0 {
		t.Errorf("got %d warnings and %d failures, want none", warn, fail)
	}
	e := complex(1.1*11000/math.Sqrt(3), 0)
	z1, z0 := complex(0, 2.0), complex(1, 4.5)
	lg := 3 * cmplx.Abs(e/(2*z1+z0))
	llg := 3 * cmplx.Abs(e*z1/(z1*z1+2*z1*z0))
	f := findingOf(t, r, coord.InstantaneousReach, "R1", "", "50N")
	if !near(f.Required, 1.25*lg, handTol) || f.Fault.Kind != faults.LG || f.Fault.DeviceQty != coord.Residual {
		t.Errorf("R1 50N: %s %g A required, want LG %g A", f.Fault.Kind, f.Required, 1.25*lg)
	}
	if math.Abs(lg-2449) > 0.5 || math.Abs(llg-1875) > 0.5 {
		t.Errorf("hand values LG %g A, LLG 3I0 %g A", lg, llg)
	}
	g := findingOf(t, r, coord.InstantaneousReach, "R3", "", "50N")
	if g.Verdict != coord.Pass || g.Fault != nil || g.Valid || !strings.Contains(g.Note, "cannot overreach") {
		t.Errorf("R3 50N: %s %+v %q, want PASS without a figure", g.Verdict, g.Fault, g.Note)
	}
	// Set above the largest earth fault of its own zone, R1's 50N can
	// never operate: the bolted LG fault at its terminals,
	// 3·E/|j1.0 + 1| = 14819 A.
	_, r2 := variantOf(t, "ground-instantaneous.toml", "pickup_a = 4000", "pickup_a = 20000")
	h := findingOf(t, r2, coord.InstantaneousReach, "R1", "", "50N")
	own := 3 * cmplx.Abs(e/complex(1, 1.0))
	if h.Verdict != coord.Warn || !strings.Contains(h.Note, "operates for no fault of its own zone") || math.Abs(own-14819) > 0.5 ||
		!strings.Contains(h.Note, "14819 A (LG max @ L1, A end)") {
		t.Errorf("R1 50N at 20000 A: %s %q; want WARN naming %g A", h.Verdict, h.Note, own)
	}
}
