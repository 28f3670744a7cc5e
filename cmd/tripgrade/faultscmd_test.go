package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/golden")

func runArgs(args ...string) (int, string, string) {
	var stdout, stderr bytes.Buffer
	code := run(args, &stdout, &stderr)
	return code, stdout.String(), stderr.String()
}

// golden compares got with a file under testdata/golden, or rewrites it
// with -update.
func golden(t *testing.T, name, got string) {
	t.Helper()
	path := "../../testdata/golden/" + name
	if *update {
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./cmd/tripgrade -update to create it)", err)
	}
	if got != string(want) {
		t.Errorf("output differs from %s; run with -update after checking the difference:\n%s", path, firstDiff(got, string(want)))
	}
}

func firstDiff(a, b string) string {
	la, lb := strings.Split(a, "\n"), strings.Split(b, "\n")
	for i := 0; i < len(la) || i < len(lb); i++ {
		var x, y string
		if i < len(la) {
			x = la[i]
		}
		if i < len(lb) {
			y = lb[i]
		}
		if x != y {
			return fmt.Sprintf("line %d:\n got: %s\nwant: %s", i+1, x, y)
		}
	}
	return ""
}

// TestFaultsExampleGolden pins the fault table of the bundled example and
// checks that two runs give byte-identical output.
func TestFaultsExampleGolden(t *testing.T) {
	for _, format := range []string{"text", "md", "csv", "json"} {
		code, out, errOut := runArgs("faults", "../../examples/kestrel-park.toml", "--format", format)
		if code != exitOK || errOut != "" {
			t.Fatalf("%s: exit %d, stderr %q", format, code, errOut)
		}
		_, again, _ := runArgs("faults", "../../examples/kestrel-park.toml", "--format", format)
		if again != out {
			t.Errorf("%s: two runs differ", format)
		}
		golden(t, "kestrel-park.faults."+format, out)
	}
}

func TestFaultsJSONIsValid(t *testing.T) {
	_, out, _ := runArgs("faults", "../../examples/kestrel-park.toml", "--format", "json")
	var doc struct {
		Devices []map[string]any `json:"devices"`
		Buses   []map[string]any `json:"buses"`
		Caution string           `json:"caution"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Devices) != 14 || len(doc.Buses) != 13 || !strings.Contains(doc.Caution, "qualified") {
		t.Errorf("got %d devices, %d buses, caution %q", len(doc.Devices), len(doc.Buses), doc.Caution)
	}
}

func TestFaultsBadInput(t *testing.T) {
	cases := []struct {
		name string
		args []string
		want string // in stderr
	}{
		{"no file", []string{"faults"}, "give exactly one study file"},
		{"missing file", []string{"faults", "nope.toml"}, "no such file"},
		{"bad format", []string{"faults", "../../examples/kestrel-park.toml", "--format", "xml"}, "want text, md, csv or json"},
		{"unknown flag", []string{"faults", "--colour"}, "unknown flag"},
		{"broken study", []string{"faults", "../../testdata/errors/values.toml"}, "sc_mva_min = 300 is larger than sc_mva_max = 100"},
		{"unknown command", []string{"fualts"}, "unknown command"},
	}
	for _, c := range cases {
		code, out, errOut := runArgs(c.args...)
		if code != exitUsage || out != "" || !strings.Contains(errOut, c.want) {
			t.Errorf("%s: exit %d, stdout %q, stderr %q; want exit 2 and %q", c.name, code, out, errOut, c.want)
		}
	}
}
