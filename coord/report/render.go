package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strings"

	"tripgrade/coord"
)

// WriteText writes the findings aligned for a terminal: the pairs, then a
// table per check, then the summary line and the caution.
func (f *Findings) WriteText(w io.Writer) error {
	ew := &errWriter{w: w}
	if f.Section != nil {
		fmt.Fprintf(ew, "\n=== scenario %s: %s ===\n", f.Section.Name, f.Section.Changes)
		for _, c := range f.CheckNotes {
			fmt.Fprintf(ew, "  %s\n", wrap(c, TextWidth-2, "      "))
		}
	} else {
		fmt.Fprintf(ew, "tripgrade coordination check: %s\n", f.Study)
		for _, c := range append(append(append([]string{}, f.Cases...), f.Criteria...), f.Scope.lines()...) {
			fmt.Fprintf(ew, "  %s\n", wrap(c, TextWidth-2, "      "))
		}
		for _, n := range f.Notes {
			fmt.Fprintf(ew, "  note: %s\n", n)
		}
		for _, s := range f.scenarioLines() {
			indent := strings.Repeat(" ", 2+len(s)-len(strings.TrimLeft(s, " ")))
			fmt.Fprintf(ew, "%s%s\n", indent, wrap(s, TextWidth-len(indent), indent+"    "))
		}
	}
	fmt.Fprintf(ew, "\nBackup pairs (upstream → downstream, from the topology and the fault-current direction):\n")
	for _, p := range f.Pairs {
		fmt.Fprintf(ew, "  %s\n", pairText(p))
	}
	if len(f.Pairs) == 0 {
		fmt.Fprintln(ew, "  none")
	}
	if len(f.Excluded) > 0 {
		fmt.Fprintf(ew, "  excluded by [[pair]]: %s\n", joinPairs(f.Excluded))
	}
	for _, g := range f.groups() {
		fmt.Fprintf(ew, "\n%s\n", strings.ToUpper(g[0].Finding.Check.String()))
		findingsTable(g, f.Scenarios != nil).write(ew)
	}
	f.Baseline.writeText(ew)
	if f.Section != nil {
		fmt.Fprintf(ew, "\nscenario %s: %s\n", f.Section.Name, f.Verdict())
		return ew.err
	}
	fmt.Fprintf(ew, "\n%s\n%s\n", f.Verdict(), Caution)
	return ew.err
}

// scenarioLines describes the scenarios for a report's header: each of
// the study's own, and the N-1 sweep in a line or two.
func (f *Findings) scenarioLines() []string {
	if f.Scenarios == nil {
		return nil
	}
	out := []string{"scenarios (each finding is the worst of its check, device and stage over them all, and names the scenario it comes from):"}
	if f.Picked {
		out[0] = "scenarios checked, as --scenarios asked (each finding is the worst of its check, device and stage over them, and names the scenario it comes from):"
	}
	outages, first := 0, ""
	for _, s := range f.Scenarios {
		if s.Outage {
			if outages == 0 {
				first = s.Name
			}
			outages++
			continue
		}
		out = append(out, fmt.Sprintf("  %s: %s", s.Name, s.Changes))
	}
	if outages > 0 {
		what := fmt.Sprintf("%d N-1 outages, each", outages)
		if outages == 1 {
			what = "1 N-1 outage,"
		}
		out = append(out, fmt.Sprintf("  %s named after the element out of service (%q)", what, first))
	}
	return append(out, f.ScenarioNotes...)
}

func dash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// WriteMarkdown writes the findings as Markdown: a table per check.
func (f *Findings) WriteMarkdown(w io.Writer) error {
	ew := &errWriter{w: w}
	if f.Section != nil {
		fmt.Fprintf(ew, "\n# Scenario %s\n\n%s\n", md(f.Section.Name), md(f.Section.Changes))
		if len(f.CheckNotes) > 0 {
			fmt.Fprintln(ew)
		}
		for _, c := range f.CheckNotes {
			fmt.Fprintf(ew, "- %s\n", md(c))
		}
	} else {
		fmt.Fprintf(ew, "# Coordination check: %s\n\n> %s\n\n", md(f.Study), Caution)
		for _, c := range append(append(append([]string{}, f.Cases...), f.Criteria...), f.Scope.lines()...) {
			fmt.Fprintf(ew, "- %s\n", md(c))
		}
		for _, n := range f.Notes {
			fmt.Fprintf(ew, "- note: %s\n", md(n))
		}
		for _, s := range f.scenarioLines() {
			indent := ""
			if strings.HasPrefix(s, "  ") {
				indent = "  "
			}
			fmt.Fprintf(ew, "%s- %s\n", indent, md(strings.TrimSpace(s)))
		}
	}
	fmt.Fprintf(ew, "\n**%s**\n\n## Backup pairs\n\n", f.Verdict())
	for _, p := range f.Pairs {
		fmt.Fprintf(ew, "- %s\n", md(pairText(p)))
	}
	if len(f.Excluded) > 0 {
		fmt.Fprintf(ew, "- excluded by `[[pair]]`: %s\n", md(joinPairs(f.Excluded)))
	}
	for _, g := range f.groups() {
		c := g[0].Finding.Check
		with := withHeading(c)
		fmt.Fprintf(ew, "\n## %s\n\n", strings.ToUpper(c.String()[:1])+c.String()[1:])
		head, rule := "| verdict | "+subjectHeading(c)+" |", "| --- | --- |"
		if with != "" {
			head, rule = head+" "+with+" |", rule+" --- |"
		}
		head, rule = head+" stage | measured | required | margin |", rule+" --- | ---: | ---: | ---: |"
		if f.Scenarios != nil {
			head, rule = head+" scenario |", rule+" --- |"
		}
		fmt.Fprintf(ew, "%s fault | detail | note |\n%s --- | --- | --- |\n", head, rule)
		for _, r := range g {
			x := r.Finding
			v := x.Verdict.String()
			if x.Verdict != 0 {
				v = "**" + v + "**"
			}
			line := "| " + v + " | " + md(x.Device) + " |"
			if with != "" {
				line += " " + md(x.Other) + " |"
			}
			note := x.Note
			if x.Acceptance != nil {
				note = strings.TrimPrefix(note+"; "+acceptanceText(x.Acceptance), "; ")
			}
			line += fmt.Sprintf(" %s | %s | %s | %s |", md(x.Stage), md(r.Measured), md(r.Required), md(r.Margin))
			if f.Scenarios != nil {
				line += " " + md(x.Scenario) + " |"
			}
			fmt.Fprintf(ew, "%s %s | %s | %s |\n", line, md(r.Fault), md(r.Detail), md(note))
		}
	}
	f.Baseline.writeMarkdown(ew)
	return ew.err
}

// md escapes text for a Markdown table cell.
func md(s string) string {
	r := strings.NewReplacer("|", `\|`, "\n", " ", "*", `\*`, "_", `\_`, "`", "\\`", "<", "&lt;", ">", "&gt;", "[", `\[`, "]", `\]`)
	return r.Replace(s)
}

// csvHeader is the column list of WriteCSV.
var csvHeader = []string{"check", "verdict", "device", "other", "stage", "measured", "required", "margin", "unit", "relation",
	"fault_kind", "fault_case", "fault_place", "interpolated", "sweep_scale", "device_current_a", "device_quantity", "other_current_a", "other_quantity",
	"device_time_s", "other_time_s", "note"}

// quantityName names the quantity of a current in CSV and JSON, "" when
// there is no current: "phase" or "residual" (3I0).
func quantityName(a float64, q coord.Quantity) string {
	switch {
	case a == 0 || math.IsNaN(a):
		return ""
	case q == coord.Residual:
		return "residual"
	}
	return "phase"
}

// WriteCSV writes one row per finding. Text cells a spreadsheet would
// run as a formula are neutralised (textCell); a figure that is not a
// finite number is written as NaN or ±Inf; the times of the checks that
// time their devices are written whenever the finding has a fault, zero
// included.
func (f *Findings) WriteCSV(w io.Writer) error { return f.WriteCSVRows(w, true) }

// WriteCSVRows writes WriteCSV's rows, with its header row when header is
// set (check --scenarios all writes the rows of each scenario in turn
// under one header). A table with scenarios has a last column, scenario.
func (f *Findings) WriteCSVRows(w io.Writer, header bool) error {
	cw := csv.NewWriter(w)
	scenarios := f.Scenarios != nil || f.Section != nil
	if header {
		h := csvHeader
		if scenarios {
			h = append(append([]string(nil), csvHeader...), "scenario")
		}
		cw.Write(h)
	}
	num := func(v float64, ok bool) string {
		if !ok {
			return ""
		}
		return numberCell(v)
	}
	for _, r := range f.Rows {
		x := r.Finding
		rec := []string{x.Check.Slug(), x.Verdict.String(), textCell(x.Device), textCell(x.Other), textCell(x.Stage),
			num(x.Measured, x.Valid), num(x.Required, x.Valid), num(x.Margin, x.Valid), x.Unit, x.Relation}
		if ft := x.Fault; ft != nil {
			timed := x.Check.Timed()
			rec = append(rec, ft.Kind.String(), ft.Case.String(), textCell(ft.Place), fmt.Sprint(ft.Interpolated), num(ft.Scale, ft.Interpolated),
				num(ft.DeviceA, ft.DeviceA != 0), quantityName(ft.DeviceA, ft.DeviceQty), num(ft.OtherA, ft.OtherA != 0), quantityName(ft.OtherA, ft.OtherQty),
				num(ft.DeviceS, timed), num(ft.OtherS, timed))
		} else {
			rec = append(rec, "", "", "", "", "", "", "", "", "", "", "")
		}
		rec = append(rec, textCell(x.Note))
		if scenarios {
			rec = append(rec, textCell(x.Scenario))
		}
		cw.Write(rec)
	}
	cw.Flush()
	return cw.Error()
}
