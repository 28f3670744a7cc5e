package main

import (
	"encoding/json"
	"strings"
	"testing"
)

// The diff of Fenwick Quay against its corrected settings lists exactly
// the five fixes the example's comments announce, one per relay or stage.
func TestDiffFenwickFixes(t *testing.T) {
	code, out, errOut := runArgs("diff", fenwick, fenwickFixed, "--format", "json")
	if code != exitOK || errOut != "" {
		t.Fatalf("exit %d, stderr %q", code, errOut)
	}
	var doc struct {
		Schema  int `json:"schema_version"`
		Changes []struct {
			Device, Stage, Change string
			Settings              []struct{ Setting, Old, New string }
		} `json:"settings_changed"`
		Findings struct {
			Counts map[string]int `json:"counts"`
			Gating int            `json:"new_or_worse_failures"`
		} `json:"findings"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, c := range doc.Changes {
		var fs []string
		for _, f := range c.Settings {
			fs = append(fs, f.Setting+" "+f.Old+"→"+f.New)
		}
		got = append(got, c.Device+"/"+c.Stage+": "+strings.Join(fs, ", "))
	}
	want := []string{
		"T1-HV/51: TMS 0.35→0.4",                          // graded too closely above the incomer
		"INC/: ct_class C100→C400, ct_burden_ohm 1.8→0.5", // the CT saturated for the maximum fault
		"FM/50: ", // removed: no pickup keeps the instantaneous out of MA-R's zone and sees FM's own faults
		"FB/51: pickup_a 150→160, TMS 0.17→0.2", // off the relay's setting steps
		"FC/51: pickup_a 90→100",                // too close to the load
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("changes:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	// Fixed: the four mistakes, the CT warning, and the two unwanted
	// operations the discrimination check finds for the grading mistakes
	// (T1-HV for INC's faults, FM for MA-R's). Removed: FM's reach finding
	// with its stage, and INC's discrimination finding against FC, which
	// is now against FM (its worst margin, a new PASS).
	if doc.Schema != 1 || doc.Findings.Counts["fixed"] != 7 || doc.Findings.Counts["removed"] != 2 || doc.Findings.Counts["new"] != 1 || doc.Findings.Gating != 0 {
		t.Errorf("findings %+v, want 7 fixed, 2 removed, 1 new and nothing new failing", doc.Findings)
	}
	_, text, _ := runArgs("diff", fenwick, fenwickFixed)
	golden(t, "fenwick-quay.diff.txt", text)
}

func TestDiffExitCodes(t *testing.T) {
	cases := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"itself", []string{"diff", fenwick, fenwick}, exitOK, ""},
		{"back to the mistakes", []string{"diff", fenwickFixed, fenwick}, exitFail, ""},
		{"one file", []string{"diff", fenwick}, exitUsage, "two study files"},
		{"bad study", []string{"diff", fenwick, "../../testdata/errors/values.toml"}, exitUsage, "problem(s)"},
		{"bad format", []string{"diff", fenwick, fenwick, "--format", "csv"}, exitUsage, "want text, md or json"},
	}
	for _, c := range cases {
		code, out, errOut := runArgs(c.args...)
		if code != c.code || !strings.Contains(errOut, c.want) {
			t.Errorf("%s: exit %d, stderr %q; want %d and %q", c.name, code, errOut, c.code, c.want)
		}
		if c.name == "itself" && (!strings.Contains(out, "SETTINGS CHANGED (0)\nno setting changed") || !strings.Contains(out, "no finding changed")) {
			t.Errorf("diff of a study with itself:\n%s", out)
		}
	}
}
