package coord_test

import (
	"math"
	"os"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/coord/study"
	"tripgrade/faults"
)

// variantOf checks a study under testdata/checks with some text replaced.
func variantOf(t *testing.T, name string, replace ...string) (*coord.Study, *coord.Result) {
	t.Helper()
	src, err := os.ReadFile("../testdata/checks/" + name)
	if err != nil {
		t.Fatal(err)
	}
	text := string(src)
	for i := 0; i+1 < len(replace); i += 2 {
		if !strings.Contains(text, replace[i]) {
			t.Fatalf("%s has no %q", name, replace[i])
		}
		text = strings.Replace(text, replace[i], replace[i+1], 1)
	}
	s, err := study.Parse(name, []byte(text), nil)
	if err != nil {
		t.Fatal(err)
	}
	return s, checkStudy(t, s)
}

// findingOf returns the first finding of a check on a device (and, when
// other is not empty, of that other device).
func findingOf(t *testing.T, r *coord.Result, check coord.CheckKind, device, other, stage string) coord.Finding {
	t.Helper()
	for _, f := range r.Findings {
		if f.Check == check && f.Device == device && (other == "" || f.Other == other) && (stage == "" || f.Stage == stage) {
			return f
		}
	}
	t.Fatalf("no %s finding for %s %s %s", check, device, other, stage)
	return coord.Finding{}
}

// TestVoltageFactorAndFaultReactance: the study sets c_max 1.0, c_min 0.95
// and a phase-fault reactance of 1 Ω. R2's far end C is then reached in
// the minimum case by an LL fault of √3·|E/(Z1 + Z2 + Zf)| with
// E = 0.95·11000/√3 V, Z1 = Z2 = j4.5 Ω (grid 1.0, L1 1.5, L2 2.0) and
// Zf = j1 Ω (Grainger & Stevenson ch. 12): 0.95·11000/10 = 1045 A, below
// 1.5 × 750 A = 1125 A (common practice 1.5). With the Table 1 factor and
// no reactance the same settings passed at 11000/9 = 1222 A. The case lines
// say which factors and impedances were used.
func TestVoltageFactorAndFaultReactance(t *testing.T) {
	r := checkFile(t, "../testdata/checks/voltage-factor.toml")
	f := onlyFailure(t, r, coord.PrimarySensitivity, "R2")
	want := 0.95 * 11000 / 10
	if !near(f.Measured, want, handTol) || !near(f.Required, 1125, handTol) || f.Fault.Kind != faults.LL {
		t.Errorf("got %s %g A ≥ %g A, want LL %g A ≥ 1125 A", f.Fault.Kind, f.Measured, f.Required, want)
	}
	s, err := study.Load("../testdata/checks/voltage-factor.toml")
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Join(report.CaseLines(s), "\n")
	for _, w := range []string{"c_max 1.00 at every voltage (set by the study", "c_min 0.95 at every voltage", "phase-fault impedance 0 + j1 Ω"} {
		if !strings.Contains(lines, w) {
			t.Errorf("case lines %q lack %q", lines, w)
		}
	}
	// The maximum case grades on nominal voltage: R1's largest current is
	// the close-in fault at A end of L1, 11000/(√3·0.5) = 12702 A with
	// c = 1.0 (IEC 60909-0 I"k3 = c·Un/(√3·X)).
	eng, _, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	sol, err := eng.Solve(eng.CaseFault(faults.OnBranch(0, 0), faults.LLL, faults.Max))
	if err != nil {
		t.Fatal(err)
	}
	if got, want := sol.FaultCurrents().PhaseMaxA(), 11000/(math.Sqrt(3)*0.5); !near(got, want, handTol) {
		t.Errorf("maximum-case close-in fault %g A, want %g A", got, want)
	}
}

// TestInstantaneousOperatingTime: R2 has only an instantaneous stage at
// 800 A, below every fault of its zone (the smallest, LL at C in the
// minimum case, is 11000/(2·4.5) = 1222 A), and R1 a definite-time stage
// of 0.3 s. The margin is 0.3 s less R2's operating time: 0.03 s by the
// criteria's default (common practice: one to two cycles), so 0.27 s <
// 0.3 s. Before instantaneous stages had an operating time the margin was
// exactly 0.3 s and passed. A relay's own instantaneous_time_s replaces the
// default, and an intentional delay_s adds to it.
func TestInstantaneousOperatingTime(t *testing.T) {
	f := onlyFailure(t, checkFile(t, "../testdata/checks/instantaneous-time.toml"), coord.Grading, "R2")
	if !near(f.Measured, 0.3-0.03, handTol) || f.Fault.DeviceS != 0.03 {
		t.Errorf("margin %g s (R2 at %g s), want 0.27 s (R2 at 0.03 s)", f.Measured, f.Fault.DeviceS)
	}
	cases := []struct {
		name    string
		replace []string
		want    float64
	}{
		{"relay's own time", []string{"breaker_s = 0.06\n", "breaker_s = 0.06\ninstantaneous_time_s = 0.015\n"}, 0.3 - 0.015},
		{"study default", []string{"margin_s = 0.3\n", "margin_s = 0.3\ninstantaneous_time_s = 0.04\n"}, 0.3 - 0.04},
		{"intentional delay", []string{"pickup_a = 800\n", "pickup_a = 800\n  delay_s = 0.02\n"}, 0.3 - 0.02 - 0.03},
	}
	for _, c := range cases {
		_, r := variantOf(t, "instantaneous-time.toml", c.replace...)
		g := findingOf(t, r, coord.Grading, "R2", "R1", "")
		if !near(g.Measured, c.want, handTol) {
			t.Errorf("%s: margin %g s, want %g s", c.name, g.Measured, c.want)
		}
	}
}
