package coord

import "testing"

// TestWorstKeepsTheWorstOfEachFinding: over three scenarios, each
// check, device, other device and stage keeps its worst finding: a
// failure before a warning, an accepted finding and a pass; of two with
// one verdict the smaller margin; of two whose margins agree to
// rounding, the first added. A fault-clearing finding is one per
// element, whichever devices clear it in each scenario.
func TestWorstKeepsTheWorstOfEachFinding(t *testing.T) {
	s := &Study{}
	f := func(scenario string, check CheckKind, device, other string, v Verdict, margin float64) Finding {
		return Finding{Check: check, Device: device, Other: other, Verdict: v, Valid: true, Margin: margin, Scenario: scenario}
	}
	w := NewWorst()
	w.Add(s, &Result{Findings: []Finding{
		f(AsDrawn, Grading, "F1", "INC", Pass, 0.2),
		f(AsDrawn, Grading, "F2", "INC", Pass, 0.5),
		f(AsDrawn, LoadMargin, "F1", "", Warn, 0),
		f(AsDrawn, Clearing, "BUS", "F1, F2", Pass, 1.5),
	}})
	changed := w.Add(s, &Result{Findings: []Finding{
		f("A out", Grading, "F1", "INC", Pass, 0.2+1e-12), // agrees to rounding: as drawn stays
		f("A out", Grading, "F2", "INC", Fail, -0.1),
		f("A out", LoadMargin, "F1", "", Pass, 3),
		f("A out", Clearing, "BUS", "F2", Pass, 1.2),
		f("A out", Grading, "F3", "INC", Pass, 0.4), // a pair this scenario alone has
	}})
	w.Add(s, &Result{Findings: []Finding{
		f("B out", Grading, "F2", "INC", Warn, 0),
		f("B out", Clearing, "BUS", "F1", Pass, 1.4),
	}})
	want := []struct {
		device, other, scenario string
		v                       Verdict
	}{
		{"F1", "INC", AsDrawn, Pass},
		{"F2", "INC", "A out", Fail},
		{"F1", "", AsDrawn, Warn},
		{"BUS", "F2", "A out", Pass},
		{"F3", "INC", "A out", Pass},
	}
	got := w.Findings()
	if len(got) != len(want) {
		t.Fatalf("%d findings, want %d: %+v", len(got), len(want), got)
	}
	for i, x := range want {
		g := got[i]
		if g.Device != x.device || g.Other != x.other || g.Scenario != x.scenario || g.Verdict != x.v {
			t.Errorf("finding %d: %s/%s in %q %v, want %s/%s in %q %v", i, g.Device, g.Other, g.Scenario, g.Verdict, x.device, x.other, x.scenario, x.v)
		}
	}
	// The second scenario made F2's grading, the bus's clearing and F3's
	// grading the worst so far.
	if len(changed) != 3 || changed[0] != 1 || changed[1] != 3 || changed[2] != 4 {
		t.Errorf("changed %v, want [1 3 4]", changed)
	}
}
