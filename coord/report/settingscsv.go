package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"

	"tripgrade/coord"
	"tripgrade/curves"
)

// settingsColumns are the columns of a settings table as the study loader
// reads it (README: Settings table).
var settingsColumns = []string{"relay", "label", "measures", "direction", "curve", "pickup_a", "tms", "td", "delay_s",
	"max_multiple", "min_time_s", "k", "alpha", "c", "a", "b", "p", "tr", "pickup_range_a", "multiplier_range"}

// WriteSettingsCSV writes every stage of every relay of the study as a
// settings table the study file can name in settings_csv: pickups in
// primary amperes, figures in full precision so that reading the table
// back gives the same settings. A name that a spreadsheet would run as a
// formula cannot be written as it is (the loader reads cells verbatim)
// and is refused.
func WriteSettingsCSV(s *coord.Study, w io.Writer) error {
	cw := csv.NewWriter(w)
	_ = cw.Write(settingsColumns)
	num := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	rng := func(r coord.Range) string {
		if !r.Declared() {
			return ""
		}
		out := num(r.Min) + ":" + num(r.Max)
		if r.Step > 0 {
			out += ":" + num(r.Step)
		}
		return out
	}
	for _, d := range s.Devices {
		if d.Kind != coord.Relay {
			continue
		}
		for _, st := range d.Stages {
			for _, text := range []string{d.Name, st.Label} {
				if textCell(text) != text {
					return fmt.Errorf("relay %q stage %q: a name starting with =, +, -, @ or a control character would run as a formula in a spreadsheet; rename it before writing a settings table", d.Name, st.Label)
				}
			}
			row := map[string]string{"relay": d.Name, "label": st.Label, "measures": st.Measures.String(),
				"direction": st.Direction.String(), "curve": st.Shape.String(), "pickup_a": num(st.PickupA),
				"pickup_range_a": rng(st.PickupRange), "multiplier_range": rng(st.MultiplierRange)}
			if st.Shape.Dependent() {
				row[map[string]string{"TMS": "tms", "TD": "td"}[st.Shape.MultiplierName()]] = num(st.Multiplier)
				if c, ok := st.Curve.(curves.InverseTime); ok {
					if c.MaxMultiple > 0 {
						row["max_multiple"] = num(c.MaxMultiple)
					}
					if c.MinTimeS > 0 {
						row["min_time_s"] = num(c.MinTimeS)
					}
					switch st.Shape {
					case curves.ShapeIECUser:
						row["k"], row["alpha"], row["c"] = num(c.Law.A), num(c.Law.P), num(c.Law.B)
					case curves.ShapeIEEEUser:
						row["a"], row["b"], row["p"], row["tr"] = num(c.Law.A), num(c.Law.B), num(c.Law.P), num(c.Law.ResetS)
					}
				}
			} else if st.Shape == curves.ShapeDefinite || st.DelayS > 0 {
				row["delay_s"] = num(st.DelayS)
			}
			cells := make([]string, len(settingsColumns))
			for i, col := range settingsColumns {
				cells[i] = row[col]
			}
			_ = cw.Write(cells)
		}
	}
	cw.Flush()
	return cw.Error()
}
