package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const (
	fenwick      = "../../examples/fenwick-quay.toml"
	fenwickFixed = "../../testdata/fenwick-fixed/fenwick-quay.toml" // the five mistakes corrected
)

// baselineOf writes the findings JSON of a study to a temporary file.
func baselineOf(t *testing.T, study string) string {
	t.Helper()
	_, out, errOut := runArgs("check", study, "--format", "json")
	if errOut != "" {
		t.Fatalf("%s: %s", study, errOut)
	}
	path := filepath.Join(t.TempDir(), "baseline.json")
	if err := os.WriteFile(path, []byte(out), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

type jsonReport struct {
	Schema   int `json:"schema_version"`
	Findings []struct {
		Check, Verdict, Device, Other, Stage string
	} `json:"findings"`
	Scope *struct {
		Devices []string `json:"devices"`
		Backups []string `json:"backups"`
		LeftOut int      `json:"left_out"`
	} `json:"scope"`
	Baseline *struct {
		Counts  map[string]int `json:"counts"`
		Gating  int            `json:"new_or_worse_failures"`
		Changes []struct {
			Change, Check, Device string
		} `json:"changes"`
	} `json:"baseline"`
}

func checkJSON(t *testing.T, args ...string) (int, jsonReport) {
	t.Helper()
	code, out, errOut := runArgs(append(append([]string{"check"}, args...), "--format", "json")...)
	var doc jsonReport
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("%v: %v (stderr %q)", args, err, errOut)
	}
	return code, doc
}

// A study compared with its own earlier run shows no change, and with
// --fail-on new its known failures do not fail the gate.
func TestBaselineOfItselfShowsNoChange(t *testing.T) {
	base := baselineOf(t, fenwick)
	code, doc := checkJSON(t, fenwick, "--baseline", base, "--fail-on", "new")
	if doc.Schema != 1 || doc.Baseline == nil {
		t.Fatalf("schema_version %d, baseline %v", doc.Schema, doc.Baseline)
	}
	if len(doc.Baseline.Changes) != 0 || doc.Baseline.Counts["same"] != len(doc.Findings) || doc.Baseline.Gating != 0 {
		t.Errorf("self-comparison: %+v", doc.Baseline)
	}
	if code != exitOK {
		t.Errorf("--fail-on new against itself: exit %d, want 0", code)
	}
	if code, _ := checkJSON(t, fenwick, "--baseline", base); code != exitFail {
		t.Errorf("--fail-on any (default): exit %d, want 1", code)
	}
}

// The corrected settings against the baseline with mistakes: exactly
// the findings the mistakes caused (and the CT warning) are fixed, but for
// FM's reach finding, which goes with the instantaneous stage removed;
// the reverse makes them new or worse failures, which fail the gate.
func TestBaselineFixedAndWorse(t *testing.T) {
	_, doc := checkJSON(t, fenwickFixed, "--baseline", baselineOf(t, fenwick))
	var fixed []string
	for _, c := range doc.Baseline.Changes {
		if c.Change == "fixed" {
			fixed = append(fixed, c.Check+" "+c.Device)
		}
	}
	// The discrimination findings are the grading mistakes seen fault by
	// fault (T1-HV operating for INC's faults, FM for MA-R's).
	want := "discrimination T1-HV, discrimination FM, grading INC, grading MA-R, load FC, settings INC, settings FB"
	if strings.Join(fixed, ", ") != want {
		t.Errorf("fixed: %s\nwant:  %s", strings.Join(fixed, ", "), want)
	}
	code, back := checkJSON(t, fenwick, "--baseline", baselineOf(t, fenwickFixed), "--fail-on", "new")
	if code != exitFail || back.Baseline.Gating != 7 {
		t.Errorf("mistakes against the corrected baseline: exit %d, %d new or worse failures; want 1 and 7", code, back.Baseline.Gating)
	}
}

func TestBaselineErrors(t *testing.T) {
	dir := t.TempDir()
	noSchema := filepath.Join(dir, "old.json")
	os.WriteFile(noSchema, []byte(`{"findings": []}`), 0o644)
	future := filepath.Join(dir, "future.json")
	os.WriteFile(future, []byte(`{"schema_version": 99, "findings": []}`), 0o644)
	cases := []struct {
		name string
		args []string
		want string
	}{
		{"no schema_version", []string{"--baseline", noSchema}, "no schema_version"},
		{"newer schema", []string{"--baseline", future}, "schema_version 99"},
		{"missing file", []string{"--baseline", filepath.Join(dir, "none.json")}, "no such file"},
		{"fail-on new without baseline", []string{"--fail-on", "new"}, "--fail-on new needs --baseline"},
		{"bad fail-on", []string{"--fail-on", "some"}, `--fail-on "some"`},
		{"unknown scope", []string{"--scope", "FM,NOWHERE"}, `no relay, fuse, line or transformer named "NOWHERE"`},
	}
	for _, c := range cases {
		code, _, errOut := runArgs(append([]string{"check", fenwick}, c.args...)...)
		if code != exitUsage || !strings.Contains(errOut, c.want) {
			t.Errorf("%s: exit %d, stderr %q; want 2 and %q", c.name, code, errOut, c.want)
		}
	}
}

// A scoped run of one feeder holds only the findings of its devices and
// of the pairs with their backups, all of them, and says what it left out.
func TestScopeOneFeeder(t *testing.T) {
	_, full := checkJSON(t, fenwick)
	code, doc := checkJSON(t, fenwick, "--scope", "FM-CABLE-1")
	if doc.Scope == nil || strings.Join(doc.Scope.Devices, ",") != "FM,MA-R" || strings.Join(doc.Scope.Backups, ",") != "INC" {
		t.Fatalf("scope %+v, want devices FM, MA-R and backup INC", doc.Scope)
	}
	feeder := map[string]bool{"FM": true, "MA-R": true}
	for _, f := range doc.Findings {
		if f.Check == "clearing" {
			// About an element of the feeder, cleared by its devices.
			if !feeder[f.Other] {
				t.Errorf("clearing finding not cleared by the feeder: %+v", f)
			}
			continue
		}
		if !feeder[f.Device] && !feeder[f.Other] {
			t.Errorf("finding outside the feeder: %+v", f)
		}
		if !feeder[f.Device] && f.Device != "INC" {
			t.Errorf("finding of a device neither in the feeder nor its backup: %+v", f)
		}
	}
	want := 0
	for _, f := range full.Findings {
		if feeder[f.Device] || feeder[f.Other] {
			want++
		}
	}
	if len(doc.Findings) != want || doc.Scope.LeftOut != len(full.Findings)-want {
		t.Errorf("kept %d findings, left out %d; want %d and %d", len(doc.Findings), doc.Scope.LeftOut, want, len(full.Findings)-want)
	}
	if code != exitFail {
		t.Errorf("FM feeder (two failures): exit %d, want 1", code)
	}
	// A feeder without failures passes the gate though the study fails.
	if code, doc := checkJSON(t, fenwick, "--scope", "BY-TX"); code != exitOK || len(doc.Findings) == 0 {
		t.Errorf("BY-TX: exit %d with %d findings, want 0 and some", code, len(doc.Findings))
	}
	_, out, _ := runArgs("check", fenwick, "--scope", "FM")
	if !strings.Contains(out, "scope FM: the findings of FM, and of the pairs with their backups (INC)") || !strings.Contains(out, "left out: ") {
		t.Errorf("text header does not say the scope:\n%s", out[:400])
	}
}
