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

// TestProposePickupsReadBack: propose --pickups on the hand-derived
// chain writes a settings table with the chosen pickups (the lowest the
// load-margin check admits, coord/propose's TestPickupsLowestAdmissibleHandDerived)
// and multipliers; the study read with it passes tripgrade check.
func TestProposePickupsReadBack(t *testing.T) {
	dir := t.TempDir()
	table := filepath.Join(dir, "proposed.csv")
	code, out, errOut := runArgs("propose", "../../testdata/propose/pickups-chain.toml", "--pickups", "--out", table)
	if code != exitOK {
		t.Fatalf("exit %d, want 0; stderr %q\n%s", code, errOut, out)
	}
	for _, want := range []string{"PICKUPS\n", "R1     51     400 A  460 A", "load margin: 1.25 × 367 A", "2 of 3 pickups"} {
		if !strings.Contains(out, want) {
			t.Errorf("the table lacks %q:\n%s", want, out)
		}
	}
	rows := readCSV(t, table)
	pickups := map[string]string{}
	for _, r := range rows[1:] {
		pickups[r[0]] = r[5]
	}
	for relay, want := range map[string]string{"R1": "460", "R2": "330", "R3": "200"} {
		if pickups[relay] != want {
			t.Errorf("settings table: %s pickup_a %q, want %s", relay, pickups[relay], want)
		}
	}
	src, err := os.ReadFile("../../testdata/propose/pickups-chain.toml")
	if err != nil {
		t.Fatal(err)
	}
	study := filepath.Join(dir, "chain.toml")
	if err := os.WriteFile(study, []byte(withoutStages(string(src), "proposed.csv")), 0o644); err != nil {
		t.Fatal(err)
	}
	code, check, errOut := runArgs("check", study, "--format", "csv")
	if code != exitOK {
		t.Errorf("check on the proposal: exit %d, want 0; stderr %q\n%s", code, errOut, check)
	}
	if !strings.Contains(check, "load,PASS,R1") {
		t.Errorf("check on the proposal: no passing load finding of R1\n%s", check)
	}
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// TestProposePickupsFormats: the pickups appear in every format, with
// the limit that binds each, and the stages left as given are named.
func TestProposePickupsFormats(t *testing.T) {
	for _, c := range []struct {
		format string
		want   []string
	}{
		{"text", []string{"PICKUPS KEPT AS GIVEN", "- R1 51: no pickup_range_a declared", "190 A  20 A (CT) – 190 A (sensitivity)  sensitivity"}},
		{"md", []string{"## Pickups\n", "| R1 | 51N | 60 A | 190 A |", "## Pickups kept as given"}},
		{"csv", []string{"pickup,R1,51N,,pickup_a,60,190,,20–190 A,", "bound by sensitivity: raised from 20 A", "pickup_kept,R2,51,,pickup_a"}},
		{"json", []string{`"pickups": [`, `"new_a": 190`, `"bound_by": "sensitivity"`, `"pickups_kept": [`}},
	} {
		code, out, errOut := runArgs("propose", "../../testdata/propose/pickups-earth.toml", "--pickups", "--format", c.format)
		if code != exitOK {
			t.Errorf("%s: exit %d, stderr %q", c.format, code, errOut)
		}
		for _, w := range c.want {
			if !strings.Contains(out, w) {
				t.Errorf("%s: output lacks %q:\n%s", c.format, w, out)
			}
		}
	}
}

// TestProposePickupsBadInput: --pickups on a study none of whose
// inverse-time stages declares a pickup range, or whose only such relays
// are kept, is a command-line error naming the study and the reason.
func TestProposePickupsBadInput(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"propose", "../../testdata/propose/chain.toml", "--pickups"},
			`--pickups: ../../testdata/propose/chain.toml: no stage's pickup can be chosen: relay "R1" stage 51: no pickup_range_a declared`},
		{[]string{"propose", "../../testdata/propose/pickups-earth.toml", "--pickups", "--keep", "R1,R2"},
			"no stage's pickup can be chosen: the study has no inverse-time stage of a relay that is not kept"},
	} {
		code, out, errOut := runArgs(c.args...)
		if code != exitUsage || !strings.Contains(errOut, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args[1:], code, errOut, c.want)
		}
		if out != "" {
			t.Errorf("%v: printed a proposal:\n%s", c.args[1:], out)
		}
	}
}
