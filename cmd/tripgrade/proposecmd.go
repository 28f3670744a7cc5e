package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/propose"
	"tripgrade/coord/report"
)

// runPropose is "tripgrade propose STUDY.toml": the least time
// multipliers that meet every margin, verified by the checker.
func runPropose(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("propose", `usage: tripgrade propose STUDY.toml [--out FILE.csv] [--format text|md|csv|json] [--keep NAMES]
                         [--tms-range MIN:MAX:STEP] [--td-range MIN:MAX:STEP] [--pickups]

Finds, for every inverse-time stage, the least time multiplier within its range
such that every grading, discrimination and clearing margin the checker judges
holds, rounds it up to the range's step and verifies the result with the
checker. Prints the proposal (old → new, what binds each multiplier, the margins
before and after, the conflicts no multiplier resolves); --out writes the
proposed settings as a settings table the study can read. With --pickups it
first chooses the pickup of every inverse-time stage that declares a
pickup_range_a, between the load and sensitivity limits the checker applies:
the lowest admissible, raised only where that lets more margins be met. Exit 0:
verified, no conflict; 1: conflicts remain or the proposal could not be
verified; 2: the study or the command line is wrong.`)
	out := c.fs.String("out", "", "write the proposed settings as a settings table (CSV) to `FILE`")
	format := c.fs.String("format", "text", "output `format`: text, md, csv or json")
	keep := c.fs.String("keep", "", "devices whose settings stay as they are, comma-separated `NAMES`")
	tms := c.fs.String("tms-range", rangeText(propose.DefaultTMSRange), "the TMS range of IEC stages that declare no multiplier_range, `MIN:MAX:STEP`")
	td := c.fs.String("td-range", rangeText(propose.DefaultTDRange), "the TD range of IEEE stages that declare no multiplier_range, `MIN:MAX:STEP`")
	pickups := c.fs.Bool("pickups", false, "also choose the pickups of inverse-time stages from their declared pickup_range_a")
	if code, done := c.parse(args, 1, "exactly one study file", stdout, stderr); done {
		return code
	}
	write, ok := map[string]func(*report.Proposal, io.Writer) error{
		"text": (*report.Proposal).WriteText,
		"md":   (*report.Proposal).WriteMarkdown,
		"csv":  (*report.Proposal).WriteCSV,
		"json": (*report.Proposal).WriteJSON,
	}[*format]
	if !ok {
		return c.fail(stderr, exitUsage, "--format %q: want text, md, csv or json", *format)
	}
	set := propose.Settings{Pickups: *pickups}
	var err error
	if set.DefaultTMS, err = parseRange("--tms-range", *tms); err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	if set.DefaultTD, err = parseRange("--td-range", *td); err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	l, ok := loadStudy(c.fs.Arg(0), stderr)
	if !ok {
		return exitUsage
	}
	if *keep != "" {
		for _, name := range strings.Split(*keep, ",") {
			name = strings.TrimSpace(name)
			if !hasDevice(l.study, name) {
				return c.fail(stderr, exitUsage, "--keep: no relay or fuse %q in %s%s", name, l.path, suggestDevice(l.study, name))
			}
			set.Keep = append(set.Keep, name)
		}
	}
	pr, err := propose.Propose(l.study, l.engine, l.topo, set)
	var none *propose.NoPickupsError
	if errors.As(err, &none) {
		return c.fail(stderr, exitUsage, "--pickups: %s: %v", l.path, err)
	}
	if err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	tab := report.NewProposal(pr)
	tab.Notes = proposeNotes(set, *tms, *td)
	if err := write(tab, stdout); err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	if *out != "" {
		if !pr.Verified() {
			fmt.Fprintf(stderr, "tripgrade propose: %s not written: the checker fails the proposal (see the table)\n", *out)
			return exitFail
		}
		if err := writeTo(*out, func(b *bytes.Buffer) error { return report.WriteSettingsCSV(pr.Proposed, b) }); err != nil {
			return c.fail(stderr, exitUsage, "%v", err)
		}
		listWritten(stderr, []string{*out})
	}
	if !pr.Verified() || len(pr.Conflicts) > 0 {
		return exitFail
	}
	return exitOK
}

// proposeNotes says which defaults and which kept devices the search used.
func proposeNotes(set propose.Settings, tms, td string) []string {
	notes := []string{fmt.Sprintf("stages without a declared multiplier_range are searched over TMS %s and TD %s (--tms-range, --td-range)", tms, td)}
	if len(set.Keep) > 0 {
		notes = append(notes, "kept as they are: "+strings.Join(set.Keep, ", "))
	}
	return notes
}

func hasDevice(s *coord.Study, name string) bool {
	for _, d := range s.Devices {
		if d.Name == name {
			return true
		}
	}
	return false
}

// rangeText writes a range as MIN:MAX:STEP.
func rangeText(r coord.Range) string {
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	return f(r.Min) + ":" + f(r.Max) + ":" + f(r.Step)
}

// parseRange reads MIN:MAX[:STEP].
func parseRange(flag, text string) (coord.Range, error) {
	parts := strings.Split(text, ":")
	bad := fmt.Errorf("%s %q: want MIN:MAX:STEP with 0 < MIN ≤ MAX and STEP ≥ 0 (e.g. 0.05:1:0.01)", flag, text)
	if len(parts) < 2 || len(parts) > 3 {
		return coord.Range{}, bad
	}
	var v [3]float64
	for i, p := range parts {
		x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil || x != x || x > 100 || x < 0 {
			return coord.Range{}, bad
		}
		v[i] = x
	}
	r := coord.Range{Min: v[0], Max: v[1], Step: v[2]}
	if !(r.Min > 0) || r.Max < r.Min {
		return coord.Range{}, bad
	}
	return r, nil
}
