package coord

import (
	"fmt"
	"math"
	"strings"
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
	index    map[worstKey]int // key and occurrence → position in findings
	findings []Finding
	first    *Result // the first result added: its pairs and notes
	pairs    map[[2]string]bool
	extra    []ScenarioPair
	notes    map[string]bool
	added    []*addedNote
	shapes   map[string]*addedNote
}

// addedNote is a note that scenarios add to those of the first result:
// notes that differ only in their figures (the N-1 sweep gives one per
// outage, with its own count of faults) are told once, with the number of
// scenarios that give one and the first few names, so the list does not
// grow with the number of scenarios.
type addedNote struct {
	text  string   // as the first scenario gives it
	names []string // the first few scenarios that give one
	n     int      // how many do
}

// namedScenarios is how many scenarios a grouped note names.
const namedScenarios = 3

// String tells the note with the scenarios that give it.
func (a *addedNote) String() string {
	if a.n == 1 {
		return fmt.Sprintf("%s: %s", a.names[0], a.text)
	}
	more := ""
	if a.n > len(a.names) {
		more = fmt.Sprintf(" and %d more", a.n-len(a.names))
	}
	return fmt.Sprintf("%d scenarios (%s%s): %s (the figures are %s's; the others differ)", a.n, strings.Join(a.names, ", "), more, a.text, a.names[0])
}

// noteShape is a note's text with its figures (numbers standing as words
// of their own, not digits inside names such as "L-1") blanked, so that
// notes differing only in counts group together.
func noteShape(n string) string {
	b := []byte(n)
	var out []byte
	for i := 0; i < len(b); i++ {
		if isDigit(b[i]) && (i == 0 || b[i-1] == ' ' || b[i-1] == '(') {
			j := i
			for j < len(b) && (isDigit(b[j]) || b[j] == '.') {
				j++
			}
			if j == len(b) || b[j] == ' ' || b[j] == ',' || b[j] == ')' || b[j] == '%' {
				out = append(out, '#')
				i = j - 1
				continue
			}
		}
		out = append(out, b[i])
	}
	return string(out)
}

func isDigit(c byte) bool { return c >= '0' && c <= '9' }

// ScenarioPair is a backup pair by name that a scenario has and the first
// result added does not, with the first scenario it was found in.
type ScenarioPair struct {
	Upstream, Downstream string
	Manual               bool
	Scenario             string
}

// NewWorst returns an empty gathering.
func NewWorst() *Worst {
	return &Worst{index: map[worstKey]int{}, pairs: map[[2]string]bool{}, notes: map[string]bool{}, shapes: map[string]*addedNote{}}
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
		seen := map[string]int{}
		for _, n := range r.Notes {
			if w.notes[n] {
				continue
			}
			// The k-th note of a shape in one scenario groups with the
			// k-th of that shape in the others.
			sh := noteShape(n)
			seen[sh]++
			sh = fmt.Sprintf("%s#%d", sh, seen[sh])
			a := w.shapes[sh]
			if a == nil {
				a = &addedNote{text: n}
				w.shapes[sh] = a
				w.added = append(w.added, a)
			}
			a.n++
			if len(a.names) < namedScenarios {
				a.names = append(a.names, scenarioOf(r))
			}
		}
	}
	var changed []int
	count := map[worstKey]int{}
	for _, f := range r.Findings {
		k := findingKey(f)
		n := count[k]
		count[k] = n + 1
		k.n = n
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
		r.Notes = append([]string(nil), w.first.Notes...)
		for _, a := range w.added {
			r.Notes = append(r.Notes, a.String())
		}
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
func findingKey(f Finding) worstKey {
	other := f.Other
	if f.Check == Clearing {
		other = ""
	}
	return worstKey{check: f.Check, device: f.Device, other: other, stage: f.Stage}
}

// worstKey is a finding's findingKey and, for a key that several findings
// of one result share, which of them it is (0 for the first).
type worstKey struct {
	check                CheckKind
	device, other, stage string
	n                    int
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
