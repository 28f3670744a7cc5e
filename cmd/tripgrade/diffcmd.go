package main

import (
	"io"
	"sort"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/report"
)

// runDiff is "tripgrade diff OLD.toml NEW.toml": what changed in the
// settings, and what that did to every finding.
func runDiff(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("diff", `usage: tripgrade diff OLD.toml NEW.toml [--format text|md|json]

Lists what changed in the settings between two studies of the same network
(per relay or fuse, and per stage by label), checks both, and compares every
finding: new, worse, fixed, better, removed, with the margin before and after.
[[accept]] entries are not applied: the comparison is of the plain verdicts.
A study with scenarios is compared by the worst finding of each check, device
and stage over its scenarios.
Exit 0: no failing finding is new or worse in NEW; 1: some is; 2: bad input.`)
	format := c.fs.String("format", "text", "output `format`: text, md or json")
	if code, done := c.parse(args, 2, "two study files, OLD and NEW", stdout, stderr); done {
		return code
	}
	write, ok := map[string]func(*report.SettingsDiff, io.Writer) error{
		"text": (*report.SettingsDiff).WriteText,
		"md":   (*report.SettingsDiff).WriteMarkdown,
		"json": (*report.SettingsDiff).WriteJSON,
	}[*format]
	if !ok {
		return c.fail(stderr, exitUsage, "--format %q: want text, md or json", *format)
	}
	var runs [2]loaded
	var results [2]*coord.Result
	for k, path := range []string{c.fs.Arg(0), c.fs.Arg(1)} {
		l, ok := loadStudy(path, stderr)
		if !ok {
			return exitUsage
		}
		// A study with scenarios gives the worst finding of each check,
		// device and stage over them, naming its scenario.
		worst := coord.NewWorst()
		err := coord.CheckScenarios(l.study, l.engine, l.topo, nil, func(c coord.Checked) error {
			worst.Add(c.Study, c.Result)
			return nil
		})
		if err != nil {
			scenarioFailure(l, err, stderr)
			return exitUsage
		}
		runs[k], results[k] = l, worst.Result()
	}
	d := &report.SettingsDiff{
		Old: runs[0].path, New: runs[1].path, OldStudy: runs[0].study.Name, NewStudy: runs[1].study.Name,
		Changes:     coord.DiffSettings(runs[0].study, runs[1].study),
		NetworkNote: networkNote(runs[0].study, runs[1].study),
		Margins: &report.Comparison{File: runs[0].path, Heading: "Findings, old → new",
			Changes: coord.Compare(coord.Snapshots(results[0]), coord.Snapshots(results[1]))},
	}
	if err := write(d, stdout); err != nil {
		return c.fail(stderr, exitFail, "%v", err)
	}
	if d.Margins.Gating() > 0 {
		return exitFail
	}
	return exitOK
}

// networkNote says when the two networks differ in their elements, so a
// margin may have moved for a reason other than a setting. It compares
// names only; a changed impedance is not detected.
func networkNote(a, b *coord.Study) string {
	names := func(s *coord.Study) string {
		var out []string
		for _, bus := range s.Network.Buses {
			out = append(out, "bus "+bus.Name)
		}
		for br := 0; br < s.Network.BranchCount(); br++ {
			out = append(out, "branch "+s.Network.BranchName(br))
		}
		sort.Strings(out)
		return strings.Join(out, "\n")
	}
	if names(a) != names(b) {
		return "The networks differ (buses or branches by name): margins move with the network as well as with the settings."
	}
	return ""
}
