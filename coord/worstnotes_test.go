package coord

import (
	"reflect"
	"testing"
)

// Notes that scenarios add group by their shape: the same words with
// other figures. Digits inside names ("L-1", "M33-2") are part of the
// words, so notes about different elements stay apart.
func TestWorstGroupsScenarioNotes(t *testing.T) {
	s := &Study{}
	res := func(scenario string, notes ...string) *Result {
		return &Result{Notes: notes, Findings: []Finding{{Scenario: scenario}}}
	}
	w := NewWorst()
	w.Add(s, res(AsDrawn, "8 faults are fed by G-1", "no device clears any fault of M33-1"))
	w.Add(s, res("L-1 out", "10 faults are fed by G-1", "no device clears any fault of M33-1"))
	w.Add(s, res("L-2 out", "12 faults are fed by G-1", "no device clears any fault of M33-2"))
	w.Add(s, res("L-3 out", "9 faults are fed by G-1"))
	w.Add(s, res("L-4 out", "8 faults are fed by G-1", "11.5 % of the sweep is out of range"))
	w.Add(s, res("L-5 out", "7 faults are fed by G-1"))
	got := w.Result().Notes
	want := []string{
		"8 faults are fed by G-1",
		"no device clears any fault of M33-1",
		"4 scenarios (L-1 out, L-2 out, L-3 out and 1 more): 10 faults are fed by G-1 (the figures are L-1 out's; the others differ)",
		"L-2 out: no device clears any fault of M33-2",
		"L-4 out: 11.5 % of the sweep is out of range",
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("notes:\n%q\nwant\n%q", got, want)
	}
	for in, want := range map[string]string{
		"231 faults (12 of them) at 3.5 kV": "# faults (# of them) at # kV",
		"M33-1, L-12 and T2":                "M33-1, L-12 and T2",
		"10% of R-7":                        "#% of R-7",
	} {
		if got := noteShape(in); got != want {
			t.Errorf("noteShape(%q) = %q, want %q", in, got, want)
		}
	}
}
