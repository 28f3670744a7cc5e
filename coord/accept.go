package coord

import (
	"fmt"
	"strings"
)

// Acceptance is a reviewer's record that a failing or warning finding was
// looked at and accepted, from an [[accept]] entry of the study. It names
// the finding by its check and device and, optionally, the other device
// (or equipment) and the stage; empty optional fields match any.
type Acceptance struct {
	// Check is the check's slug ("grading", "load", …) or its name as the
	// reports print it ("grading margin").
	Check string
	// Device is the finding's device (of a pair, the downstream one).
	Device string
	// Other and Stage narrow the match when given.
	Other, Stage string
	// Reason, By and Date say why, who and when; all are required.
	Reason, By, Date string
	// Scenario, when given, limits the entry to the findings of that
	// scenario (AsDrawn for the study as drawn).
	Scenario string
	// Was is the verdict the finding had before it was accepted; Accept
	// sets it on the copy it attaches to each finding.
	Was Verdict
	// Line is the entry's line in the study file (0 when built in code),
	// and Index its position among the entries (from 1), for messages.
	Line, Index int
}

// Matches reports whether the entry names finding f (whatever its
// verdict). Checks are compared by slug or name, so a check added later
// needs nothing here.
func (a *Acceptance) Matches(f *Finding) bool {
	if !CheckNamed(f.Check, a.Check) || f.Device != a.Device {
		return false
	}
	if sc := f.Scenario; a.Scenario != "" && a.Scenario != sc && !(sc == "" && a.Scenario == AsDrawn) {
		return false
	}
	return (a.Other == "" || a.Other == f.Other) && (a.Stage == "" || a.Stage == f.Stage)
}

// CheckNamed reports whether name is the slug or the printed name of c.
func CheckNamed(c CheckKind, name string) bool {
	return name == c.Slug() || strings.EqualFold(name, c.String())
}

// What describes the finding an entry names, for messages.
func (a *Acceptance) What() string {
	s := fmt.Sprintf("check %q, device %q", a.Check, a.Device)
	if a.Other != "" {
		s += fmt.Sprintf(", other %q", a.Other)
	}
	if a.Stage != "" {
		s += fmt.Sprintf(", stage %q", a.Stage)
	}
	if a.Scenario != "" {
		s += fmt.Sprintf(", scenario %q", a.Scenario)
	}
	return s
}

// StaleAcceptance is an [[accept]] entry that covers no failing or warning
// finding: the finding it names does not exist, or it now passes. Such an
// entry must be removed or corrected, so that an acceptance never lingers
// unseen over a later, different problem.
type StaleAcceptance struct {
	Entry *Acceptance
	// Passing is true when the entry names findings that all pass.
	Passing bool
}

func (e *StaleAcceptance) Error() string {
	why := "matches no finding"
	if e.Passing {
		why = "matches only findings that pass"
	}
	return fmt.Sprintf("accept %d (%s): %s; remove the entry or correct it", e.Entry.Index, e.Entry.What(), why)
}

// Accept applies a study's acceptances to a check's result: every failing
// or warning finding that an entry names becomes Accepted, with a copy of
// the entry (its Was set to the former verdict) attached. It returns one
// *StaleAcceptance for every entry that covers nothing, in entry order;
// the result is changed even then.
func Accept(r *Result, entries []Acceptance) []error {
	a := NewAcceptances(entries)
	a.Apply(r)
	return a.Stale()
}

// Acceptances applies a study's [[accept]] entries to the results of its
// scenarios one at a time (as Accept does to one result) and remembers
// which entries covered a failing or warning finding in any of them, and
// which scenarios were applied.
type Acceptances struct {
	entries          []Acceptance
	matched, covered []bool
	checked          map[string]bool // scenarios applied, AsDrawn for a study without any
}

// NewAcceptances returns the entries, to apply.
func NewAcceptances(entries []Acceptance) *Acceptances {
	return &Acceptances{entries: entries, matched: make([]bool, len(entries)), covered: make([]bool, len(entries)), checked: map[string]bool{}}
}

// Apply marks every failing or warning finding of r that an entry names
// as Accepted.
func (a *Acceptances) Apply(r *Result) {
	for _, f := range r.Findings {
		if f.Scenario == "" {
			a.checked[AsDrawn] = true
		} else {
			a.checked[f.Scenario] = true
		}
	}
	for k := range a.entries {
		e := &a.entries[k]
		for i := range r.Findings {
			f := &r.Findings[i]
			if !e.Matches(f) {
				continue
			}
			a.matched[k] = true
			if f.Verdict == Pass {
				continue
			}
			a.covered[k] = true
			if f.Verdict == Accepted {
				continue // an earlier entry took it
			}
			c := *e
			c.Was = f.Verdict
			f.Verdict, f.Acceptance = Accepted, &c
		}
	}
}

// Stale returns one *StaleAcceptance for every entry that covered no
// failing or warning finding of any result applied, in entry order. An
// entry limited to a scenario that was not applied (check --scenarios
// left it out) is not judged.
func (a *Acceptances) Stale() []error {
	var stale []error
	for k := range a.entries {
		if sc := a.entries[k].Scenario; sc != "" && !a.checked[sc] {
			continue
		}
		if !a.covered[k] {
			stale = append(stale, &StaleAcceptance{Entry: &a.entries[k], Passing: a.matched[k]})
		}
	}
	return stale
}

// Accepted returns the number of accepted findings.
func (r *Result) Accepted() int {
	n := 0
	for _, f := range r.Findings {
		if f.Verdict == Accepted {
			n++
		}
	}
	return n
}
