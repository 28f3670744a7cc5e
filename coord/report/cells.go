package report

import (
	"encoding/json"
	"math"
	"strconv"
	"strings"
)

// The cells of CSV and JSON output. A spreadsheet opening a CSV runs a
// cell that starts with =, +, -, @, a tab or a carriage return as a
// formula, so a device named =HYPERLINK(…) would become a live link: text
// cells that could start one get a leading apostrophe, which spreadsheets
// show as text and do not print (the OWASP "CSV injection" advice).
// Numbers are written as numbers; a figure that is not a finite number is
// written as NaN, +Inf or -Inf in CSV and null in JSON, never left out.

// textCell neutralises a text cell that a spreadsheet would run.
func textCell(s string) string {
	t := strings.TrimLeft(s, " \u00a0")
	if t == "" {
		return s
	}
	switch t[0] {
	case '=', '+', '-', '@', '\t', '\r', '\n':
		return "'" + s
	}
	for _, p := range []string{"＝", "＋", "－", "＠"} { // full-width forms some spreadsheets accept
		if strings.HasPrefix(t, p) {
			return "'" + s
		}
	}
	return s
}

// numberCell writes a figure for CSV with six significant digits, and a
// figure that is not a finite number by its name.
func numberCell(v float64) string {
	switch {
	case math.IsNaN(v):
		return "NaN"
	case math.IsInf(v, 1):
		return "+Inf"
	case math.IsInf(v, -1):
		return "-Inf"
	}
	return strconv.FormatFloat(v, 'g', 6, 64)
}

// jsonNumber is a figure in JSON: a number, or null when it is not a
// finite number (JSON has no NaN); the key is kept either way.
type jsonNumber float64

// MarshalJSON implements json.Marshaler.
func (v jsonNumber) MarshalJSON() ([]byte, error) {
	f := float64(v)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return json.Marshal(f)
}

var _ json.Marshaler = jsonNumber(0)

// num returns a pointer to v as a JSON figure.
func num(v float64) *jsonNumber {
	j := jsonNumber(v)
	return &j
}

// fixed formats v with the given number of decimals, switching to four
// significant digits where that would print more than a dozen digits or
// lose the figure altogether, and naming a figure that is not a number.
func fixed(v float64, decimals int) string {
	a := math.Abs(v)
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return strconv.FormatFloat(v, 'g', -1, 64)
	case a >= 1e7 || (a > 0 && a < math.Pow(10, -float64(decimals))):
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	return strconv.FormatFloat(v, 'f', decimals, 64)
}
