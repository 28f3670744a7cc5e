package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/faults"
)

// hostile is a check result with names that a spreadsheet would run, a
// zero operating time, and figures that are not finite numbers.
func hostile() *Findings {
	x := coord.Finding{Check: coord.Grading, Device: "=HYPERLINK(\"http://x\",\"R1\")", Other: "+SUM(A1)", Stage: "@cmd", Verdict: coord.Fail,
		Measured: 0.1, Required: 0.3, Margin: -0.2, Unit: "s", Relation: "≥", Valid: true,
		Fault: &coord.FaultRef{Kind: faults.LLL, Case: faults.Max, Place: "-bus", DeviceA: 5000, OtherA: 1700, DeviceS: 0, OtherS: 0.1}}
	y := coord.Finding{Check: coord.PrimarySensitivity, Device: "R2", Verdict: coord.Warn, Stage: "ground",
		Measured: math.NaN(), Required: 90, Margin: math.NaN(), Unit: "A", Relation: "≥", Valid: true,
		Fault: &coord.FaultRef{Kind: faults.LG, Case: faults.Min, Place: "B", DeviceA: math.NaN()},
		Note:  "not checked: the measured figure is NaN"}
	return &Findings{Study: "s", Rows: []Row{newRow(&x), newRow(&y)}, Warn: 1, Fail: 1}
}

func TestCSVNeutralisesFormulas(t *testing.T) {
	var b bytes.Buffer
	if err := hostile().WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, row := range rows[1:] {
		for i, cell := range row {
			if cell != "" && strings.ContainsRune("=+@\t\r", rune(cell[0])) {
				t.Errorf("column %s holds %q, which a spreadsheet would run", rows[0][i], cell)
			}
		}
	}
	if got := rows[1][2]; got != "'=HYPERLINK(\"http://x\",\"R1\")" {
		t.Errorf("device cell %q, want the name behind an apostrophe", got)
	}
	if got := rows[1][12]; got != "'-bus" {
		t.Errorf("place cell %q", got)
	}
	// A negative margin is a number, not text: it stays as written.
	if got := rows[1][7]; got != "-0.2" {
		t.Errorf("margin cell %q, want -0.2", got)
	}
}

// TestZeroAndNonFiniteFiguresKept: an operating time of exactly 0 s is a
// value; a figure that is not a finite number is named in CSV and null in
// JSON, and its key is never left out.
func TestZeroAndNonFiniteFiguresKept(t *testing.T) {
	f := hostile()
	var c bytes.Buffer
	if err := f.WriteCSV(&c); err != nil {
		t.Fatal(err)
	}
	rows, _ := csv.NewReader(&c).ReadAll()
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	if got := rows[1][col["device_time_s"]]; got != "0" {
		t.Errorf("device_time_s %q, want 0", got)
	}
	if got := rows[2][col["measured"]]; got != "NaN" {
		t.Errorf("measured %q, want NaN", got)
	}
	if got := rows[2][col["device_current_a"]]; got != "NaN" {
		t.Errorf("device_current_a %q, want NaN", got)
	}
	var j bytes.Buffer
	if err := f.WriteJSON(&j); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Findings []map[string]any `json:"findings"`
	}
	if err := json.Unmarshal(j.Bytes(), &doc); err != nil {
		t.Fatalf("%v\n%s", err, j.String())
	}
	ft := doc.Findings[0]["fault"].(map[string]any)
	if v, ok := ft["device_time_s"]; !ok || v != 0.0 {
		t.Errorf("device_time_s %v (present %v), want 0", v, ok)
	}
	nan := doc.Findings[1]
	for _, k := range []string{"measured", "required", "margin"} {
		if _, ok := nan[k]; !ok {
			t.Errorf("%s left out of the JSON", k)
		}
	}
	if nan["measured"] != nil || nan["required"] != 90.0 {
		t.Errorf("measured %v, required %v; want null and 90", nan["measured"], nan["required"])
	}
	if v, ok := nan["fault"].(map[string]any)["device_current_a"]; !ok || v != nil {
		t.Errorf("device_current_a %v (present %v), want null", v, ok)
	}
}

// TestDigits: figures print with a sensible number of digits, never as
// a 300-digit string or as zero when they are tiny.
func TestDigits(t *testing.T) {
	cases := []struct{ got, want string }{
		{quantity(1e300, "A"), "1e+300 A"},
		{quantity(6.3e-7, "A"), "6.3e-07 A"},
		{quantity(-2, "s"), "−2.000 s"},
		{quantity(0.25, "A"), "0.2 A"},
		{quantity(1e12, "s"), "1e+12 s"},
		{quantity(1234.5678, "s"), "1234.568 s"},
		{quantity(math.NaN(), "A"), "NaN A"},
		{signed(math.Inf(1), "s"), "+Inf s"},
		{amps(0), "0.0"},
		{numberCell(6.3e-7), "6.3e-07"},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("got %q, want %q", c.got, c.want)
		}
	}
}

// TestTestSheetCSVNeutralisesFormulas: the test sheet's CSV holds relay
// names, stage labels and notes from the study; none may reach a
// spreadsheet as a formula. The loader's notes head the text sheet.
func TestTestSheetCSVNeutralisesFormulas(t *testing.T) {
	sheet := &TestSheet{Study: "s", Notes: []string{"settings.csv:1: read with decimal commas"},
		Relays: []SheetRelay{{Name: "=HYPERLINK(\"http://x\")", Rows: []SheetRow{{Stage: "@51", Measures: "phase", Characteristic: "iec-si", Note: "-block 50"}}}}}
	var b bytes.Buffer
	if err := sheet.WriteCSV(&b); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, row := range rows[1:] {
		for i, cell := range row {
			if cell != "" && strings.ContainsRune("=+-@\t\r", rune(cell[0])) {
				t.Errorf("column %s holds %q, which a spreadsheet would run", rows[0][i], cell)
			}
		}
	}
	b.Reset()
	if err := sheet.WriteText(&b); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), "note: settings.csv:1: read with decimal commas") {
		t.Errorf("the text sheet does not carry the loader's note:\n%s", b.String())
	}
}

// A time of over a day (a relay barely above its pickup) keeps four
// significant digits instead of stretching the column with milliseconds;
// shorter times keep the millisecond.
func TestSecondsText(t *testing.T) {
	for v, want := range map[float64]string{0.3: "0.300", 99999.9994: "99999.999", 3500000.229: "3.5e+06", -2.87e7: "-2.87e+07", 12.0: "12.000"} {
		if got := secondsText(v); got != want {
			t.Errorf("secondsText(%g) = %q, want %q", v, got, want)
		}
	}
}
