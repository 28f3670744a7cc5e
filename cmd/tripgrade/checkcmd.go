package main

import (
	"bytes"
	"fmt"
	"io"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/coord/tcc"
)

// findingWriters are the formats of the findings table and the file
// extension each is written under in --out.
var findingWriters = map[string]struct {
	ext   string
	write func(*report.Findings, io.Writer) error
}{
	"text": {"txt", (*report.Findings).WriteText},
	"md":   {"md", (*report.Findings).WriteMarkdown},
	"csv":  {"csv", (*report.Findings).WriteCSV},
	"json": {"json", (*report.Findings).WriteJSON},
}

// checkOptions are the parsed flags of check and demo.
type checkOptions struct {
	formats   []string
	outDir    string
	strict    bool
	format    *string
	review    *reviewOptions
	scenarios string
}

// addCheckFlags adds the flags check and demo share.
func addCheckFlags(c *cmdLine) *checkOptions {
	o := &checkOptions{}
	o.format = c.fs.String("format", "text", "table `formats`, comma-separated: text, md, csv, json (the first is printed)")
	c.fs.StringVar(&o.outDir, "out", "", "also write the table in every format, and the plots, to `DIR`")
	c.fs.BoolVar(&o.strict, "strict", false, "exit 1 on warnings too (checks that could not be made, CT and damage warnings)")
	c.fs.StringVar(&o.scenarios, "scenarios", "", "list the findings of `all` the study's scenarios, or of the NAMES given (comma-separated; \"as drawn\" is the study as drawn), each in turn, then the worst of each check, device and stage over them; by default every scenario is checked and only the worst are given")
	o.review = addReviewFlags(c)
	return o
}

// parseFormats reads the --format list.
func (o *checkOptions) parseFormats() error {
	o.formats = nil
	for _, f := range strings.Split(*o.format, ",") {
		f = strings.TrimSpace(f)
		if _, ok := findingWriters[f]; !ok {
			return fmt.Errorf("--format %q: want text, md, csv or json", f)
		}
		o.formats = append(o.formats, f)
	}
	return o.review.validate()
}

// runCheck is "tripgrade check STUDY.toml": the whole audit.
func runCheck(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("check", `usage: tripgrade check STUDY.toml [--format text|md|csv|json[,...]] [--out DIR] [--strict]
                       [--scope NAMES] [--baseline FINDINGS.json [--fail-on new]] [--report FILE.html]
                       [--scenarios all|NAMES]

Checks grading margins of every backup pair over the whole fault range, primary and
backup sensitivity, load margin, instantaneous reach, inrush, equipment damage and
the settings against their ranges and CTs. Exit 0: nothing fails; 1: a check fails;
2: the study or the command line is wrong.`)
	o := addCheckFlags(c)
	if code, done := c.parse(args, 1, "exactly one study file", stdout, stderr); done {
		return code
	}
	if err := o.parseFormats(); err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	l, ok := loadStudy(c.fs.Arg(0), stderr)
	if !ok {
		return exitUsage
	}
	return checkLoaded(l, o, stdout, stderr)
}

// checkLoaded runs the checks on a prepared study, as drawn and in each
// of its scenarios, and writes the results.
func checkLoaded(l loaded, o *checkOptions, stdout, stderr io.Writer) int {
	pick, err := o.pickScenarios(l.study)
	if err != nil {
		return fprintErr(stderr, err)
	}
	var out *outFolder
	if o.outDir != "" && o.listing() {
		// The findings of every scenario are streamed into the folder.
		if out, err = openOutFolder(o.outDir); err == nil {
			err = out.plan(findingFiles(o))
		}
		if err != nil {
			return fprintErr(stderr, err)
		}
	}
	run, err := newScenarioRun(l, o, stdout, out)
	if err != nil {
		return fprintErr(stderr, err)
	}
	run.showProgress(stderr, pick)
	err = coord.CheckScenarios(l.study, l.engine, l.topo, pick, run.visit)
	run.endProgress()
	// What follows needs few impedance entries: free the factor paths the
	// checks kept before the table is made.
	l.engine.ForgetPaths()
	if err != nil {
		run.abort()
		scenarioFailure(l, err, stderr)
		return exitUsage
	}
	if !printStale(l, run.acc.Stale(), stderr) {
		run.abort()
		return exitUsage
	}
	res := run.result()
	tab, err := run.table(res)
	if err != nil {
		run.abort()
		return fprintErr(stderr, err)
	}
	if o.listing() {
		wrote, err := run.finish(tab)
		listWritten(stderr, wrote)
		if err != nil {
			return fprintErr(stderr, err)
		}
	} else if err := findingWriters[o.formats[0]].write(tab, stdout); err != nil {
		fmt.Fprintf(stderr, "tripgrade check: %v\n", err)
		return exitUsage
	}
	if o.outDir != "" {
		wrote, removed, err := writeOutputs(l, run, tab, o, out)
		listWritten(stderr, wrote)
		for _, p := range removed {
			fmt.Fprintf(stderr, "removed %s (written by an earlier run, not by this one)\n", p)
		}
		if err != nil {
			fmt.Fprintf(stderr, "tripgrade check: %v\n", err)
			return exitUsage
		}
	}
	if _, done := o.reportInOut(); o.review.report != "" && !done {
		if err := writeReport(l, run, tab, o.review.report, o.review.gate(tab)); err != nil {
			return fprintErr(stderr, err)
		}
		listWritten(stderr, []string{o.review.report})
	}
	return o.review.exitCode(res, tab, o.strict)
}

// table makes the findings table of the worst findings: narrowed to the
// scope, with the pairs only scenarios have and the baseline comparison.
func (r *scenarioRun) table(res *coord.Result) (*report.Findings, error) {
	var info *report.ScopeInfo
	extra := r.worst.ExtraPairs()
	if r.scope != nil {
		left := r.scope.Apply(r.first, res)
		info = report.NewScopeInfo(r.first, r.scope, left)
		if r.asDrawn != nil {
			r.scope.Apply(r.l.study, r.asDrawn)
		}
		kept := extra[:0:0]
		for _, p := range extra {
			if r.scope.Keeps(p.Downstream, p.Upstream) {
				kept = append(kept, p)
			}
		}
		extra = kept
	}
	r.res = res
	tab := report.NewFindings(r.first, res)
	tab.Study, tab.Cases, tab.Notes = r.l.study.Name, report.CaseLines(r.l.study), r.l.study.Notes
	tab.Acceptances, tab.Scenarios, tab.ScenarioNotes = r.l.study.Accepts, report.NewScenarioLines(r.l.study), r.l.study.ScenarioNotes
	if pick, _ := r.o.pickScenarios(r.l.study); pick != nil {
		tab.KeepScenarios(pick) // the header names only the scenarios checked
	}
	tab.AddScenarioPairs(extra)
	tab.Scope = info
	var err error
	tab.Baseline, err = r.o.review.compare(res, r.scope)
	return tab, err
}

// findingFiles are the names of the findings tables in the output folder.
func findingFiles(o *checkOptions) []string {
	var names []string
	for _, f := range o.formats {
		names = append(names, "findings."+findingWriters[f].ext)
	}
	return names
}

// writeOutputs writes the table in every chosen format (unless check
// --scenarios all streamed them already) and the time-current plots to
// the output folder, creating it when missing, and the audit report when
// it is asked for in that folder; it removes the files an earlier run
// wrote there that this one does not (outFolder). It returns the paths
// written and those removed.
func writeOutputs(l loaded, run *scenarioRun, tab *report.Findings, o *checkOptions, out *outFolder) (wrote, removed []string, err error) {
	if out == nil {
		if out, err = openOutFolder(o.outDir); err != nil {
			return nil, nil, err
		}
	}
	var charts []*tcc.Chart
	if run.asDrawn != nil {
		if charts, err = plotCharts(l, run.asDrawn); err != nil {
			return nil, nil, err
		}
	}
	extra := run.pairCharts(run.res)
	names := findingFiles(o)
	for _, c := range charts {
		names = append(names, chartFile(c))
	}
	for _, c := range extra {
		names = append(names, c.name+"."+tcc.PNG.Ext())
	}
	reportName, reportHere := o.reportInOut()
	if reportHere {
		names = append(names, reportName)
	}
	if err := out.plan(names); err != nil {
		return nil, nil, err
	}
	if !o.listing() {
		for _, f := range o.formats {
			w := findingWriters[f]
			path, err := out.write("findings."+w.ext, func(b *bytes.Buffer) error { return w.write(tab, b) })
			if err != nil {
				return wrote, nil, err
			}
			wrote = append(wrote, path)
		}
	}
	plots, err := writePlots(out, charts)
	wrote = append(wrote, plots...)
	if err != nil {
		return wrote, nil, err
	}
	for _, c := range extra {
		path, err := out.write(c.name+"."+tcc.PNG.Ext(), func(b *bytes.Buffer) error { _, err := b.Write(c.out); return err })
		if err != nil {
			return wrote, nil, err
		}
		wrote = append(wrote, path)
	}
	if reportHere {
		a, err := auditReport(l, run, tab, o.review.gate(tab))
		if err != nil {
			return wrote, nil, err
		}
		path, err := out.write(reportName, func(b *bytes.Buffer) error { return a.WriteHTML(b) })
		if err != nil {
			return wrote, nil, err
		}
		wrote = append(wrote, path)
	}
	removed, err = out.finish()
	return wrote, removed, err
}

// reportInOut reports whether the audit report is asked for in the
// output folder, and its name there.
func (o *checkOptions) reportInOut() (string, bool) {
	if o.review.report == "" || o.outDir == "" {
		return "", false
	}
	return fileIn(o.outDir, o.review.report)
}

// listWritten tells the user which files a command wrote, on stderr so
// that the table on stdout stays clean for a pipe.
func listWritten(stderr io.Writer, paths []string) {
	for _, p := range paths {
		fmt.Fprintf(stderr, "wrote %s\n", p)
	}
}
