package coord_test

import (
	"bytes"
	"math"
	"math/cmplx"
	"regexp"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/faults"
)

// backupDeltaLG is the minimum-case earth fault at the far end of the
// 400 V cable of backup-delta.toml: 3·E/(X1 + X2 + X0) with
// E = 0.95·400/√3 V (IEC 60909-0 c_min up to 1 kV), X1 = X2 =
// 1.0·(0.4/11)² + 0.0475·0.4²/0.5 + 0.03 Ω (grid, transformer, cable) and
// X0 = 0.0475·0.4²/0.5 + 0.09 Ω (the Dyn unit's star side and the cable;
// the delta winding keeps the grid out of the zero sequence).
func backupDeltaLG() float64 {
	xt := 0.0475 * 0.4 * 0.4 / 0.5
	x1 := 1.0*(0.4/11)*(0.4/11) + xt + 0.03
	x0 := xt + 0.09
	return 3 * 0.95 * 400 / math.Sqrt(3) / (2*x1 + x0)
}

// TestBackupAcrossDeltaIncludesEarthFaults: behind a Dyn unit a 400 V
// earth fault appears on the 11 kV side in two phases at 1/√3 of the
// ratio-referred current, and no residual current flows there (IEEE Std
// 242 ch. 15, IEEE C37.91): 3320 A · (0.4/11)/√3 = 69.7 A, below 1.2 × the
// HV fuse's lowest melting current 65 A = 78 A (common practice 1.2). The
// phase faults alone gave 171 A and passed. The finding names whose each
// current is: 69.7 A at the HV fuse (the figure), 3320 A at the 400 V fuse.
func TestBackupAcrossDeltaIncludesEarthFaults(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/backup-delta.toml"), coord.BackupSensitivity, "LV-FUSE",
		coord.Clearing) // the HV fuse's table ends below the transformer's own terminal faults: not checked there
	lg := backupDeltaLG()
	hv := lg * 0.4 / 11 / math.Sqrt(3)
	if f.Other != "HV-FUSE" || !near(f.Measured, hv, handTol) || !near(f.Required, 78, handTol) || f.Fault.Kind != faults.LG {
		t.Errorf("got %s: %s %g A ≥ %g A, want HV-FUSE: LG %g A ≥ 78 A", f.Other, f.Fault.Kind, f.Measured, f.Required, hv)
	}
	if !near(f.Fault.OtherA, hv, handTol) || f.Fault.OtherQty != coord.Phase || !near(f.Fault.DeviceA, lg, handTol) {
		t.Errorf("currents %g A at HV-FUSE, %g A at LV-FUSE; want %g A and %g A", f.Fault.OtherA, f.Fault.DeviceA, hv, lg)
	}
	if math.Abs(hv-69.7) > 0.05 {
		t.Errorf("hand value %g A, want 69.7 A", hv)
	}
}

// TestEarthFaultSensitivityOnLG: earth-sensitivity.toml's grid has a
// 47.7 Ω zero-sequence resistance and minimum-case earth faults carry
// 10 Ω. R2's ground stage is judged on the line-to-earth fault at C:
// 3·E/|Z1 + Z2 + Z0 + 3Rf| with E = 11000/√3, Z1 = Z2 = j4.5 Ω,
// Z0 = 47.7 + j10.5 Ω, 3Rf = 30 Ω (Grainger & Stevenson ch. 12): 237.8 A,
// ≥ 1.5 × 100 A. The double-line-to-earth fault's residual current,
// 3·|E·Z2/(Z1·Z2 + (Z1 + Z2)(Z0 + 3Rf))| = 121.0 A, failed it before. R1
// has no ground stage; its 300 A phase stage never sees the earth fault at
// its far end B, 3·E/|77.7 + j9.5| = 243.4 A: 0.811 × pickup, so no stage
// detects it and the coverage finding fails.
func TestEarthFaultSensitivityOnLG(t *testing.T) {
	r := checkFile(t, "../testdata/checks/earth-sensitivity.toml")
	f := onlyFailure(t, r, coord.PrimarySensitivity, "R1", coord.Clearing)
	e := complex(11000/math.Sqrt(3), 0)
	atB := 3 * cmplx.Abs(e/complex(47.7+30, 2*2.5+4.5))
	if f.Stage != "every kind" || f.Fault.Kind != faults.LG || !near(f.Measured, atB/300, handTol) || f.Required != 1 {
		t.Errorf("got %s %s %g × ≥ %g ×, want every kind LG %g × ≥ 1", f.Stage, f.Fault.Kind, f.Measured, f.Required, atB/300)
	}
	if !strings.Contains(f.Note, "detected by none of its stages") || !strings.Contains(f.Note, "no ground stage") {
		t.Errorf("note %q", f.Note)
	}
	g := findingOf(t, r, coord.PrimarySensitivity, "R2", "", "ground")
	z1, z0 := complex(0, 4.5), complex(47.7+30, 10.5)
	lg := 3 * cmplx.Abs(e/(2*z1+z0))
	llg := 3 * cmplx.Abs(e*z1/(z1*z1+2*z1*z0))
	if g.Verdict != coord.Pass || !near(g.Measured, lg, handTol) || g.Fault.Kind != faults.LG || g.Fault.DeviceQty != coord.Residual {
		t.Errorf("R2 ground: %s %s %g A, want PASS LG %g A", g.Verdict, g.Fault.Kind, g.Measured, lg)
	}
	if math.Abs(lg-237.8) > 0.05 || math.Abs(llg-121.0) > 0.05 || llg >= 150 {
		t.Errorf("hand values LG %g A, LLG 3I0 %g A", lg, llg)
	}
}

// tiny matches a number written with a negative exponent.
var tiny = regexp.MustCompile(`[0-9]e-[0-9]`)

// TestBaseMVADoesNotChangeFindings: the per-unit base is internal; a study
// at either end of the range a study accepts for base_mva (0.001 and
// 1e5 MVA) gives the same findings as at 100, and its JSON
// carries no rounding residue as a current (the engine cuts residue
// relative to each fault's own current, never relative to base_mva).
func TestBaseMVADoesNotChangeFindings(t *testing.T) {
	s, ref := variantOf(t, "backup-delta.toml")
	for _, base := range []string{"1e5", "0.001"} {
		_, r := variantOf(t, "backup-delta.toml", "[study]\n", "[study]\nbase_mva = "+base+"\n")
		if len(r.Findings) != len(ref.Findings) {
			t.Fatalf("base %s: %d findings, want %d", base, len(r.Findings), len(ref.Findings))
		}
		for i, f := range r.Findings {
			g := ref.Findings[i]
			if f.Verdict != g.Verdict || f.Device != g.Device || f.Stage != g.Stage || !near(f.Measured, g.Measured, 1e-9) {
				t.Errorf("base %s: %s %s %s %s %g, want %s %g", base, f.Check, f.Device, f.Stage, f.Verdict, f.Measured, g.Verdict, g.Measured)
			}
		}
		var b bytes.Buffer
		if err := report.NewFindings(s, r).WriteJSON(&b); err != nil {
			t.Fatal(err)
		}
		if tiny.MatchString(b.String()) {
			t.Errorf("base %s: JSON holds a tiny number", base)
		}
	}
}

// TestCoverageCountsDevicesAtOnePoint: a separate earth-fault relay on the
// same current transformers as R1 detects the 243.4 A earth fault at B
// (3·E/|77.7 + j9.5|, as above) at 243.4/40 = 6.08 × its pickup, so R1's
// every-kind finding passes with it; and R1 detects the phase faults the
// earth-fault relay cannot see (the smallest, LL at B in the minimum
// case, 11000/(2·2.5) = 2200 A, at 2200/300 = 7.33 × R1's pickup). For
// both the least detected kind is then that earth fault, at 6.08 ×.
func TestCoverageCountsDevicesAtOnePoint(t *testing.T) {
	extra := "[[relay]]\nname = \"R1N\"\nbranch = \"L1\"\nat = \"A\"\nct_primary_a = 400\nct_secondary_a = 1\n" +
		"  [[relay.stage]]\n  measures = \"ground\"\n  curve = \"iec-si\"\n  pickup_a = 40\n  tms = 0.3\n\n[[relay]]\nname = \"R2\""
	_, r := variantOf(t, "earth-sensitivity.toml", "[[relay]]\nname = \"R2\"", extra)
	e := complex(11000/math.Sqrt(3), 0)
	atB := 3 * cmplx.Abs(e/complex(47.7+30, 2*2.5+4.5))
	for _, c := range []struct {
		dev  string
		want float64
	}{{"R1", atB / 40}, {"R1N", atB / 40}} {
		f := findingOf(t, r, coord.PrimarySensitivity, c.dev, "", "every kind")
		if f.Verdict != coord.Pass || !near(f.Measured, c.want, handTol) || 2200.0/300 < c.want {
			t.Errorf("%s every kind: %s %g ×, want PASS %g × (%s)", c.dev, f.Verdict, f.Measured, c.want, f.Note)
		}
	}
}
