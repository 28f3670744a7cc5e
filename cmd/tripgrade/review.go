package main

import (
	"fmt"
	"io"
	"os"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/report"
)

// reviewOptions are the flags of check and demo that serve a reviewer or
// a commissioning gate: the scope, the baseline, the gate and the HTML
// report.
type reviewOptions struct {
	scope    string
	baseline string
	failOn   string
	report   string
}

// addReviewFlags adds the reviewer's flags to a check command line.
func addReviewFlags(c *cmdLine) *reviewOptions {
	r := &reviewOptions{}
	c.fs.StringVar(&r.scope, "scope", "", "check only these `NAMES` (comma-separated relays or fuses, or lines and transformers with every device beyond them), with their backups")
	c.fs.StringVar(&r.baseline, "baseline", "", "compare with an earlier run's findings JSON `FILE` (check --format json): new, worse, fixed, better")
	c.fs.StringVar(&r.failOn, "fail-on", "any", "what makes the exit status 1: `any` failing finding, or only new ones (new or worse failures against --baseline)")
	c.fs.StringVar(&r.report, "report", "", "also write a self-contained HTML audit report to `FILE`")
	return r
}

// validate checks the flags that need no study.
func (r *reviewOptions) validate() error {
	switch r.failOn {
	case "any":
	case "new":
		if r.baseline == "" {
			return fmt.Errorf("--fail-on new needs --baseline FILE (the findings JSON of the run to compare with)")
		}
	default:
		return fmt.Errorf("--fail-on %q: want any or new", r.failOn)
	}
	return nil
}

// scopeNames splits the --scope list.
func (r *reviewOptions) scopeNames() []string {
	var out []string
	for _, n := range strings.Split(r.scope, ",") {
		if n = strings.TrimSpace(n); n != "" {
			out = append(out, n)
		}
	}
	return out
}

// compare reads --baseline and compares the (scoped) result with it.
func (r *reviewOptions) compare(res *coord.Result, sc *coord.Scope) (*report.Comparison, error) {
	if r.baseline == "" {
		return nil, nil
	}
	f, err := os.Open(r.baseline)
	if err != nil {
		return nil, fmt.Errorf("--baseline: %v", err)
	}
	defer f.Close()
	before, err := report.ReadSnapshots(f)
	if err != nil {
		return nil, fmt.Errorf("--baseline %s: %v", r.baseline, err)
	}
	if sc != nil {
		kept := before[:0:0]
		for _, s := range before {
			if sc.Keeps(s.Device, s.Other) {
				kept = append(kept, s)
			}
		}
		before = kept
	}
	return &report.Comparison{File: r.baseline, Changes: coord.Compare(before, coord.Snapshots(res))}, nil
}

// exitCode decides the gate: any failing finding (and with strict any
// warning), or with --fail-on new only failing findings that are new or
// worse than in the baseline.
func (r *reviewOptions) exitCode(res *coord.Result, tab *report.Findings, strict bool) int {
	if r.failOn == "new" {
		if tab.Baseline.Gating() > 0 {
			return exitFail
		}
		return exitOK
	}
	switch {
	case res.Failed():
		return exitFail
	case strict && tab.Warn > 0:
		return exitFail
	}
	return exitOK
}

// fprintErr prints a check error and returns the usage exit code.
func fprintErr(stderr io.Writer, err error) int {
	fmt.Fprintf(stderr, "tripgrade check: %v\n", err)
	return exitUsage
}

// gate words the --fail-on new gate for the report; empty for the
// default gate, which the verdict line already states.
func (r *reviewOptions) gate(tab *report.Findings) string {
	if r.failOn != "new" || tab.Baseline == nil {
		return ""
	}
	verdict := "PASS"
	if tab.Baseline.Gating() > 0 {
		verdict = "FAIL"
	}
	return fmt.Sprintf("gate --fail-on new: %d failing finding(s) new or worse than the baseline: %s", tab.Baseline.Gating(), verdict)
}
