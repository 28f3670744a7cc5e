package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// TestCheckExamplesGolden pins the findings tables of both bundled
// examples (text and Markdown) and their exit codes: the passing study
// exits 0, the one with mistakes 1.
func TestCheckExamplesGolden(t *testing.T) {
	cases := []struct {
		study string
		code  int
	}{
		{"kestrel-park", exitOK},
		{"fenwick-quay", exitFail},
	}
	for _, c := range cases {
		for _, f := range []struct{ format, ext string }{{"text", "txt"}, {"md", "md"}} {
			code, out, errOut := runArgs("check", "../../examples/"+c.study+".toml", "--format", f.format)
			if code != c.code || errOut != "" {
				t.Fatalf("%s %s: exit %d (want %d), stderr %q", c.study, f.format, code, c.code, errOut)
			}
			golden(t, c.study+".check."+f.ext, out)
		}
	}
}

// TestCheckFindsTheExampleMistakes: the study with mistakes fails exactly
// the checks its comments announce.
func TestCheckFindsTheExampleMistakes(t *testing.T) {
	_, out, _ := runArgs("check", "../../examples/fenwick-quay.toml", "--format", "csv")
	rows, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]bool{}
	for _, r := range rows[1:] {
		if r[1] == "FAIL" || r[1] == "WARN" {
			got[r[1]+" "+r[0]+" "+r[2]+" "+r[4]] = true
		}
	}
	want := []string{
		"FAIL grading INC ",               // the incomer and T1-HV graded too closely for LL faults
		"FAIL grading MA-R ",              // FM's instantaneous trips first in MA-R's zone
		"FAIL load FC phase",              // pickup too close to the load
		"FAIL instantaneous_reach FM 50",  // FM's instantaneous overreaches
		"FAIL settings FB 51",             // off the relay's setting steps
		"WARN settings INC CT saturation", // C100 with 1.8 Ω cannot carry the maximum fault
		// 11 kV earth faults are left to standby earth-fault protection,
		// which the study declares but does not model.
		"WARN primary_sensitivity T1-HV every kind",
		// The same earth faults, on the transformer's LV terminals, are
		// left to that relay by the fault-clearing check too.
		"WARN clearing T1 ",
		// The grading mistakes seen fault by fault: T1-HV operates for a
		// fault INC must clear, FM for one MA-R must clear.
		"FAIL discrimination T1-HV ",
		"FAIL discrimination FM ",
	}
	for _, w := range want {
		if !got[w] {
			t.Errorf("missing finding %q", w)
		}
		delete(got, w)
	}
	for g := range got {
		t.Errorf("unexpected finding %q", g)
	}
}

func TestCheckOutDir(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	code, out, errOut := runArgs("check", "../../examples/kestrel-park.toml", "--format", "text,md,csv,json", "--out", dir)
	if code != exitOK {
		t.Fatalf("exit %d, stderr %q", code, errOut)
	}
	// Every file in the folder is listed on stderr, and nothing else is,
	// but for the hidden list of the files written (outFolder).
	entries, _ := os.ReadDir(dir)
	var listed []string
	for _, e := range entries {
		if e.Name() != manifestName {
			listed = append(listed, "wrote "+filepath.Join(dir, e.Name()))
		}
	}
	gotList := strings.Split(strings.TrimSuffix(errOut, "\n"), "\n")
	sort.Strings(gotList)
	if strings.Join(gotList, "\n") != strings.Join(listed, "\n") {
		t.Errorf("stderr lists\n%s\nwant\n%s", strings.Join(gotList, "\n"), strings.Join(listed, "\n"))
	}
	for _, name := range []string{"findings.txt", "findings.md", "findings.csv", "findings.json"} {
		data, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		if name == "findings.txt" && string(data) != out {
			t.Errorf("findings.txt differs from the printed table")
		}
		if name == "findings.json" {
			var doc struct {
				Summary struct{ Fail int } `json:"summary"`
				Caution string             `json:"caution"`
			}
			if err := json.Unmarshal(data, &doc); err != nil || doc.Caution == "" {
				t.Errorf("findings.json: %v, caution %q", err, doc.Caution)
			}
		}
	}
	for _, e := range entries {
		if strings.HasSuffix(e.Name(), ".tmp") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}

func TestCheckExitCodes(t *testing.T) {
	cases := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"passing", []string{"check", "../../examples/kestrel-park.toml"}, exitOK, ""},
		{"strict with no warning", []string{"check", "../../testdata/checks/pass.toml", "--strict"}, exitOK, ""},
		{"strict with warnings", []string{"check", "../../testdata/checks/fuse-range.toml", "--strict"}, exitFail, ""},
		{"warnings without strict", []string{"check", "../../testdata/checks/fuse-range.toml"}, exitOK, ""},
		{"failing", []string{"check", "../../testdata/checks/grading.toml"}, exitFail, ""},
		{"bad study", []string{"check", "../../testdata/errors/references.toml"}, exitUsage, "no bus of that name"},
		{"bad format", []string{"check", "../../examples/kestrel-park.toml", "--format", "pdf"}, exitUsage, "want text, md, csv or json"},
		{"two files", []string{"check", "a.toml", "b.toml"}, exitUsage, "exactly one study file"},
		{"demo", []string{"demo"}, exitFail, ""},
		{"demo passing example", []string{"demo", "--example", "kestrel-park"}, exitOK, ""},
		{"demo unknown example", []string{"demo", "--example", "atlantis"}, exitUsage, "no example"},
	}
	for _, c := range cases {
		code, _, errOut := runArgs(c.args...)
		if code != c.code || !strings.Contains(errOut, c.want) {
			t.Errorf("%s: exit %d, stderr %q; want exit %d and %q", c.name, code, errOut, c.code, c.want)
		}
	}
}

// TestDemoMatchesCheck: the embedded example gives the same table as
// checking the file on disk.
func TestDemoMatchesCheck(t *testing.T) {
	_, demo, _ := runArgs("demo")
	_, check, _ := runArgs("check", "../../examples/fenwick-quay.toml")
	if demo != check {
		t.Errorf("demo and check of the same study differ:\n%s", firstDiff(demo, check))
	}
}

// Standard output is buffered; a table that cannot be written in full
// (here into a pipe nobody reads) must not leave the verdict's exit
// status behind: the command says so and exits 2.
func TestUnwritableOutputIsAnError(t *testing.T) {
	r, w, err := os.Pipe()
	if err != nil {
		t.Fatal(err)
	}
	r.Close()
	defer w.Close()
	var errOut bytes.Buffer
	code := runBuffered([]string{"check", "../../examples/kestrel-park.toml"}, w, &errOut)
	if code != exitUsage || !strings.Contains(errOut.String(), "writing the output") {
		t.Fatalf("exit %d, stderr %q; want exit %d naming the failed write", code, errOut.String(), exitUsage)
	}
	var ok bytes.Buffer
	f, err := os.CreateTemp(t.TempDir(), "out")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if code := runBuffered([]string{"check", "../../examples/kestrel-park.toml"}, f, &ok); code != exitOK {
		t.Fatalf("into a file: exit %d, stderr %q; want %d", code, ok.String(), exitOK)
	}
	_, want, _ := runArgs("check", "../../examples/kestrel-park.toml")
	got, err := os.ReadFile(f.Name())
	if err != nil || string(got) != want {
		t.Fatalf("into a file: %d bytes written (%v), want the %d of the table", len(got), err, len(want))
	}
}
