package report

import (
	"encoding/csv"
	"encoding/json"
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
	fmt.Fprintf(ew, "tripgrade coordination check: %s\n", f.Study)
	for _, c := range append(append(append([]string{}, f.Cases...), f.Criteria...), f.Scope.lines()...) {
		fmt.Fprintf(ew, "  %s\n", wrap(c, TextWidth-2, "      "))
	}
	for _, n := range f.Notes {
		fmt.Fprintf(ew, "  note: %s\n", n)
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
		findingsTable(g).write(ew)
	}
	f.Baseline.writeText(ew)
	fmt.Fprintf(ew, "\n%s\n%s\n", f.Verdict(), Caution)
	return ew.err
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
	fmt.Fprintf(ew, "# Coordination check: %s\n\n> %s\n\n", md(f.Study), Caution)
	for _, c := range append(append(append([]string{}, f.Cases...), f.Criteria...), f.Scope.lines()...) {
		fmt.Fprintf(ew, "- %s\n", md(c))
	}
	for _, n := range f.Notes {
		fmt.Fprintf(ew, "- note: %s\n", md(n))
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
		fmt.Fprintf(ew, "%s stage | measured | required | margin | fault | detail | note |\n%s --- | ---: | ---: | ---: | --- | --- | --- |\n", head, rule)
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
			fmt.Fprintf(ew, "%s %s | %s | %s | %s | %s | %s | %s |\n", line, md(x.Stage), md(r.Measured), md(r.Required), md(r.Margin), md(r.Fault), md(r.Detail), md(note))
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
func (f *Findings) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write(csvHeader)
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
		cw.Write(append(rec, textCell(x.Note)))
	}
	cw.Flush()
	return cw.Error()
}

// WriteJSON writes the findings as one JSON document.
func (f *Findings) WriteJSON(w io.Writer) error {
	type fault struct {
		Kind         string      `json:"kind"`
		Case         string      `json:"case"`
		Place        string      `json:"place"`
		Interpolated bool        `json:"interpolated"`
		Scale        *jsonNumber `json:"sweep_scale,omitempty"`
		DeviceA      *jsonNumber `json:"device_current_a,omitempty"`
		DeviceQty    string      `json:"device_quantity,omitempty"`
		OtherA       *jsonNumber `json:"other_current_a,omitempty"`
		OtherQty     string      `json:"other_quantity,omitempty"`
		DeviceS      *jsonNumber `json:"device_time_s,omitempty"`
		OtherS       *jsonNumber `json:"other_time_s,omitempty"`
	}
	type finding struct {
		Check    string      `json:"check"`
		Verdict  string      `json:"verdict"`
		Device   string      `json:"device"`
		Other    string      `json:"other,omitempty"`
		Stage    string      `json:"stage,omitempty"`
		Measured *jsonNumber `json:"measured,omitempty"`
		Required *jsonNumber `json:"required,omitempty"`
		Margin   *jsonNumber `json:"margin,omitempty"`
		Unit     string      `json:"unit,omitempty"`
		Relation string      `json:"relation,omitempty"`
		Fault    *fault      `json:"fault,omitempty"`
		Note     string      `json:"note,omitempty"`
		Accepted *accepted   `json:"accepted,omitempty"`
	}
	type pair struct {
		Upstream   string `json:"upstream"`
		Downstream string `json:"downstream"`
		Manual     bool   `json:"added_by_study"`
	}
	doc := struct {
		Schema   int        `json:"schema_version"`
		Study    string     `json:"study"`
		Caution  string     `json:"caution"`
		Cases    []string   `json:"cases"`
		Criteria []string   `json:"criteria"`
		Notes    []string   `json:"notes,omitempty"`
		Pairs    []pair     `json:"pairs"`
		Excluded []pair     `json:"excluded_pairs"`
		Findings []finding  `json:"findings"`
		Accepts  []accepted `json:"acceptances"`
		Summary  struct {
			Pass     int    `json:"pass"`
			Warn     int    `json:"warn"`
			Fail     int    `json:"fail"`
			Accepted int    `json:"accepted"`
			Text     string `json:"text"`
		} `json:"summary"`
		Scope    *jsonScope      `json:"scope,omitempty"`
		Baseline *jsonComparison `json:"baseline,omitempty"`
	}{Schema: SchemaVersion, Study: f.Study, Accepts: []accepted{}, Caution: Caution, Cases: f.Cases, Criteria: f.Criteria, Notes: f.Notes,
		Pairs: []pair{}, Excluded: []pair{}, Findings: []finding{}}
	for _, p := range f.Pairs {
		doc.Pairs = append(doc.Pairs, pair{p.Upstream, p.Downstream, p.Manual})
	}
	for _, p := range f.Excluded {
		doc.Excluded = append(doc.Excluded, pair{p.Upstream, p.Downstream, false})
	}
	for _, r := range f.Rows {
		x := r.Finding
		j := finding{Check: x.Check.Slug(), Verdict: x.Verdict.String(), Device: x.Device, Other: x.Other, Stage: x.Stage,
			Unit: x.Unit, Relation: x.Relation, Note: x.Note}
		if x.Valid {
			j.Measured, j.Required, j.Margin = num(x.Measured), num(x.Required), num(x.Margin)
		}
		if a := x.Acceptance; a != nil {
			j.Accepted = &accepted{Reason: a.Reason, By: a.By, Date: a.Date, Was: a.Was.String()}
		}
		if ft := x.Fault; ft != nil {
			jf := &fault{Kind: ft.Kind.String(), Case: ft.Case.String(), Place: ft.Place, Interpolated: ft.Interpolated,
				DeviceQty: quantityName(ft.DeviceA, ft.DeviceQty), OtherQty: quantityName(ft.OtherA, ft.OtherQty)}
			if ft.Interpolated {
				jf.Scale = num(ft.Scale)
			}
			// A current of 0 is "none": the device carries no current of
			// that quantity (the engine cuts rounding residue to exact 0).
			if ft.DeviceA != 0 {
				jf.DeviceA = num(ft.DeviceA)
			}
			if ft.OtherA != 0 {
				jf.OtherA = num(ft.OtherA)
			}
			if x.Check.Timed() {
				jf.DeviceS, jf.OtherS = num(ft.DeviceS), num(ft.OtherS)
			}
			j.Fault = jf
		}
		doc.Findings = append(doc.Findings, j)
	}
	for _, a := range f.Acceptances {
		doc.Accepts = append(doc.Accepts, accepted{Check: a.Check, Device: a.Device, Other: a.Other, Stage: a.Stage, Reason: a.Reason, By: a.By, Date: a.Date})
	}
	doc.Summary.Pass, doc.Summary.Warn, doc.Summary.Fail, doc.Summary.Text = f.Pass, f.Warn, f.Fail, f.Verdict()
	doc.Summary.Accepted = f.Accepted
	doc.Scope = f.Scope.json()
	doc.Baseline = f.Baseline.json()
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
