package main

import (
	"encoding/csv"
	"strings"
	"testing"
)

const sheetStudy = "../../testdata/testsheet/relay.toml"

// The sheet in each format is pinned by a golden file; the figures in it
// are checked against IEC 60255-151 in coord/injection_test.go.
func TestTestSheetGolden(t *testing.T) {
	for _, f := range []string{"text", "md", "csv"} {
		code, out, errOut := runArgs("testsheet", sheetStudy, "--format", f)
		if code != exitOK || errOut != "" {
			t.Fatalf("%s: exit %d, stderr %q", f, code, errOut)
		}
		golden(t, "testsheet-relay."+f, out)
	}
}

func TestTestSheetOneDeviceAndMultiples(t *testing.T) {
	_, out, _ := runArgs("testsheet", "../../examples/fenwick-quay.toml", "--device", "FC", "--format", "csv", "--multiples", "3,7", "--instantaneous-multiple", "1.5")
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	// FC has two inverse stages: 2 × 2 injections.
	if len(rows) != 5 {
		t.Fatalf("%d rows, want a header and 4:\n%s", len(rows), out)
	}
	for _, r := range rows[1:] {
		if r[0] != "FC" || (r[6] != "3" && r[6] != "7") {
			t.Errorf("row %v: want relay FC at 3 or 7 ×", r)
		}
	}
	// FC 51: 90 A on a 200/1 A CT is 0.45 A secondary; 3 × is 1.35 A.
	if rows[1][5] != "0.45" || rows[1][8] != "1.35" {
		t.Errorf("FC 51 at 3 ×: setting %s A, injection %s A secondary; want 0.45 and 1.35", rows[1][5], rows[1][8])
	}
}

func TestTestSheetErrors(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"testsheet", sheetStudy, "--device", "FDX"}, `no relay named "FDX"; did you mean "FDR"?`},
		{[]string{"testsheet", sheetStudy, "--format", "pdf"}, "want text, md or csv"},
		{[]string{"testsheet", sheetStudy, "--multiples", "2,x"}, "want numbers above 1"},
		{[]string{"testsheet", sheetStudy, "--multiples", "0.5"}, "above 1"},
		{[]string{"testsheet", "../../testdata/errors/values.toml"}, "problem(s)"},
		{[]string{"testsheet"}, "exactly one study file"},
	} {
		code, _, errOut := runArgs(c.args...)
		if code != exitUsage || !strings.Contains(errOut, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, code, errOut, c.want)
		}
	}
}
