package study

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path/filepath"
	"strconv"
	"strings"

	"tripgrade/coord"
)

// Settings tables: a CSV file named by [study] settings_csv, one row per
// stage, for relays whose settings live in a spreadsheet. The first row
// names the columns; "relay" is required, the rest are the stage keys of
// the study file (measures, curve, pickup_a, tms, …) and the setting-range
// columns below. Empty cells are "not given".

// csvColumns maps a column name to the raw stage field it fills.
var csvColumns = map[string]func(r *rawStage, text string) error{
	"label":              func(r *rawStage, t string) error { r.Label = t; return nil },
	"measures":           func(r *rawStage, t string) error { r.Measures = t; return nil },
	"direction":          func(r *rawStage, t string) error { r.Direction = t; return nil },
	"curve":              func(r *rawStage, t string) error { r.Curve = t; return nil },
	"pickup_a":           numberInto(func(r *rawStage) **float64 { return &r.PickupA }),
	"pickup_secondary_a": numberInto(func(r *rawStage) **float64 { return &r.PickupSecondaryA }),
	"tms":                numberInto(func(r *rawStage) **float64 { return &r.TMS }),
	"td":                 numberInto(func(r *rawStage) **float64 { return &r.TD }),
	"delay_s":            numberInto(func(r *rawStage) **float64 { return &r.DelayS }),
	"max_multiple":       numberInto(func(r *rawStage) **float64 { return &r.MaxMultiple }),
	"min_time_s":         numberInto(func(r *rawStage) **float64 { return &r.MinTimeS }),
	"k":                  numberInto(func(r *rawStage) **float64 { return &r.K }),
	"alpha":              numberInto(func(r *rawStage) **float64 { return &r.Alpha }),
	"c":                  numberInto(func(r *rawStage) **float64 { return &r.C }),
	"a":                  numberInto(func(r *rawStage) **float64 { return &r.A }),
	"b":                  numberInto(func(r *rawStage) **float64 { return &r.B }),
	"p":                  numberInto(func(r *rawStage) **float64 { return &r.P }),
	"tr":                 numberInto(func(r *rawStage) **float64 { return &r.TR }),
	"pickup_range_a":     rangeInto(func(r *rawStage) *[]float64 { return &r.PickupRangeA }),
	"multiplier_range":   rangeInto(func(r *rawStage) *[]float64 { return &r.MultiplierRange }),
}

func numberInto(field func(*rawStage) **float64) func(*rawStage, string) error {
	return func(r *rawStage, t string) error {
		v, err := strconv.ParseFloat(t, 64)
		if err != nil {
			return fmt.Errorf("not a number: %q", t)
		}
		*field(r) = &v
		return nil
	}
}

// rangeInto reads "min:max" or "min:max:step".
func rangeInto(field func(*rawStage) *[]float64) func(*rawStage, string) error {
	return func(r *rawStage, t string) error {
		parts := strings.Split(t, ":")
		vals := make([]float64, len(parts))
		for i, p := range parts {
			v, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
			if err != nil {
				return fmt.Errorf("want min:max or min:max:step, got %q", t)
			}
			vals[i] = v
		}
		*field(r) = vals
		return nil
	}
}

// readSettingsCSV adds the stages of the settings table to the relays.
func (b *builder) readSettingsCSV(dir fs.FS, name string, studyLine int) {
	shown := filepath.Join(filepath.Dir(b.file), name) // the path as the user finds it
	if dir == nil {
		b.errorf(studyLine, "", "settings_csv = %q: this study was not read from a folder, so it cannot refer to other files", name)
		return
	}
	data, err := fs.ReadFile(dir, name)
	if err != nil {
		b.errorf(studyLine, "", "settings_csv = %q: %v", name, unwrapPath(err))
		return
	}
	b.st.Inputs = append(b.st.Inputs, coord.NewInputFile(shown, data))
	r := csv.NewReader(bytes.NewReader(data))
	r.TrimLeadingSpace = true
	r.Comment = '#'
	header, err := r.Read()
	if err != nil {
		b.errs = append(b.errs, &Error{File: shown, Line: 1, Msg: "cannot read the header row: " + err.Error()})
		return
	}
	relayCol := -1
	for i, h := range header {
		h = strings.TrimSpace(h)
		header[i] = h
		if h == "relay" {
			relayCol = i
			continue
		}
		if _, ok := csvColumns[h]; !ok {
			b.errs = append(b.errs, &Error{File: shown, Line: 1, Msg: fmt.Sprintf("unknown column %q%s", h, suggestColumn(h))})
		}
	}
	if relayCol < 0 {
		b.errs = append(b.errs, &Error{File: shown, Line: 1, Msg: `the header row needs a "relay" column`})
		return
	}
	relays := map[string]int{}
	for i, o := range b.relayRaw {
		relays[b.st.Devices[o.device].Name] = i
	}
	for {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		line, _ := r.FieldPos(0)
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				line = pe.Line
			}
			b.errs = append(b.errs, &Error{File: shown, Line: line, Msg: err.Error()})
			if pe == nil || !errors.Is(pe.Err, csv.ErrFieldCount) {
				return
			}
			continue
		}
		b.csvRow(shown, line, header, rec, relayCol, relays)
	}
}

// csvRow converts one row into a stage of its relay.
func (b *builder) csvRow(file string, line int, header, rec []string, relayCol int, relays map[string]int) {
	relay := strings.TrimSpace(rec[relayCol])
	w := where{file: file, line: line, element: fmt.Sprintf("relay %q", relay)}
	k, ok := relays[relay]
	if relay == "" {
		w.element = ""
		b.fail(w, "", "the relay cell is empty")
		return
	}
	if !ok {
		b.fail(w, "", "no relay of that name in the study%s", b.closest(relay, b.deviceSeen))
		return
	}
	var rs rawStage
	before := len(b.errs)
	for i, h := range header {
		set, known := csvColumns[h]
		text := strings.TrimSpace(rec[i])
		if i == relayCol || !known || text == "" {
			continue
		}
		if err := set(&rs, text); err != nil {
			b.fail(w, h, "column %s: %v", h, err)
		}
	}
	if len(b.errs) > before {
		return
	}
	o := &b.relayRaw[k]
	if o.tomlStages > 0 {
		b.fail(w, "", "its stages are already given in the study file; give them in one place only")
		return
	}
	o.csvStages++
	d := &b.st.Devices[o.device]
	w.element = fmt.Sprintf("relay %q stage %d", relay, o.csvStages)
	if st, ok := b.stage(w, rs, d.CT); ok {
		d.Stages = append(d.Stages, st)
	}
}

func suggestColumn(h string) string {
	set := map[string]int{"relay": 0}
	for k := range csvColumns {
		set[k] = 0
	}
	return suggest(h, set)
}

// unwrapPath drops the Op/Path wrapping of a file error, which repeats the
// name the message already gives.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
