package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/faults"
)

func sample() *Findings {
	x := coord.Finding{Check: coord.Grading, Device: "F|1 <script>", Other: "*T1*_[x](y)`", Verdict: coord.Fail,
		Measured: 0.21, Required: 0.3, Margin: -0.09, Unit: "s", Relation: "≥", Valid: true,
		Fault: &coord.FaultRef{Kind: faults.LL, Case: faults.Max, Place: "bus <B>", DeviceA: 5000, OtherA: 1700, DeviceS: 0.4, OtherS: 0.61}}
	y := coord.Finding{Check: coord.LoadMargin, Device: "R2", Verdict: coord.Warn, Note: "not checked: no load"}
	return &Findings{Study: "a | b <i>", Rows: []Row{newRow(&x), newRow(&y)}, Pass: 0, Warn: 1, Fail: 1}
}

// TestMarkdownEscapesUserText: names from the study must not break the
// table or inject markup into a rendered page.
func TestMarkdownEscapesUserText(t *testing.T) {
	var b bytes.Buffer
	if err := sample().WriteMarkdown(&b); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, bad := range []string{"<script>", "<i>", "<B>", "F|1", "*T1*", "_[x]", "(y)`"} {
		if strings.Contains(out, bad) {
			t.Errorf("Markdown carries %q unescaped:\n%s", bad, out)
		}
	}
	for _, good := range []string{`F\|1 &lt;script&gt;`, `\*T1\*\_\[x\](y)` + "\\`", "**FAIL**"} {
		if !strings.Contains(out, good) {
			t.Errorf("Markdown lacks %q:\n%s", good, out)
		}
	}
}

// TestMachineFormatsCarryTheFigures: CSV and JSON hold the same numbers
// as the text, with units in the field names.
func TestMachineFormatsCarryTheFigures(t *testing.T) {
	f := sample()
	rows, col := findingsCSV(t, f)
	if len(rows) != 3 || rows[1][0] != "grading" || rows[1][1] != "FAIL" || rows[1][5] != "0.21" || rows[1][col["device_current_a"]] != "5000" {
		t.Errorf("CSV rows %q", rows)
	}
	var j bytes.Buffer
	if err := f.WriteJSON(&j); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Caution  string `json:"caution"`
		Findings []struct {
			Verdict  string   `json:"verdict"`
			Measured *float64 `json:"measured"`
			Fault    *struct {
				DeviceA float64 `json:"device_current_a"`
				DeviceS float64 `json:"device_time_s"`
			} `json:"fault"`
		} `json:"findings"`
	}
	if err := json.Unmarshal(j.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Caution != Caution || len(doc.Findings) != 2 || *doc.Findings[0].Measured != 0.21 ||
		doc.Findings[0].Fault.DeviceA != 5000 || doc.Findings[0].Fault.DeviceS != 0.4 || doc.Findings[1].Measured != nil {
		t.Errorf("JSON %s", j.String())
	}
}

func TestTextEndsWithVerdictAndCaution(t *testing.T) {
	var b bytes.Buffer
	if err := sample().WriteText(&b); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimRight(b.String(), "\n"), "\n")
	if got := lines[len(lines)-2]; got != "0 PASS, 1 WARN, 1 FAIL: FAIL" {
		t.Errorf("summary line %q", got)
	}
	if lines[len(lines)-1] != Caution {
		t.Errorf("last line %q, want the caution", lines[len(lines)-1])
	}
}

// findingsCSV writes f's findings as CSV and reads them back: the rows,
// and each column's index by its header.
func findingsCSV(t *testing.T, f *Findings) ([][]string, map[string]int) {
	t.Helper()
	var c bytes.Buffer
	if err := f.WriteCSV(&c); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&c).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	return rows, col
}
