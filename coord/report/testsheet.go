package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"strings"

	"tripgrade/coord"
	"tripgrade/curves"
)

// TestSheet is the commissioning engineer's secondary-injection sheet:
// for every stage of every relay, test currents in secondary amperes
// with the expected operating time and the band the declared accuracy
// allows.
type TestSheet struct {
	Study string
	// Notes are what loading the study assumed where its input left a
	// choice (coord.Study.Notes): a settings table's decimal mark, say.
	Notes  []string
	Relays []SheetRelay
}

// SheetRelay is one relay's part of the sheet.
type SheetRelay struct {
	Name, CT, Accuracy string
	Rows               []SheetRow
}

// SheetRow is one injection.
type SheetRow struct {
	Stage, Measures, Characteristic string
	PickupA, PickupSecondaryA       float64
	Point                           coord.Injection
	Note                            string
}

// sheetNotes explain every sheet.
var sheetNotes = []string{
	"Times are the relay's own operating times at the injected current, without the breaker.",
	"Tolerance band: the declared accuracy as IEC 60255-151:2009 cl. 5.2 limiting error (dependent-time stages: 2.5 × the class from 2 to 5 × setting, 1.5 × from 5 to 10 ×, 1 × above; definite-time and instantaneous stages: the class), never less than its minimum in seconds.",
	"A single-phase injection drives the residual input too: block the ground stages while testing phase stages, or inject so that the residual stays below their settings.",
}

// NewTestSheet formats the injections of a study.
func NewTestSheet(s *coord.Study, ins []coord.StageInjections) *TestSheet {
	t := &TestSheet{Study: s.Name, Notes: s.Notes}
	for _, si := range ins {
		d := s.Devices[si.Device]
		if len(t.Relays) == 0 || t.Relays[len(t.Relays)-1].Name != d.Name {
			t.Relays = append(t.Relays, SheetRelay{Name: d.Name,
				CT:       fmt.Sprintf("CT %g/%g A", d.CT.PrimaryA, d.CT.SecondaryA),
				Accuracy: accuracyText(d.Accuracy)})
		}
		r := &t.Relays[len(t.Relays)-1]
		st := d.Stages[si.Stage]
		for _, p := range si.Points {
			row := SheetRow{Stage: st.Label, Measures: st.Measures.String(), Characteristic: characteristic(st),
				PickupA: st.PickupA, PickupSecondaryA: si.PickupSecondaryA, Point: p}
			switch {
			case p.Status != curves.Operates:
				row.Note = "does not operate at this current: " + p.Status.String()
			case len(p.Faster) > 0:
				row.Note = "block " + strings.Join(p.Faster, ", ") + ": as fast or faster here"
			}
			r.Rows = append(r.Rows, row)
		}
	}
	return t
}

func accuracyText(a curves.Accuracy) string {
	if a == (curves.Accuracy{}) {
		return "accuracy not declared: no tolerance band"
	}
	return fmt.Sprintf("accuracy %g %% or %.3f s", a.ClassPct, a.MinErrorS)
}

// characteristic names a stage's curve and its time setting.
func characteristic(st coord.Stage) string {
	switch st.Shape {
	case curves.ShapeInstantaneous:
		if st.DelayS > 0 {
			return fmt.Sprintf("instantaneous, %.3f s delay", st.DelayS)
		}
		return "instantaneous"
	case curves.ShapeDefinite:
		return fmt.Sprintf("definite %.3f s", st.DelayS)
	}
	return fmt.Sprintf("%s %s %g", st.Shape, strings.ToUpper(st.Shape.MultiplierName()), st.Multiplier)
}

func (r SheetRow) expected() string {
	if r.Point.Status != curves.Operates {
		return "-"
	}
	return fmt.Sprintf("%.3f s", r.Point.TimeS)
}

func (r SheetRow) band() string {
	if !r.Point.Banded || r.Point.Status != curves.Operates {
		return "-"
	}
	return fmt.Sprintf("%.3f–%.3f s", r.Point.EarlyS, r.Point.LateS)
}

// secondary formats a secondary current to the milliampere.
func secondary(a float64) string { return fmt.Sprintf("%.3f A", a) }

// WriteText writes the sheet for a terminal or a printer: a table per
// relay.
func (t *TestSheet) WriteText(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "tripgrade test sheet: %s\n", t.Study)
	for _, n := range sheetNotes {
		fmt.Fprintf(ew, "  %s\n", wrap(n, TextWidth-2, "    "))
	}
	for _, n := range t.Notes {
		fmt.Fprintf(ew, "  %s\n", wrap("note: "+n, TextWidth-2, "    "))
	}
	for _, r := range t.Relays {
		fmt.Fprintf(ew, "\nRELAY %s  (%s; %s)\n", r.Name, r.CT, r.Accuracy)
		tt := &textTable{head: []string{"stage", "measures", "characteristic", "setting", "× setting", "inject", "(primary)", "expected", "band", "note"}}
		for _, x := range r.Rows {
			tt.rows = append(tt.rows, []string{x.Stage, x.Measures, x.Characteristic,
				secondary(x.PickupSecondaryA) + " (" + amps(x.PickupA) + " A)", fmt.Sprintf("%g", x.Point.Multiple),
				secondary(x.Point.SecondaryA), amps(x.Point.PrimaryA) + " A", x.expected(), x.band(), x.Note})
			tt.under = append(tt.under, "")
		}
		tt.write(ew)
	}
	fmt.Fprintf(ew, "\n%s\n", Caution)
	return ew.err
}

// WriteMarkdown writes the sheet as one Markdown table.
func (t *TestSheet) WriteMarkdown(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "# Test sheet: %s\n\n> %s\n\n", md(t.Study), Caution)
	for _, n := range sheetNotes {
		fmt.Fprintf(ew, "- %s\n", md(n))
	}
	for _, n := range t.Notes {
		fmt.Fprintf(ew, "- note: %s\n", md(n))
	}
	fmt.Fprintln(ew, "\n| relay | CT | stage | measures | characteristic | setting (secondary) | setting (primary) | × setting | inject (secondary) | inject (primary) | expected | band | note |")
	fmt.Fprintln(ew, "| --- | --- | --- | --- | --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | --- |")
	for _, r := range t.Relays {
		for _, x := range r.Rows {
			fmt.Fprintf(ew, "| %s | %s | %s | %s | %s | %s | %s A | %g | %s | %s A | %s | %s | %s |\n",
				md(r.Name), md(r.CT), md(x.Stage), x.Measures, md(x.Characteristic), secondary(x.PickupSecondaryA), amps(x.PickupA),
				x.Point.Multiple, secondary(x.Point.SecondaryA), amps(x.Point.PrimaryA), x.expected(), x.band(), md(x.Note))
		}
	}
	for _, r := range t.Relays {
		fmt.Fprintf(ew, "\n- %s: %s\n", md(r.Name), md(r.Accuracy))
	}
	return ew.err
}

// WriteCSV writes one row per injection with the units in the column
// names; times are empty where the stage does not operate or no accuracy
// is declared.
func (t *TestSheet) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"relay", "stage", "measures", "characteristic", "pickup_a", "pickup_secondary_a", "multiple",
		"injection_a", "injection_secondary_a", "expected_time_s", "earliest_time_s", "latest_time_s", "note"})
	num := func(v float64, ok bool) string {
		if !ok {
			return ""
		}
		return numberCell(v)
	}
	for _, r := range t.Relays {
		for _, x := range r.Rows {
			p := x.Point
			op := p.Status == curves.Operates
			cw.Write([]string{textCell(r.Name), textCell(x.Stage), x.Measures, textCell(x.Characteristic), num(x.PickupA, true), num(x.PickupSecondaryA, true),
				num(p.Multiple, true), num(p.PrimaryA, true), num(p.SecondaryA, true), num(p.TimeS, op),
				num(p.EarlyS, op && p.Banded), num(p.LateS, op && p.Banded), textCell(x.Note)})
		}
	}
	cw.Flush()
	return cw.Error()
}
