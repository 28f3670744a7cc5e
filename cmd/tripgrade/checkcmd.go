package main

import (
	"bytes"
	"fmt"
	"io"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/report"
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
	formats []string
	outDir  string
	strict  bool
	format  *string
}

// addCheckFlags adds the flags check and demo share.
func addCheckFlags(c *cmdLine) *checkOptions {
	o := &checkOptions{}
	o.format = c.fs.String("format", "text", "table `formats`, comma-separated: text, md, csv, json (the first is printed)")
	c.fs.StringVar(&o.outDir, "out", "", "also write the table in every format, and the plots, to `DIR`")
	c.fs.BoolVar(&o.strict, "strict", false, "exit 1 on warnings too (checks that could not be made, CT and damage warnings)")
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
	return nil
}

// runCheck is "tripgrade check STUDY.toml": the whole audit.
func runCheck(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("check", `usage: tripgrade check STUDY.toml [--format text|md|csv|json[,...]] [--out DIR] [--strict]

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

// checkLoaded runs the checks on a prepared study and writes the results.
func checkLoaded(l loaded, o *checkOptions, stdout, stderr io.Writer) int {
	res, err := coord.Check(l.study, l.engine, l.topo)
	if err != nil {
		fmt.Fprintf(stderr, "tripgrade check: %v\n", err)
		return exitUsage
	}
	tab := report.NewFindings(l.study, res)
	if err := findingWriters[o.formats[0]].write(tab, stdout); err != nil {
		fmt.Fprintf(stderr, "tripgrade check: %v\n", err)
		return exitUsage
	}
	if o.outDir != "" {
		if err := writeOutputs(l, res, tab, o, stderr); err != nil {
			fmt.Fprintf(stderr, "tripgrade check: %v\n", err)
			return exitUsage
		}
	}
	switch {
	case res.Failed():
		return exitFail
	case o.strict && tab.Warn > 0:
		return exitFail
	}
	return exitOK
}

// writeOutputs writes the table in every chosen format and the
// time-current plots to the output folder, creating it when missing, and
// removes the files an earlier run wrote there that this one does not
// (outFolder).
func writeOutputs(l loaded, res *coord.Result, tab *report.Findings, o *checkOptions, stderr io.Writer) error {
	out, err := openOutFolder(o.outDir)
	if err != nil {
		return err
	}
	charts, err := plotCharts(l, res)
	if err != nil {
		return err
	}
	var names []string
	for _, f := range o.formats {
		names = append(names, "findings."+findingWriters[f].ext)
	}
	for _, c := range charts {
		names = append(names, chartFile(c))
	}
	if err := out.plan(names); err != nil {
		return err
	}
	for _, f := range o.formats {
		w := findingWriters[f]
		if err := out.write("findings."+w.ext, func(b *bytes.Buffer) error { return w.write(tab, b) }); err != nil {
			return err
		}
	}
	if err := writePlots(out, charts); err != nil {
		return err
	}
	return out.finish()
}
