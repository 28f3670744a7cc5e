package study

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path/filepath"
	"strings"

	"tripgrade/coord"
)

// Settings tables: a CSV file named by [study] settings_csv, one row per
// stage, for relays whose settings live in a spreadsheet. The first row
// names the columns; "relay" is required, the rest are the stage keys of
// the study file (measures, curve, pickup_a, tms, …) and the setting-range
// columns below. Empty cells are "not given". The table is held to the
// same rules as the study file: every column once, finite numbers only.

// readSettingsCSV adds the stages of the settings table to the relays.
// Whatever stops the table from being read is reported first and alone:
// a relay left without stages by it is not reported again.
func (b *builder) readSettingsCSV(dir fs.FS, name string, studyLine int) {
	shown := name // the path as the user finds it
	if !filepath.IsAbs(name) {
		shown = filepath.Join(filepath.Dir(b.file), name)
	}
	data, ok := b.settingsFile(dir, name, shown, studyLine)
	if !ok {
		b.csvUnread = true
		return
	}
	b.st.Inputs = append(b.st.Inputs, coord.NewInputFile(shown, data))
	tableErr := func(line int, format string, args ...any) {
		b.failures++
		b.errs = append(b.errs, &Error{File: shown, Line: line, Msg: message(format, args...)})
	}
	if why := notText(data); why != "" {
		tableErr(1, "%s", verbatim(why))
		b.csvUnread = true
		return
	}
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	header, headerAt := headerLine(data)
	if header == "" {
		tableErr(1, "the settings table is empty: it needs a header row naming its columns (relay, measures, curve, pickup_a, …) and a row per stage")
		b.csvUnread = true
		return
	}
	format, note := sniff(header)
	if note != "" {
		b.st.Notes = append(b.st.Notes, fmt.Sprintf("%s:%d: %s", shown, headerAt, note))
		// Problems found with that assumption come with it.
		before := b.failures
		defer func() {
			if b.failures > before {
				b.errs = append(b.errs, &Error{File: shown, Line: headerAt, Msg: "note: " + note})
			}
		}()
	}
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma = format.sep
	r.TrimLeadingSpace = true
	r.Comment = '#'
	r.ReuseRecord = false
	cols, ok := b.csvHeader(r, shown, tableErr)
	if !ok {
		b.csvUnread = true
		return
	}
	cells := &cellReader{format: format}
	rows := b.csvRows(r, shown, cols, cells, tableErr)
	if rows == 0 && !b.csvUnread {
		tableErr(headerAt, "the settings table has a header row but no rows of settings")
		b.csvUnread = true
	}
	if len(cells.grouped) > 0 && cells.commaCells > 0 {
		more := ""
		if n := len(cells.grouped) - 1; n > 0 {
			more = fmt.Sprintf(" (and %d more such cells)", n)
		}
		b.st.Notes = append(b.st.Notes, fmt.Sprintf("%s:%s, a decimal point, though the table writes decimal commas elsewhere; if a thousands separator was meant, write the digits only%s",
			shown, cells.grouped[0], more))
	}
}

// settingsFile reads the table, refusing what is not a regular file of a
// sensible size.
func (b *builder) settingsFile(dir fs.FS, name, shown string, studyLine int) ([]byte, bool) {
	if b.csvCache != nil {
		return b.csvCache, true // a scenario's build: the table the study was read with
	}
	studyErr := func(format string, args ...any) {
		b.errorf(studyLine, "[study]", "settings_csv = %q: %s", name, verbatim(fmt.Sprintf(format, args...)))
	}
	if dir == nil {
		studyErr("this study was not read from a folder, so it cannot refer to other files")
		return nil, false
	}
	info, err := fs.Stat(dir, name)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		studyErr("no such file (looked for %s)", shown)
		return nil, false
	case errors.Is(err, fs.ErrInvalid):
		studyErr("this study is built in, so its table must sit beside it")
		return nil, false
	case err != nil:
		studyErr("%v", unwrapPath(err))
		return nil, false
	case info.IsDir():
		studyErr("%s is a folder, not a file", shown)
		return nil, false
	case !info.Mode().IsRegular():
		studyErr("%s is not a regular file", shown)
		return nil, false
	case info.Size() > MaxTableBytes:
		studyErr("the table is %s, more than the %s tripgrade reads", mib(info.Size()), mib(MaxTableBytes))
		return nil, false
	}
	data, err := fs.ReadFile(dir, name)
	if err != nil {
		studyErr("%v", unwrapPath(err))
		return nil, false
	}
	b.csvCache = data
	return data, true
}

// csvColumn is one column of the header: its setting, or none.
type csvColumn struct {
	name string
	set  func(*rawStage, string, *cellReader) error // nil: the relay column or an ignored one
}

// csvHeader reads and checks the header row. ok is false when the rows
// cannot be read with it (no relay column, a column given twice).
func (b *builder) csvHeader(r *csv.Reader, shown string, tableErr func(int, string, ...any)) (cols []csvColumn, ok bool) {
	header, err := r.Read()
	if err != nil {
		tableErr(csvLine(err, 1), "cannot read the header row: %v", csvCause(err))
		return nil, false
	}
	line, _ := r.FieldPos(0)
	ok = true
	seen := map[string]int{}
	relay := false
	b.csvBlamed = map[string]bool{}
	for i, h := range header {
		h = strings.TrimSpace(h)
		c := csvColumn{name: h}
		switch {
		case h == "":
		case h == "relay":
			relay = true
		default:
			set, known := csvColumns[h]
			if !known {
				hint := suggestColumn(h)
				if near := Closest(h, columnNames()); near != "" {
					b.csvBlamed[near] = true
				}
				tableErr(line, "unknown column %q%s", h, hint)
			}
			c.set = set
		}
		if first, dup := seen[h]; dup && h != "" {
			tableErr(line, "column %q is given twice (columns %d and %d); give each setting once", h, first+1, i+1)
			ok = false
		}
		seen[h] = i
		cols = append(cols, c)
	}
	if !relay {
		tableErr(line, `the header row needs a "relay" column naming the relay of each row`)
		ok = false
	}
	return cols, ok
}

// csvLine is the line of a reading error, or def.
func csvLine(err error, def int) int {
	var pe *csv.ParseError
	if errors.As(err, &pe) && pe.Line > 0 {
		return pe.Line
	}
	return def
}

// csvCause drops encoding/csv's own position, which the message gives.
func csvCause(err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// csvRows reads every row and returns how many held settings.
func (b *builder) csvRows(r *csv.Reader, shown string, cols []csvColumn, cells *cellReader, tableErr func(int, string, ...any)) int {
	relays := map[string]int{}
	for i, o := range b.relayRaw {
		relays[b.st.Devices[o.device].Name] = i
	}
	rows := 0
	for {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			return rows
		}
		if err != nil {
			var pe *csv.ParseError
			errors.As(err, &pe)
			tableErr(csvLine(err, 1), "%v", csvCause(err))
			if pe == nil || !errors.Is(pe.Err, csv.ErrFieldCount) {
				b.csvUnread = true
				return rows
			}
			// The row is not read, but its relay is not reported again
			// for having no stages.
			for i, c := range cols {
				if k, ok := relays[cellAt(rec, i)]; ok && c.name == "relay" {
					b.relayRaw[k].csvRows++
				}
			}
			continue
		}
		line, _ := r.FieldPos(0) // Read returned fields, so there is a first one
		if blankRow(rec) {
			continue
		}
		rows++
		cells.line = line
		b.csvRow(shown, line, cols, rec, relays, cells)
	}
}

func cellAt(rec []string, i int) string {
	if i < len(rec) {
		return strings.TrimSpace(rec[i])
	}
	return ""
}

func blankRow(rec []string) bool {
	for _, f := range rec {
		if strings.TrimSpace(f) != "" {
			return false
		}
	}
	return true
}

// csvRow converts one row into a stage of its relay.
func (b *builder) csvRow(file string, line int, cols []csvColumn, rec []string, relays map[string]int, cells *cellReader) {
	relay := ""
	for i, c := range cols {
		if c.name == "relay" {
			relay = strings.TrimSpace(rec[i])
		}
	}
	w := where{file: file, line: line, element: fmt.Sprintf("relay %q", relay)}
	if relay == "" {
		w.element = ""
		b.fail(w, "", "the relay cell is empty")
		return
	}
	k, ok := relays[relay]
	if !ok && b.dropped[relay] {
		return // a relay out of service in the scenario being built
	}
	if !ok {
		// The row was most likely meant for the relay it nearly names:
		// that relay is not reported again for having no stages.
		if near := Closest(visibleOnly(relay), b.relayNames()); near != "" {
			b.relayRaw[relays[near]].csvRows++
		}
		switch {
		case b.blamed["relay"]:
			b.failures++ // the relays could not be read at all
		case hiddenRune(relay) != "":
			b.fail(w, "", "the relay cell contains %s; no relay has that name", hiddenRune(relay))
		default:
			b.fail(w, "", "no relay of that name in the study%s", b.closest(relay, b.deviceSeen))
		}
		return
	}
	o := &b.relayRaw[k]
	o.csvRows++
	var rs rawStage
	before := b.failures
	for i, c := range cols {
		text := strings.TrimSpace(rec[i])
		if c.name == "" && text != "" {
			b.fail(w, "", "a value (%q) in column %d, which has no name in the header", text, i+1)
			continue
		}
		if c.set == nil || text == "" {
			continue
		}
		cells.column = c.name
		if err := c.set(&rs, text, cells); err != nil {
			b.fail(w, c.name, "column %s: %v", c.name, err)
		}
	}
	if b.failures > before {
		return
	}
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

// visibleOnly drops the characters of s that a reader cannot see.
func visibleOnly(s string) string {
	return strings.Map(func(r rune) rune {
		if deceptive(r) != "" {
			return -1
		}
		return r
	}, s)
}

func (b *builder) relayNames() []string {
	names := make([]string, len(b.relayRaw))
	for i, o := range b.relayRaw {
		names[i] = b.st.Devices[o.device].Name
	}
	return names
}

// hiddenRune describes the first character of s that a reader cannot
// see, or returns "".
func hiddenRune(s string) string {
	for _, r := range s {
		if what := deceptive(r); what != "" {
			return fmt.Sprintf("%U, %s", r, what)
		}
	}
	return ""
}

func columnNames() []string {
	names := []string{"relay"}
	for k := range csvColumns {
		names = append(names, k)
	}
	sortStrings(names)
	return names
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
