package coord

import (
	"errors"
	"strings"
	"testing"
)

func TestAccept(t *testing.T) {
	findings := func() *Result {
		return &Result{Findings: []Finding{
			{Check: Grading, Device: "D", Other: "U", Verdict: Fail},
			{Check: Grading, Device: "D", Other: "V", Verdict: Pass},
			{Check: LoadMargin, Device: "D", Stage: "phase", Verdict: Fail},
			{Check: SettingsAudit, Device: "D", Stage: "CT saturation", Verdict: Warn},
		}}
	}
	cases := []struct {
		name     string
		entry    Acceptance
		accepted []int // indices of findings that become Accepted
		stale    string
	}{
		{"by slug and other", Acceptance{Check: "grading", Device: "D", Other: "U"}, []int{0}, ""},
		{"by printed name, any other", Acceptance{Check: "grading margin", Device: "D"}, []int{0}, ""},
		{"a warning", Acceptance{Check: "settings", Device: "D", Stage: "CT saturation"}, []int{3}, ""},
		{"only a passing finding", Acceptance{Check: "grading", Device: "D", Other: "V"}, nil, "matches only findings that pass"},
		{"nothing", Acceptance{Check: "damage", Device: "D"}, nil, "matches no finding"},
		{"wrong stage", Acceptance{Check: "load", Device: "D", Stage: "ground"}, nil, "matches no finding"},
	}
	for _, c := range cases {
		r := findings()
		c.entry.Reason, c.entry.Index = "because", 1
		errs := Accept(r, []Acceptance{c.entry})
		for i, f := range r.Findings {
			want := false
			for _, k := range c.accepted {
				want = want || k == i
			}
			if got := f.Verdict == Accepted; got != want {
				t.Errorf("%s: finding %d accepted %v, want %v", c.name, i, got, want)
			}
			if f.Verdict == Accepted && (f.Acceptance == nil || f.Acceptance.Reason != "because" || f.Acceptance.Was == Accepted) {
				t.Errorf("%s: finding %d carries acceptance %+v", c.name, i, f.Acceptance)
			}
		}
		if got := r.Accepted(); got != len(c.accepted) {
			t.Errorf("%s: Accepted() = %d, want %d", c.name, got, len(c.accepted))
		}
		switch {
		case c.stale == "" && len(errs) > 0:
			t.Errorf("%s: unexpected %v", c.name, errs)
		case c.stale != "":
			var sa *StaleAcceptance
			if len(errs) != 1 || !errors.As(errs[0], &sa) || !strings.Contains(errs[0].Error(), c.stale) {
				t.Errorf("%s: got %v, want one stale acceptance %q", c.name, errs, c.stale)
			}
		}
	}
	// Accepted findings fail nothing and are not counted as FAIL or WARN.
	r := findings()
	Accept(r, []Acceptance{{Check: "grading", Device: "D"}, {Check: "load", Device: "D"}})
	if p, w, f := r.Counts(); r.Failed() || p != 1 || w != 1 || f != 0 {
		t.Errorf("after accepting both failures: counts %d %d %d, failed %v", p, w, f, r.Failed())
	}
}

// TestAcceptancesOfScenarios: an entry limited to a scenario accepts
// that scenario's findings only, and is judged stale only when its
// scenario was checked (check --scenarios may leave it out).
func TestAcceptancesOfScenarios(t *testing.T) {
	entry := Acceptance{Check: "grading", Device: "F1", Scenario: "T2 out", Reason: "r", By: "b", Date: "2026-01-01"}
	fail := func(scenario string) *Result {
		return &Result{Findings: []Finding{{Check: Grading, Device: "F1", Other: "INC", Verdict: Fail, Scenario: scenario}}}
	}
	a := NewAcceptances([]Acceptance{entry})
	drawn := fail(AsDrawn)
	a.Apply(drawn)
	if drawn.Findings[0].Verdict != Fail {
		t.Errorf("as drawn: %v, want FAIL (the entry is for T2 out)", drawn.Findings[0].Verdict)
	}
	if stale := a.Stale(); len(stale) != 0 {
		t.Errorf("T2 out not checked: stale %v, want none", stale)
	}
	out := fail("T2 out")
	a.Apply(out)
	if out.Findings[0].Verdict != Accepted || len(a.Stale()) != 0 {
		t.Errorf("T2 out: %v, stale %v; want ACCEPTED and none", out.Findings[0].Verdict, a.Stale())
	}
	b := NewAcceptances([]Acceptance{entry})
	b.Apply(&Result{Findings: []Finding{{Check: Grading, Device: "F2", Verdict: Fail, Scenario: "T2 out"}}})
	if len(b.Stale()) != 1 {
		t.Errorf("T2 out checked, no finding of F1: stale %v, want the entry", b.Stale())
	}
}
