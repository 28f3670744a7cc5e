package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// europeanFenwick writes the Fenwick Quay example with its settings table
// as a European spreadsheet exports it (semicolons, decimal commas) and
// one figure, T1-HV's TMS, written "0.350": a decimal point or a thousands
// group. It returns the study's path.
func europeanFenwick(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	study, err := os.ReadFile("../../examples/fenwick-quay.toml")
	if err != nil {
		t.Fatal(err)
	}
	table, err := os.ReadFile("../../examples/fenwick-quay-settings.csv")
	if err != nil {
		t.Fatal(err)
	}
	var lines []string
	for _, l := range strings.Split(string(table), "\n") {
		if !strings.HasPrefix(l, "#") {
			l = strings.ReplaceAll(strings.ReplaceAll(l, ",", ";"), ".", ",")
		}
		lines = append(lines, l)
	}
	european := strings.Replace(strings.Join(lines, "\n"), "T1-HV;51;phase;iec-si;250;0,35;", "T1-HV;51;phase;iec-si;250;0.350;", 1)
	if european == strings.Join(lines, "\n") {
		t.Fatal("the T1-HV row was not found")
	}
	os.WriteFile(filepath.Join(dir, "fenwick-quay.toml"), study, 0o644)
	os.WriteFile(filepath.Join(dir, "fenwick-quay-settings.csv"), []byte(european), 0o644)
	return filepath.Join(dir, "fenwick-quay.toml")
}

// TestNotesReachEveryOutput: what the loader assumed about the settings
// table is said on stderr and carried by the table, the JSON, the audit
// report and the test sheet, so a reviewer sees it wherever they look.
func TestNotesReachEveryOutput(t *testing.T) {
	t.Setenv("SOURCE_DATE_EPOCH", "0")
	path := europeanFenwick(t)
	want := `tms "0.350" was read as 0.35`
	out := filepath.Join(filepath.Dir(path), "out")
	code, stdout, stderr := runArgs("check", path, "--format", "json,text", "--out", out, "--report", filepath.Join(out, "audit.html"))
	if code != exitFail { // the example's deliberate mistakes
		t.Fatalf("check: exit %d, %s", code, stderr)
	}
	if !strings.Contains(stderr, "note: ") || !strings.Contains(stderr, want) {
		t.Errorf("stderr does not say what was assumed:\n%s", stderr)
	}
	var doc struct {
		Notes []string `json:"notes"`
	}
	if err := json.Unmarshal([]byte(stdout), &doc); err != nil || len(doc.Notes) != 1 || !strings.Contains(doc.Notes[0], want) {
		t.Errorf("JSON notes %q (%v)", doc.Notes, err)
	}
	for _, name := range []string{"findings.txt", "audit.html"} {
		data, err := os.ReadFile(filepath.Join(out, name))
		if err != nil || !strings.Contains(string(data), strings.ReplaceAll(want, `"`, "&#34;")) && !strings.Contains(string(data), want) {
			t.Errorf("%s does not carry the note (%v)", name, err)
		}
	}
	code, stdout, stderr = runArgs("testsheet", path)
	if code != exitOK || !strings.Contains(stdout, want) || !strings.Contains(stderr, want) {
		t.Errorf("testsheet: exit %d; stdout has the note: %v; stderr:\n%s", code, strings.Contains(stdout, want), stderr)
	}
}
