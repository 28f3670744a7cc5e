package study

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"

	"tripgrade/coord"
)

// settingsStudy is a study of two relays whose stages come from the
// settings table named TABLE.
const settingsStudy = `
[study]
name = "settings"
settings_csv = "TABLE"
[[bus]]
name = "A"
kv = 11
[[bus]]
name = "B"
kv = 11
[[source]]
name = "grid"
bus = "A"
sc_mva_max = 200
sc_mva_min = 100
z0_z1 = 1
[[line]]
name = "L1"
from = "A"
to = "B"
type = "cable"
r1_ohm = 0.2
x1_ohm = 0.2
r0_ohm = 0.6
x0_ohm = 0.6
[[relay]]
name = "R1"
branch = "L1"
at = "A"
ct_primary_a = 400
ct_secondary_a = 1
[[relay]]
name = "R2"
branch = "L1"
at = "B"
ct_primary_a = 400
ct_secondary_a = 1
`

func parseWithTable(t *testing.T, table string) (*coord.Study, error) {
	t.Helper()
	dir := fstest.MapFS{"s.csv": {Data: []byte(table)}}
	return Parse("s.toml", []byte(strings.Replace(settingsStudy, "TABLE", "s.csv", 1)), dir)
}

// TestSpreadsheetExports: the same settings read alike from a plain CSV,
// from Excel's "CSV UTF-8" (a byte-order mark, CRLF) and from a European
// export (semicolons, decimal commas).
func TestSpreadsheetExports(t *testing.T) {
	tables := map[string]string{
		"plain":    "relay,measures,curve,pickup_a,tms,delay_s,multiplier_range\nR1,phase,iec-si,300,0.15,,0.05:1:0.05\nR2,ground,definite,40.5,,0.3,\n",
		"bom":      "\ufeffrelay,measures,curve,pickup_a,tms,delay_s,multiplier_range\r\nR1,phase,iec-si,300,0.15,,0.05:1:0.05\r\nR2,ground,definite,40.5,,0.3,\r\n",
		"european": "\ufeffrelay;measures;curve;pickup_a;tms;delay_s;multiplier_range\r\nR1;phase;iec-si;300;0,15;;0,05:1:0,05\r\nR2;ground;definite;40,5;;0,3;\r\n",
	}
	for name, table := range tables {
		s, err := parseWithTable(t, table)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		r1, r2 := s.Devices[0].Stages, s.Devices[1].Stages
		if len(r1) != 1 || len(r2) != 1 || r1[0].Multiplier != 0.15 || r1[0].MultiplierRange != (coord.Range{Min: 0.05, Max: 1, Step: 0.05}) ||
			r2[0].PickupA != 40.5 || r2[0].DelayS != 0.3 || r2[0].Measures != coord.Residual {
			t.Errorf("%s: stages %+v / %+v", name, r1, r2)
		}
		if len(s.Notes) != 0 {
			t.Errorf("%s: notes %q for an unambiguous table", name, s.Notes)
		}
	}
}

// TestAmbiguousTablesSayWhatWasAssumed: a decimal point that could be a
// thousands group, in a table that writes decimal commas, is read as a
// decimal point with a note; a header holding two separators is read by
// the one that names more columns, and the problems found come with a
// note of that choice.
func TestAmbiguousTablesSayWhatWasAssumed(t *testing.T) {
	s, err := parseWithTable(t, "relay;measures;curve;pickup_a;tms\nR1;phase;iec-si;1.200;0,1\nR2;phase;iec-si;300;0,1\n")
	if err != nil {
		t.Fatal(err)
	}
	if p := s.Devices[0].Stages[0].PickupA; p != 1.2 {
		t.Errorf("pickup %g, want 1.2 (a decimal point)", p)
	}
	if len(s.Notes) != 1 || !strings.Contains(s.Notes[0], `s.csv:2: pickup_a "1.200" was read as 1.2`) || !strings.Contains(s.Notes[0], "decimal commas") {
		t.Errorf("notes %q", s.Notes)
	}
	_, err = parseWithTable(t, "relay;measures;curve;pickup_a;tms,\nR1;phase;iec-si;300;0,1\nR2;phase;iec-si;300;0,1\n")
	if err == nil || !strings.Contains(err.Error(), `unknown column "tms,"`) ||
		!strings.Contains(err.Error(), "note: the header row holds both commas and semicolons; the table was read as separated by semicolons") {
		t.Errorf("got %v", err)
	}
	// A quoted comma in a column name is not a separator: no note.
	_, err = parseWithTable(t, "relay;measures;curve;pickup_a;\"tms, IEC\"\nR1;phase;iec-si;300;0,1\n")
	if err == nil || strings.Contains(err.Error(), "note:") {
		t.Errorf("got %v", err)
	}
}

// TestUnreadRowsAreTheCause: a row that cannot be read is reported; its
// relay is not reported again for having no stages.
func TestUnreadRowsAreTheCause(t *testing.T) {
	_, err := parseWithTable(t, "relay,measures,curve,pickup_a,tms\nR1,phase,iec-si,300,0.1\nR2,phase,iec-si,300\n")
	if err == nil || !strings.Contains(err.Error(), "wrong number of fields") || strings.Contains(err.Error(), "no stages") {
		t.Errorf("got %v", err)
	}
	_, err = parseWithTable(t, "relay,measures,curve,pickup_a,tms\nR1,phase,iec-si,300,0.1\n")
	if err == nil || !strings.Contains(err.Error(), `relay "R2": the relay has no stages`) {
		t.Errorf("a relay no row names: got %v", err)
	}
}

// TestTableOutsideTheStudyFolder: settings_csv is a path relative to the
// study's folder, and may leave it or be absolute, as a user typing a
// path expects.
func TestTableOutsideTheStudyFolder(t *testing.T) {
	root := t.TempDir()
	os.MkdirAll(filepath.Join(root, "studies"), 0o755)
	os.MkdirAll(filepath.Join(root, "settings"), 0o755)
	table := "relay,measures,curve,pickup_a,tms\nR1,phase,iec-si,300,0.1\nR2,phase,iec-si,300,0.1\n"
	tablePath := filepath.Join(root, "settings", "relays.csv")
	os.WriteFile(tablePath, []byte(table), 0o644)
	for _, ref := range []string{"../settings/relays.csv", filepath.ToSlash(tablePath)} {
		study := filepath.Join(root, "studies", "s.toml")
		os.WriteFile(study, []byte(strings.Replace(settingsStudy, "TABLE", ref, 1)), 0o644)
		s, err := Load(study)
		if err != nil {
			t.Errorf("settings_csv = %q: %v", ref, err)
			continue
		}
		if len(s.Devices[0].Stages) != 1 {
			t.Errorf("settings_csv = %q: stages %+v", ref, s.Devices[0].Stages)
		}
	}
}
