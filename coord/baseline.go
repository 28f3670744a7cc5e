package coord

import (
	"fmt"
	"math"
)

// Snapshot is a finding as a baseline keeps it: what identifies it, its
// verdict and its margin. Check is the check's slug, so snapshots read
// back from an earlier run's JSON compare with today's findings whatever
// checks either run knew.
type Snapshot struct {
	Check, Device, Other, Stage string
	Verdict                     string // "PASS", "WARN", "FAIL" or "ACCEPTED"
	Margin                      float64
	HasMargin                   bool // false when the finding has no figure
	Unit                        string
	// Scenario is the finding's scenario ("" for a study without any).
	Scenario string
}

// SnapshotOf takes the snapshot of a finding.
func SnapshotOf(f Finding) Snapshot {
	s := Snapshot{Check: f.Check.Slug(), Device: f.Device, Other: f.Other, Stage: f.Stage, Verdict: f.Verdict.String(), Unit: f.Unit, Scenario: f.Scenario}
	if f.Valid && !math.IsNaN(f.Margin) && !math.IsInf(f.Margin, 0) {
		s.Margin, s.HasMargin = f.Margin, true
	}
	return s
}

// Snapshots takes the snapshot of every finding of a result.
func Snapshots(r *Result) []Snapshot {
	out := make([]Snapshot, len(r.Findings))
	for i, f := range r.Findings {
		out[i] = SnapshotOf(f)
	}
	return out
}

// key identifies a finding across runs.
func (s Snapshot) key() string {
	return fmt.Sprintf("%q %q %q %q", s.Check, s.Device, s.Other, s.Stage)
}

// ChangeKind says how a finding changed against the baseline.
type ChangeKind uint8

// Kinds of change, in the order reports list them.
const (
	New     ChangeKind = iota // no such finding in the baseline
	Worse                     // a worse verdict, or the same verdict with a smaller margin
	Fixed                     // no longer passing before, passing now
	Better                    // a better verdict short of PASS, or a larger margin
	Removed                   // in the baseline, not in this run
	Same                      // the same verdict and margin
)

// ChangeKinds lists the kinds of change in report order.
var ChangeKinds = [...]ChangeKind{New, Worse, Fixed, Better, Removed, Same}

// String returns the kind's name as reports print it.
func (k ChangeKind) String() string {
	return [...]string{"new", "worse", "fixed", "better", "removed", "same"}[k]
}

// Change is one finding compared with the baseline; Before is nil for a
// New finding and After for a Removed one.
type Change struct {
	Kind          ChangeKind
	Before, After *Snapshot
}

// Gates reports whether the change fails a gate on new failures: a
// failing finding that is new or worse than in the baseline.
func (c Change) Gates() bool {
	return c.After != nil && c.After.Verdict == Fail.String() && (c.Kind == New || c.Kind == Worse)
}

// marginTolerance is the relative difference below which two margins are
// the same: rounding residue, not a change (JSON keeps float64 exactly,
// so a study compared with its own run differs by nothing at all).
const marginTolerance = 1e-9

// rank orders verdicts from best to worst for the comparison; an
// accepted finding ranks with a warning.
func rank(v string) int {
	switch v {
	case "PASS":
		return 0
	case "WARN", "ACCEPTED":
		return 1
	}
	return 2
}

// Compare matches the findings of a run (after) with those of a baseline
// (before) by check, device, other device and stage (the n-th of equal
// keys with the n-th), and says how each changed. Findings of the same
// scenario are matched first; a finding left over is then matched with
// one of the same check, device, other device and stage in another
// scenario, as when the scenario that gives the worst finding of a study
// with scenarios has changed. Changes come in the order of after, then
// the removed findings in the order of before.
func Compare(before, after []Snapshot) []Change {
	match := make([]int, len(after))
	used := make([]bool, len(before))
	for _, key := range []func(Snapshot) string{
		func(s Snapshot) string { return s.key() + fmt.Sprintf(" %q", s.Scenario) },
		Snapshot.key,
	} {
		pool := map[string][]int{}
		for i, s := range before {
			if !used[i] {
				pool[key(s)] = append(pool[key(s)], i)
			}
		}
		for i, a := range after {
			if match[i] > 0 {
				continue
			}
			if k := key(a); len(pool[k]) > 0 {
				j := pool[k][0]
				pool[k] = pool[k][1:]
				used[j] = true
				match[i] = j + 1
			}
		}
	}
	var out []Change
	for i := range after {
		a := &after[i]
		if match[i] == 0 {
			out = append(out, Change{Kind: New, After: a})
			continue
		}
		b := &before[match[i]-1]
		out = append(out, Change{Kind: classify(b, a), Before: b, After: a})
	}
	for j := range before {
		if !used[j] {
			out = append(out, Change{Kind: Removed, Before: &before[j]})
		}
	}
	return out
}

func classify(b, a *Snapshot) ChangeKind {
	rb, ra := rank(b.Verdict), rank(a.Verdict)
	switch {
	case ra > rb:
		return Worse
	case ra < rb && ra == 0:
		return Fixed
	case ra < rb:
		return Better
	}
	if b.HasMargin && a.HasMargin {
		tol := marginTolerance * math.Max(1, math.Max(math.Abs(b.Margin), math.Abs(a.Margin)))
		switch d := a.Margin - b.Margin; {
		case d < -tol:
			return Worse
		case d > tol:
			return Better
		}
	}
	return Same
}
