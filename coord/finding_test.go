package coord

import (
	"math"
	"strings"
	"testing"

	"tripgrade/faults"
)

// TestNonFiniteIsNeverAVerdict: a figure that is not a finite number
// compares false with everything, so a margin check written as "fail when
// margin < 0" would pass it. atLeast, atMost and settle make it WARN
// "not checked" instead, naming the figure.
func TestNonFiniteIsNeverAVerdict(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		name string
		f    Finding
	}{
		{"NaN measured", atLeast(PrimarySensitivity, nan, 90, "A")},
		{"infinite measured", atLeast(Grading, inf, 0.3, "s")},
		{"infinite required", atMost(Damage, 0.5, inf, "s")},
		{"NaN required", atMost(SettingsAudit, 3, nan, "")},
	}
	for _, c := range cases {
		if c.f.Verdict != Warn {
			t.Errorf("%s: verdict %v, want WARN", c.name, c.f.Verdict)
		}
		c.f.Note = "pickup 60 A × 1.5" // a check writes its note after building the finding
		settle(&c.f)
		if c.f.Verdict != Warn || !strings.HasPrefix(c.f.Note, "not checked: the ") || !strings.HasSuffix(c.f.Note, "pickup 60 A × 1.5") {
			t.Errorf("%s: after settle %v %q", c.name, c.f.Verdict, c.f.Note)
		}
	}
	// A check that forces its verdict after construction is overruled.
	f := atLeast(Grading, 0.5, 0.3, "s")
	f.Fault = &FaultRef{Kind: faults.LLL, DeviceA: nan, DeviceS: 0.1, OtherS: 0.6}
	f.Verdict = Pass
	settle(&f)
	if f.Verdict != Warn || !strings.Contains(f.Note, "device current is NaN") {
		t.Errorf("NaN current behind a PASS: %v %q", f.Verdict, f.Note)
	}
	// Finite figures keep their verdicts, a zero time included.
	for _, g := range []Finding{atLeast(Grading, 0.5, 0.3, "s"), atLeast(Grading, 0.1, 0.3, "s")} {
		g.Fault = &FaultRef{DeviceA: 100, DeviceS: 0, OtherS: 0.5}
		want := g.Verdict
		settle(&g)
		if g.Verdict != want || g.Note != "" {
			t.Errorf("finite finding changed: %v %q", g.Verdict, g.Note)
		}
	}
}
