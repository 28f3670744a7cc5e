package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"sort"
	"strings"
	"time"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/coord/study"
	"tripgrade/coord/tcc"
)

// scenarioRun checks a study as drawn and in its scenarios, one at a
// time (coord.CheckScenarios), and keeps only what the reports need: the
// worst finding of every check, device and stage (coord.Worst), the
// result as drawn (its charts), and the chart of each pair that fails in
// a scenario but not as drawn, in the scenario where it fails worst. With
// --scenarios all it writes each scenario's findings as soon as they are
// made.
type scenarioRun struct {
	l       loaded
	o       *checkOptions
	acc     *coord.Acceptances
	worst   *coord.Worst
	asDrawn *coord.Result
	first   *coord.Study // the first study checked (as drawn, unless --scenarios leaves it out)
	lines   map[string]report.ScenarioLine
	scope   *coord.Scope
	streams []*report.ScenarioStream
	files   []*streamFile
	failing map[string]bool // grading findings that fail as drawn, by key
	charts  map[string]*scenarioChart
	draw    bool          // charts are wanted (--out or --report)
	res     *coord.Result // the worst findings, once every scenario is checked
	// only is the result of a study without scenarios: it is its own
	// worst, and is not copied into worst (a table of 10,000 buses holds
	// some 270,000 findings).
	only *coord.Result
	// progress, when stderr is a terminal, counts the scenarios checked
	// on one line that each count overwrites.
	progress    io.Writer
	done, total int
	started     time.Time // when the first configuration was started
}

// scenarioChart is a failing pair's chart drawn in the scenario where it
// fails worst, rendered at once (its scenario's study is not kept).
type scenarioChart struct {
	name, subtitle          string
	device, other, scenario string
	out, report             []byte // PNG at the --out size and at the report's
}

// listing reports whether --scenarios asks for each scenario's findings
// (all of them, or those named) rather than only the worst.
func (o *checkOptions) listing() bool { return o.scenarios != "" }

// pickScenarios reads --scenarios: nil (every scenario) for "" and
// "all", or the names given, each the study as drawn or one of its
// scenarios.
func (o *checkOptions) pickScenarios(s *coord.Study) (func(string) bool, error) {
	if o.scenarios == "" || o.scenarios == "all" {
		return nil, nil
	}
	known := map[string]bool{coord.AsDrawn: true}
	var names []string
	for _, sc := range s.Scenarios {
		known[sc.Name] = true
		names = append(names, sc.Name)
	}
	want := map[string]bool{}
	for _, n := range strings.Split(o.scenarios, ",") {
		n = strings.TrimSpace(n)
		if n == "" {
			continue
		}
		if !known[n] {
			hint := ""
			if near := closestScenario(n, names); near != "" {
				hint = fmt.Sprintf("; did you mean %q?", near)
			}
			return nil, fmt.Errorf("--scenarios: the study has no scenario %q (%q is the study as drawn)%s", n, coord.AsDrawn, hint)
		}
		want[n] = true
	}
	if len(want) == 0 {
		return nil, fmt.Errorf("--scenarios: give all, or scenario names")
	}
	return func(name string) bool { return want[name] }, nil
}

// newScenarioRun prepares a run; with --scenarios all it opens the
// streams of every format (on stdout for the first, in the output folder
// for each with --out).
func newScenarioRun(l loaded, o *checkOptions, stdout io.Writer, out *outFolder) (*scenarioRun, error) {
	r := &scenarioRun{l: l, o: o, acc: coord.NewAcceptances(l.study.Accepts), worst: coord.NewWorst(),
		lines: map[string]report.ScenarioLine{}, failing: map[string]bool{}, charts: map[string]*scenarioChart{},
		draw: o.outDir != "" || o.review.report != ""}
	for _, line := range report.NewScenarioLines(l.study) {
		r.lines[line.Name] = line
	}
	if _, ok := r.lines[coord.AsDrawn]; !ok {
		r.lines[coord.AsDrawn] = report.ScenarioLine{Name: coord.AsDrawn, Changes: "the study as drawn"}
	}
	if !o.listing() {
		return r, nil
	}
	for k, f := range o.formats {
		var w io.Writer
		if k == 0 {
			w = stdout
		}
		if out != nil {
			sf, err := out.create("findings." + findingWriters[f].ext)
			if err != nil {
				r.abort()
				return nil, err
			}
			r.files = append(r.files, sf)
			if w == nil {
				w = sf
			} else {
				w = io.MultiWriter(w, sf)
			}
		}
		if w != nil {
			r.streams = append(r.streams, report.NewScenarioStream(f, w))
		}
	}
	return r, nil
}

// showProgress counts the scenarios checked on w when w is a terminal
// (a run of hundreds of N-1 outages takes minutes); pipelines and files
// get nothing.
func (r *scenarioRun) showProgress(w io.Writer, pick func(string) bool) {
	r.total = 0
	for _, name := range append([]string{coord.AsDrawn}, scenarioNames(r.l.study)...) {
		if pick == nil || pick(name) {
			r.total++
		}
	}
	if f, ok := w.(*os.File); ok && r.total > 1 {
		if fi, err := f.Stat(); err == nil && fi.Mode()&os.ModeCharDevice != 0 {
			r.progress, r.started = w, time.Now()
		}
	}
}

// visit takes one scenario's check.
func (r *scenarioRun) visit(c coord.Checked) error {
	if r.progress != nil {
		r.done++
		fmt.Fprintf(r.progress, "\rchecked %d of %d configurations (%s)%s\x1b[K", r.done, r.total, c.Scenario, timeLeft(time.Since(r.started), r.done, r.total))
	}
	res := c.Result
	r.acc.Apply(res)
	if r.first == nil {
		r.first = c.Study
		if names := r.o.review.scopeNames(); r.o.review.scope != "" {
			sc, err := scopeOf(c, names)
			if err != nil {
				return err
			}
			r.scope = sc
		}
	}
	if c.Scenario == coord.AsDrawn {
		r.asDrawn = res
		for _, f := range res.Findings {
			if f.Check == coord.Grading && f.Verdict == coord.Fail {
				r.failing[pairKey(f.Device, f.Other)] = true
			}
		}
	}
	var changed []int
	if len(r.l.study.Scenarios) == 0 {
		r.only = res
	} else {
		changed = r.worst.Add(c.Study, res)
	}
	if len(r.streams) > 0 {
		if err := r.writeScenario(c); err != nil {
			return err
		}
	}
	if r.draw && c.Scenario != coord.AsDrawn {
		return r.drawPairs(c, changed)
	}
	return nil
}

// scopeOf resolves --scope against a scenario's study.
func scopeOf(c coord.Checked, names []string) (*coord.Scope, error) {
	if len(names) == 0 {
		return nil, fmt.Errorf("--scope: give at least one name")
	}
	return coord.NewScope(c.Study, c.Topology, c.Result.Pairs, names)
}

// writeScenario writes one scenario's findings to the streams, within
// the scope.
func (r *scenarioRun) writeScenario(c coord.Checked) error {
	res := c.Result
	if r.scope != nil {
		cp := *res
		r.scope.Apply(c.Study, &cp)
		res = &cp
	}
	tab := report.NewFindings(c.Study, res)
	line := r.lines[c.Scenario]
	tab.Section, tab.Scenarios, tab.ScenarioNotes = &line, nil, nil
	for _, s := range r.streams {
		if err := s.Scenario(tab); err != nil {
			return err
		}
	}
	return nil
}

// pairKey identifies a pair's grading finding by its devices.
func pairKey(device, other string) string { return fmt.Sprintf("%q %q", device, other) }

// drawPairs draws, in scenario c, the chart of every pair whose grading
// fails there worst of all scenarios so far and does not fail as drawn
// (changed are the positions coord.Worst.Add returned).
func (r *scenarioRun) drawPairs(c coord.Checked, changed []int) error {
	all := r.worst.Findings()
	want := map[string]bool{}
	for _, i := range changed {
		f := all[i]
		if f.Check == coord.Grading && f.Verdict == coord.Fail && f.Scenario == c.Scenario && !r.failing[pairKey(f.Device, f.Other)] {
			want[pairKey(f.Device, f.Other)] = true
		}
	}
	if len(want) == 0 {
		return nil
	}
	atlas, err := newAtlas(loaded{path: r.l.path, study: c.Study, engine: c.Engine, topo: c.Topology}, c.Result)
	if err != nil {
		return fmt.Errorf("scenario %q: charts: %w", c.Scenario, err)
	}
	for _, ch := range atlas.Charts() {
		if !strings.HasPrefix(ch.Name, "pair-") || len(ch.Pairs) != 1 {
			continue
		}
		p := ch.Pairs[0]
		d, u := c.Study.Devices[p.Downstream].Name, c.Study.Devices[p.Upstream].Name
		k := pairKey(d, u)
		if !want[k] {
			continue
		}
		delete(want, k)
		ch.Subtitle += ", in scenario " + c.Scenario
		sc := &scenarioChart{name: tcc.Sanitise(ch.Name + "-in-" + c.Scenario), subtitle: ch.Subtitle, device: d, other: u, scenario: c.Scenario}
		for _, size := range []struct {
			dst  *[]byte
			want bool
			set  tcc.Settings
		}{{&sc.out, r.o.outDir != "", tcc.Settings{}}, {&sc.report, r.o.review.report != "", reportChartSize}} {
			if !size.want {
				continue
			}
			var b bytes.Buffer
			if err := ch.Render(&b, tcc.PNG, size.set); err != nil {
				return fmt.Errorf("scenario %q: chart %s: %w", c.Scenario, ch.Name, err)
			}
			*size.dst = b.Bytes()
		}
		r.charts[k] = sc
	}
	return nil
}

// pairCharts returns the scenario charts of the pairs whose worst
// finding is still the one they were drawn for, in name order.
func (r *scenarioRun) pairCharts(res *coord.Result) []*scenarioChart {
	var out []*scenarioChart
	for _, f := range res.Findings {
		if f.Check != coord.Grading {
			continue
		}
		if sc, ok := r.charts[pairKey(f.Device, f.Other)]; ok && sc.scenario == f.Scenario {
			out = append(out, sc)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].name < out[j].name })
	return out
}

// result returns the worst findings over every scenario checked.
func (r *scenarioRun) result() *coord.Result {
	if r.only != nil {
		cp := *r.only
		return &cp
	}
	return r.worst.Result()
}

// abort drops the stream files.
func (r *scenarioRun) abort() {
	for _, f := range r.files {
		f.abort()
	}
	r.files = nil
}

// scenarioNames lists the names of a study's scenarios.
func scenarioNames(s *coord.Study) []string {
	var out []string
	for _, sc := range s.Scenarios {
		out = append(out, sc.Name)
	}
	return out
}

// timeLeft estimates, for the progress line, the time the remaining
// configurations take at the pace of those done so far: "" until a few
// are done, or when none remain.
func timeLeft(elapsed time.Duration, done, total int) string {
	if done < 3 || done >= total {
		return ""
	}
	left := time.Duration(float64(elapsed) / float64(done) * float64(total-done))
	switch {
	case left < time.Minute:
		return fmt.Sprintf(", about %d s left", int(left.Seconds()+0.5))
	case left < time.Hour:
		return fmt.Sprintf(", about %d min left", int(left.Minutes()+0.5))
	}
	return fmt.Sprintf(", about %.1f h left", left.Hours())
}

// endProgress clears the progress line.
func (r *scenarioRun) endProgress() {
	if r.progress != nil {
		fmt.Fprint(r.progress, "\r\x1b[K")
	}
}

// finish writes the worst findings to the streams and commits their
// files, returning the paths written.
func (r *scenarioRun) finish(tab *report.Findings) ([]string, error) {
	for _, s := range r.streams {
		if err := s.Finish(tab); err != nil {
			r.abort()
			return nil, err
		}
	}
	var wrote []string
	for _, f := range r.files {
		p, err := f.commit()
		if err != nil {
			r.abort()
			return wrote, err
		}
		wrote = append(wrote, p)
	}
	r.files = nil
	return wrote, nil
}

// scenarioFailure prints why a scenario could not be checked.
func scenarioFailure(l loaded, err error, stderr io.Writer) {
	var list study.ErrorList
	if errors.As(err, &list) {
		for _, e := range list {
			fmt.Fprintln(stderr, e)
		}
		return
	}
	var se *coord.ScenarioError
	if errors.As(err, &se) {
		if errors.As(study.Locate(l.path, se.Err), &list) {
			for _, e := range list {
				fmt.Fprintf(stderr, "%s (in scenario %q)\n", e, se.Scenario)
			}
			return
		}
	}
	fmt.Fprintf(stderr, "%s: %v\n", l.path, err)
}
