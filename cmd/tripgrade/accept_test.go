package main

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// withAccepts copies a study into a temporary folder with extra TOML
// appended and returns the copy's path and the line the extra starts on.
func withAccepts(t *testing.T, study, extra string) (string, int) {
	t.Helper()
	src, err := os.ReadFile(study)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), filepath.Base(study))
	text := strings.TrimRight(string(src), "\n") + "\n\n"
	if err := os.WriteFile(path, []byte(text+extra), 0o644); err != nil {
		t.Fatal(err)
	}
	return path, strings.Count(text, "\n") + 1
}

const loadFails = "../../testdata/checks/load.toml" // only R2's load margin fails

// An accepted FAIL shows as ACCEPTED with its reason, is counted apart
// and does not fail the exit code.
func TestAcceptedFailDoesNotFail(t *testing.T) {
	path, _ := withAccepts(t, loadFails, `[[accept]]
check = "load"
device = "R2"
reason = "load figure is the winter peak; <script>x</script> reviewed"
by = "K. Osei"
date = "2026-11-30"
`)
	code, out, errOut := runArgs("check", path)
	if code != exitOK || errOut != "" {
		t.Fatalf("exit %d (want 0), stderr %q", code, errOut)
	}
	for _, want := range []string{"ACCEPTED  R2", "FAIL accepted by K. Osei on 2026-11-30: load figure is the winter peak", ", 0 FAIL, 1 ACCEPTED: PASS with accepted findings"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	_, md, _ := runArgs("check", path, "--format", "md")
	if !strings.Contains(md, "**ACCEPTED**") || strings.Contains(md, "<script>") {
		t.Errorf("Markdown: no ACCEPTED row, or the reason not escaped:\n%s", md)
	}
}

// An acceptance that covers nothing is an error with its line: one that
// names no finding, and one whose finding now passes.
func TestStaleAcceptancesAreErrors(t *testing.T) {
	cases := []struct {
		name, entry, want string
	}{
		{"no such finding", "check = \"damage\"\ndevice = \"R1\"\n", "accept 1 (check \"damage\", device \"R1\"): matches no finding"},
		{"finding passes", "check = \"load\"\ndevice = \"R1\"\n", "accept 1 (check \"load\", device \"R1\"): matches only findings that pass"},
		{"wrong stage", "check = \"load\"\ndevice = \"R2\"\nstage = \"ground\"\n", "accept 1 (check \"load\", device \"R2\", stage \"ground\"): matches no finding"},
	}
	for _, c := range cases {
		path, line := withAccepts(t, loadFails, "[[accept]]\n"+c.entry+"reason = \"r\"\nby = \"b\"\ndate = \"2026-01-02\"\n")
		code, out, errOut := runArgs("check", path)
		wantErr := path + ":" + strconv.Itoa(line) + ": " + c.want
		if code != exitUsage || out != "" || !strings.Contains(errOut, wantErr) {
			t.Errorf("%s: exit %d, stdout %q, stderr %q; want exit 2 and %q", c.name, code, out, errOut, wantErr)
		}
	}
}
