package study

import (
	"bytes"
	"errors"
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"
)

// What a settings table's bytes are, before any cell is read: spreadsheet
// exports vary by program and by country. Excel's "CSV UTF-8" starts with
// a byte-order mark; in countries that write a decimal comma it separates
// cells with semicolons; its "Unicode text" is UTF-16 with tabs; and a
// workbook saved under a .csv name is a zip archive.

// csvFormat is how a table was read.
type csvFormat struct {
	sep          rune // ',', ';' or '\t'
	decimalComma bool // cells may write 0,1 for 0.1 (only with ';' or tab)
}

func (f csvFormat) sepName() string {
	switch f.sep {
	case ';':
		return "semicolons"
	case '\t':
		return "tabs"
	}
	return "commas"
}

// notText explains why data cannot be a text table, or returns "".
func notText(data []byte) string {
	switch {
	case bytes.HasPrefix(data, []byte{0xFF, 0xFE}), bytes.HasPrefix(data, []byte{0xFE, 0xFF}):
		return "the table is UTF-16 text (Excel's \"Unicode text\"); save it as \"CSV UTF-8\" instead"
	case bytes.HasPrefix(data, []byte("PK\x03\x04")):
		return "the table is a zip archive, most likely a spreadsheet workbook (.xlsx or .ods) under a .csv name; save it as CSV instead"
	}
	if i := bytes.IndexByte(data, 0); i >= 0 {
		return fmt.Sprintf("the table holds binary data (a zero byte at line %d), not text; is it the right file?", 1+bytes.Count(data[:i], []byte{'\n'}))
	}
	if !utf8.Valid(data) {
		for i := 0; i < len(data); {
			r, n := utf8.DecodeRune(data[i:])
			if r == utf8.RuneError && n <= 1 {
				return fmt.Sprintf("line %d is not UTF-8 text (byte 0x%02x); save the table as \"CSV UTF-8\"", 1+bytes.Count(data[:i], []byte{'\n'}), data[i])
			}
			i += n
		}
	}
	return ""
}

// headerLine returns the first line that is neither blank nor a comment,
// with its number, or "" when there is none.
func headerLine(data []byte) (string, int) {
	for n, line := range strings.Split(string(data), "\n") {
		t := strings.TrimSpace(line)
		if t != "" && !strings.HasPrefix(t, "#") {
			return strings.TrimSuffix(line, "\r"), n + 1
		}
	}
	return "", 0
}

// sniff chooses the separator from the header row: the one the header
// uses, or, when it uses several, the one that names more known columns.
// The note says what was assumed when the header left a choice.
func sniff(header string) (f csvFormat, note string) {
	counts := map[rune]int{}
	inQuote := false
	for _, r := range header {
		switch {
		case r == '"':
			inQuote = !inQuote
		case !inQuote && (r == ',' || r == ';' || r == '\t'):
			counts[r]++
		}
	}
	var used []rune
	for _, r := range []rune{',', ';', '\t'} {
		if counts[r] > 0 {
			used = append(used, r)
		}
	}
	switch len(used) {
	case 0:
		return csvFormat{sep: ','}, ""
	case 1:
		return csvFormat{sep: used[0], decimalComma: used[0] != ','}, ""
	}
	best, bestKnown := used[0], -1
	for _, r := range used {
		known := 0
		for _, h := range strings.Split(header, string(r)) {
			if _, ok := csvColumns[strings.TrimSpace(h)]; ok || strings.TrimSpace(h) == "relay" {
				known++
			}
		}
		if known > bestKnown {
			best, bestKnown = r, known
		}
	}
	f = csvFormat{sep: best, decimalComma: best != ','}
	return f, fmt.Sprintf("the header row holds both %s; the table was read as separated by %s", listSeps(used), f.sepName())
}

func listSeps(seps []rune) string {
	names := make([]string, len(seps))
	for i, r := range seps {
		names[i] = map[rune]string{',': "commas", ';': "semicolons", '\t': "tabs"}[r]
	}
	return strings.Join(names, " and ")
}

// errNotNumber and its kin explain a cell that is not a number.
var (
	errNotNumber = errors.New("not a number")
	errNotFinite = errors.New("not a finite number")
)

// cellNumber reads a number as a spreadsheet writes it: digits with an
// optional sign, decimal mark and exponent. A decimal comma is read when
// the table's cells are separated by semicolons or tabs; thousands
// separators, NaN and infinities are refused.
func cellNumber(text string, f csvFormat) (v float64, mark byte, err error) {
	t := text
	if f.decimalComma && strings.Count(t, ",") == 1 && !strings.Contains(t, ".") {
		t = strings.Replace(t, ",", ".", 1)
		mark = ','
	} else if strings.Contains(t, ".") {
		mark = '.'
	}
	if !plainDecimal(t) {
		low := strings.ToLower(strings.TrimLeft(t, "+-"))
		switch {
		case strings.HasPrefix(low, "nan") || strings.HasPrefix(low, "inf"):
			return 0, 0, fmt.Errorf("%w: %q", errNotFinite, clipText(text, maxEchoName))
		case strings.Contains(text, ",") && strings.Contains(text, "."):
			return 0, 0, fmt.Errorf("%w: %q (thousands separators are not read; write the digits only)", errNotNumber, clipText(text, maxEchoName))
		case strings.Contains(text, ",") && !f.decimalComma:
			return 0, 0, fmt.Errorf("%w: %q (a decimal comma in a comma-separated table; write a decimal point, or separate the cells with semicolons)", errNotNumber, clipText(text, maxEchoName))
		}
		return 0, 0, fmt.Errorf("%w: %q", errNotNumber, clipText(text, maxEchoName))
	}
	v, err = strconv.ParseFloat(t, 64)
	if err != nil { // out of range
		return 0, 0, fmt.Errorf("%w: %q", errNotFinite, clipText(text, maxEchoName))
	}
	return v, mark, nil
}

// plainDecimal reports whether s is [+-]digits[.digits][e[+-]digits] with
// digits on at least one side of the point.
func plainDecimal(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i, digits = i+1, digits+1
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i, digits = i+1, digits+1
		}
	}
	if digits == 0 {
		return false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			i++
		}
		exp := 0
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i, exp = i+1, exp+1
		}
		if exp == 0 {
			return false
		}
	}
	return i == len(s)
}

// looksGrouped reports whether a number written with a decimal point
// could be a thousands group instead ("1.200"), which matters in a table
// whose other numbers use a decimal comma.
func looksGrouped(text string) bool {
	t := strings.TrimLeft(text, "+-")
	i := strings.IndexByte(t, '.')
	if i < 1 || i > 3 || len(t)-i-1 != 3 || strings.ContainsAny(t, "eE") {
		return false
	}
	return plainDecimal(t)
}

// csvColumns maps a column name to the raw stage field it fills.
var csvColumns = map[string]func(r *rawStage, text string, c *cellReader) error{
	"label":              func(r *rawStage, t string, _ *cellReader) error { r.Label = t; return nil },
	"measures":           func(r *rawStage, t string, _ *cellReader) error { r.Measures = t; return nil },
	"direction":          func(r *rawStage, t string, _ *cellReader) error { r.Direction = t; return nil },
	"curve":              func(r *rawStage, t string, _ *cellReader) error { r.Curve = t; return nil },
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

// cellReader reads the numbers of one table and remembers which decimal
// marks it met, to say which was assumed where they disagree.
type cellReader struct {
	format     csvFormat
	line       int
	commaCells int      // numbers written with a decimal comma
	grouped    []string // "N: x "1.200" was read as 1.2": line and cell of numbers that may hold a thousands group
	column     string
}

func (c *cellReader) number(text string) (float64, error) {
	v, mark, err := cellNumber(text, c.format)
	if err != nil {
		return 0, err
	}
	switch {
	case mark == ',':
		c.commaCells++
	case mark == '.' && c.format.decimalComma && looksGrouped(text):
		c.grouped = append(c.grouped, fmt.Sprintf("%d: %s %q was read as %s", c.line, c.column, text, gText(v)))
	}
	return v, nil
}

func numberInto(field func(*rawStage) **float64) func(*rawStage, string, *cellReader) error {
	return func(r *rawStage, t string, c *cellReader) error {
		v, err := c.number(t)
		if err != nil {
			return err
		}
		*field(r) = &v
		return nil
	}
}

// rangeInto reads "min:max" or "min:max:step".
func rangeInto(field func(*rawStage) *[]float64) func(*rawStage, string, *cellReader) error {
	return func(r *rawStage, t string, c *cellReader) error {
		parts := strings.Split(t, ":")
		if len(parts) < 2 || len(parts) > 3 {
			return fmt.Errorf("want min:max or min:max:step, got %q", clipText(t, maxEchoName))
		}
		vals := make([]float64, len(parts))
		for i, p := range parts {
			v, err := c.number(strings.TrimSpace(p))
			if err != nil {
				return fmt.Errorf("want min:max or min:max:step of finite numbers, got %q (%v)", clipText(t, maxEchoName), err)
			}
			vals[i] = v
		}
		*field(r) = vals
		return nil
	}
}
