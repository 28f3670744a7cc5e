package coord

import "testing"

// A margin that is only binary rounding residue is zero: two
// definite-time delays 0.3 s apart against a 0.3 s requirement pass,
// whichever way the last bit falls; a microsecond short still fails.
func TestRoundingResidueIsNoMargin(t *testing.T) {
	for _, c := range []struct {
		measured, required float64
		want               Verdict
		zero               bool
	}{
		{0.57 - 0.27, 0.3, Pass, true}, // 0.30000000000000004 − 0.3
		{0.3, 0.57 - 0.27, Pass, true}, // the other way round: −5.6e-17
		{0.3 - 1e-6, 0.3, Fail, false}, // a microsecond short
		{1000 * (1 + 1e-12), 1000, Pass, true},
		{1000 - 1e-3, 1000, Fail, false},
	} {
		f := atLeast(Grading, c.measured, c.required, "s")
		if f.Verdict != c.want || (f.Margin == 0) != c.zero {
			t.Errorf("atLeast(%.17g, %.17g): %v margin %g, want %v (zero %v)", c.measured, c.required, f.Verdict, f.Margin, c.want, c.zero)
		}
		g := atMost(Grading, c.required, c.measured, "s")
		if g.Verdict != c.want || (g.Margin == 0) != c.zero {
			t.Errorf("atMost(%.17g, %.17g): %v margin %g, want %v", c.required, c.measured, g.Verdict, g.Margin, c.want)
		}
	}
}
