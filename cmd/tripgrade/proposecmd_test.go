package main

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestProposeFenwickFixesGrading: for the Fenwick Quay example the
// proposal fixes the INC-under-T1-HV grading failure, names the
// MA-R-under-FM failure as a conflict (FM's instantaneous stage, which no
// multiplier moves, operates first), and the proposed settings table,
// read back by the study, passes tripgrade check on every margin but
// that conflict's.
func TestProposeFenwickFixesGrading(t *testing.T) {
	dir := t.TempDir()
	table := filepath.Join(dir, "proposed.csv")
	code, out, errOut := runArgs("propose", "../../examples/fenwick-quay.toml", "--out", table)
	if code != exitFail {
		t.Fatalf("exit %d, want 1 (a conflict remains); stderr %q", code, errOut)
	}
	for _, want := range []string{
		"grading margin  INC      T1-HV    -0.096 s FAIL  +",
		"1. MA-R 51 TMS: the margin asks for at most",
		"grading margin: FM 50 over MA-R by 0.300 s",
		"verified by the checker",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("the table lacks %q:\n%s", want, out)
		}
	}
	if !strings.Contains(errOut, "wrote "+table) {
		t.Errorf("stderr %q: want the table listed", errOut)
	}
	// The study with the proposed table.
	src, err := os.ReadFile("../../examples/fenwick-quay.toml")
	if err != nil {
		t.Fatal(err)
	}
	study := filepath.Join(dir, "fenwick.toml")
	text := strings.Replace(string(src), `settings_csv = "fenwick-quay-settings.csv"`, `settings_csv = "proposed.csv"`, 1)
	if err := os.WriteFile(study, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	_, check, errOut := runArgs("check", study, "--format", "csv")
	rows, err := csv.NewReader(strings.NewReader(check)).ReadAll()
	if err != nil {
		t.Fatalf("%v\n%s", err, errOut)
	}
	conflicts := 0
	for _, r := range rows[1:] {
		if len(r) < 5 || r[1] != "FAIL" {
			continue
		}
		switch r[0] {
		case "grading", "discrimination":
			pair := r[2] + "/" + r[3]
			if pair != "MA-R/FM" && pair != "FM/MA-R" {
				t.Errorf("check on the proposal: %s %s fails", r[0], pair)
			}
			conflicts++
		case "clearing", "inrush", "damage":
			t.Errorf("check on the proposal: %s %s fails", r[0], r[2])
		}
	}
	if conflicts != 2 {
		t.Errorf("%d failing grading and discrimination findings of MA-R and FM, want the conflict's 2", conflicts)
	}
}

// TestProposeArguments: a device to keep that the study lacks, and a
// range that is not one, are command-line errors.
func TestProposeArguments(t *testing.T) {
	for _, args := range [][]string{
		{"propose", "../../examples/fenwick-quay.toml", "--keep", "FMM"},
		{"propose", "../../examples/fenwick-quay.toml", "--tms-range", "1:0.5:0.01"},
		{"propose", "../../examples/fenwick-quay.toml", "--format", "html"},
	} {
		code, _, errOut := runArgs(args...)
		if code != exitUsage || errOut == "" {
			t.Errorf("%v: exit %d, stderr %q; want 2 with a message", args[2:], code, errOut)
		}
	}
	_, _, errOut := runArgs("propose", "../../examples/fenwick-quay.toml", "--keep", "FMM")
	if !strings.Contains(errOut, `did you mean "FM"`) {
		t.Errorf("stderr %q: want a suggestion", errOut)
	}
}

// TestProposeKeep: a kept relay keeps its multipliers.
func TestProposeKeep(t *testing.T) {
	_, out, _ := runArgs("propose", "../../examples/fenwick-quay.toml", "--keep", "T1-HV", "--format", "csv")
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		if r[0] == "multiplier" && r[1] == "T1-HV" {
			t.Errorf("T1-HV is kept, but the proposal sets it: %v", r)
		}
	}
}
