package coord

import (
	"fmt"
	"math"
)

// Worst gathers the results of a study's scenarios, one at a time, and
// keeps for every finding — every check, device, other device and stage —
// the worst over the scenarios added: a failing finding before a warning,
// a warning before an accepted finding, an accepted finding before a pass,
// and of two with the same verdict the one with the smaller margin. Of
// two that agree (margins within marginTolerance, so that rounding never
// picks a scenario), the one added first stays: the study as drawn, when
// it is added first, unless a scenario is really worse. It holds one
// finding per key, so its memory does not grow with the number of
// scenarios.
type Worst struct {
	index    map[string]int // key and occurrence → position in findings
	findings []Finding
	first    *Result // the first result added: its pairs and notes
	pairs    map[[2]string]bool
	extra    []ScenarioPair
	notes    map[string]bool
	added    []string
}

// ScenarioPair is a backup pair by name that a scenario has and the first
// result added does not, with the first scenario it was found in.
type ScenarioPair struct {
	Upstream, Downstream string
	Manual               bool
	Scenario             string
}

// NewWorst returns an empty gathering.
func NewWorst() *Worst {
	return &Worst{index: map[string]int{}, pairs: map[[2]string]bool{}, notes: map[string]bool{}}
}

// Add takes the result r of study s (in one scenario, its findings
// tagged with it) and returns the positions, in Findings, of the findings
// it made the worst so far (new ones included).
func (w *Worst) Add(s *Study, r *Result) []int {
	name := func(i int) string { return s.Devices[i].Name }
	if w.first == nil {
		w.first = &Result{Pairs: r.Pairs, Excluded: r.Excluded, Notes: r.Notes}
		for _, p := range r.Pairs {
			w.pairs[[2]string{name(p.Upstream), name(p.Downstream)}] = true
		}
		for _, n := range r.Notes {
			w.notes[n] = true
		}
	} else {
		for _, p := range r.Pairs {
			k := [2]string{name(p.Upstream), name(p.Downstream)}
			if !w.pairs[k] {
				w.pairs[k] = true
				w.extra = append(w.extra, ScenarioPair{Upstream: k[0], Downstream: k[1], Manual: p.Manual, Scenario: scenarioOf(r)})
			}
		}
		for _, n := range r.Notes {
			if !w.notes[n] {
				w.notes[n] = true
				w.added = append(w.added, fmt.Sprintf("%s: %s", scenarioOf(r), n))
			}
		}
	}
	var changed []int
	count := map[string]int{}
	for _, f := range r.Findings {
		k := findingKey(f)
		k = fmt.Sprintf("%s#%d", k, count[k])
		count[findingKey(f)]++
		i, ok := w.index[k]
		switch {
		case !ok:
			w.index[k] = len(w.findings)
			changed = append(changed, len(w.findings))
			w.findings = append(w.findings, f)
		case worseFinding(f, w.findings[i]):
			w.findings[i] = f
			changed = append(changed, i)
		}
	}
	return changed
}

// scenarioOf names the scenario of a result's findings.
func scenarioOf(r *Result) string {
	if len(r.Findings) > 0 && r.Findings[0].Scenario != "" {
		return r.Findings[0].Scenario
	}
	return AsDrawn
}

// Findings returns the worst finding of every key, in the order the keys
// were first met.
func (w *Worst) Findings() []Finding { return w.findings }

// Result returns the worst findings with the pairs and notes of the first
// result added; the notes of later scenarios that it lacks follow, each
// naming its scenario.
func (w *Worst) Result() *Result {
	r := &Result{Findings: append([]Finding(nil), w.findings...)}
	if w.first != nil {
		r.Pairs, r.Excluded = w.first.Pairs, w.first.Excluded
		r.Notes = append(append([]string(nil), w.first.Notes...), w.added...)
	}
	return r
}

// ExtraPairs returns the backup pairs that only later scenarios have.
func (w *Worst) ExtraPairs() []ScenarioPair { return w.extra }

// findingKey identifies a finding across scenarios: its check, device,
// other device and stage. A fault-clearing finding is about its element
// alone: the devices that clear it (its Other) are a result, which
// differs from one scenario to the next, so its worst over the
// scenarios is one finding per element.
func findingKey(f Finding) string {
	other := f.Other
	if f.Check == Clearing {
		other = ""
	}
	return fmt.Sprintf("%q %q %q %q", f.Check.Slug(), f.Device, other, f.Stage)
}

// severity orders verdicts for Worst: a pass, an accepted finding, a
// warning, a failure.
func severity(v Verdict) int {
	return [...]int{Pass: 0, Accepted: 1, Warn: 2, Fail: 3}[v]
}

// worseFinding reports whether a is worse than b (see Worst).
func worseFinding(a, b Finding) bool {
	if sa, sb := severity(a.Verdict), severity(b.Verdict); sa != sb {
		return sa > sb
	}
	if !a.Valid || !b.Valid || !finite(a.Margin) || !finite(b.Margin) {
		return false
	}
	tol := marginTolerance * math.Max(1, math.Max(math.Abs(a.Margin), math.Abs(b.Margin)))
	return a.Margin < b.Margin-tol
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
