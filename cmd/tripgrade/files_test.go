package main

import (
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"
)

// TestOutFolderRemovesOnlyItsOwnStaleFiles: a second run into the same
// folder removes the charts of the first that it does not draw again, and
// stale temporary files of ours; the user's own files, a fresh temporary
// file (another run may be writing it) and files not on the list stay.
func TestOutFolderRemovesOnlyItsOwnStaleFiles(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "new", "out")
	if code, _, errOut := runArgs("check", "../../testdata/checks/grading.toml", "--out", dir); code != exitFail || !onlyListed(errOut, "wrote ") {
		t.Fatalf("first run: exit %d, %s", code, errOut)
	}
	first := listDir(t, dir)
	var pairChart string
	for _, n := range first {
		if strings.HasPrefix(n, "pair-") {
			pairChart = n
		}
	}
	if pairChart == "" {
		t.Fatalf("the failing study drew no pair chart: %v", first)
	}
	old := time.Now().Add(-2 * staleAfter)
	plant := map[string]time.Time{
		"notes.txt":                 {},  // the user's
		"pair-X-under-Y.png":        {},  // not on the list: not ours to remove
		".findings.txt.123456.tmp":  old, // ours, left by a killed run
		".findings.txt.654321.tmp":  {},  // ours, but fresh
		".notes.txt.99.tmp":         old, // looks like ours, but for a name we never write
		".findings.txt.12ab34.tmp":  old, // not our pattern
		"path-A--B.png.bak":         {},
		"findings.txt.user-edition": {},
	}
	for n, mtime := range plant {
		p := filepath.Join(dir, n)
		if err := os.WriteFile(p, []byte("x"), 0o644); err != nil {
			t.Fatal(err)
		}
		if !mtime.IsZero() {
			os.Chtimes(p, mtime, mtime)
		}
	}
	code, _, errOut := runArgs("check", "../../examples/kestrel-park.toml", "--out", dir)
	if code != exitOK || !onlyListed(errOut, "wrote ", "removed ") {
		t.Fatalf("second run: exit %d, %s", code, errOut)
	}
	if want := "removed " + filepath.Join(dir, pairChart) + " (written by an earlier run"; !strings.Contains(errOut, want) {
		t.Errorf("the second run does not say it removed the old chart (%q):\n%s", want, errOut)
	}
	after := map[string]bool{}
	for _, n := range listDir(t, dir) {
		after[n] = true
	}
	for _, gone := range []string{pairChart, ".findings.txt.123456.tmp"} {
		if after[gone] {
			t.Errorf("%s is still there", gone)
		}
	}
	for _, kept := range []string{"notes.txt", "pair-X-under-Y.png", ".findings.txt.654321.tmp", ".notes.txt.99.tmp",
		".findings.txt.12ab34.tmp", "path-A--B.png.bak", "findings.txt.user-edition", "findings.txt", manifestName} {
		if !after[kept] {
			t.Errorf("%s was removed", kept)
		}
	}
	list, _ := os.ReadFile(filepath.Join(dir, manifestName))
	if strings.Contains(string(list), pairChart) || !strings.Contains(string(list), "findings.txt") {
		t.Errorf("the list of written files is wrong:\n%s", list)
	}
}

// onlyListed reports whether every line of stderr starts with one of the
// prefixes: the files written or removed, and nothing else.
func onlyListed(stderr string, prefixes ...string) bool {
	for _, line := range strings.Split(strings.TrimSuffix(stderr, "\n"), "\n") {
		ok := false
		for _, p := range prefixes {
			ok = ok || strings.HasPrefix(line, p)
		}
		if !ok {
			return false
		}
	}
	return stderr != ""
}

// TestOutFolderKeepsTrackOfTheReport: an audit report asked for in the
// output folder is one of the run's files, so a later run that writes
// none removes it; a report elsewhere is the user's and stays off the
// list.
func TestOutFolderKeepsTrackOfTheReport(t *testing.T) {
	t.Setenv("SOURCE_DATE_EPOCH", "0")
	root := t.TempDir()
	dir := filepath.Join(root, "out")
	inside, outside := filepath.Join(dir, "review.html"), filepath.Join(root, "review.html")
	for _, r := range []string{inside, outside} {
		code, _, errOut := runArgs("check", "../../examples/kestrel-park.toml", "--out", dir, "--report", r)
		if code != exitOK || strings.Count(errOut, "wrote "+r+"\n") != 1 {
			t.Fatalf("--report %s: exit %d, %s", r, code, errOut)
		}
	}
	list, _ := os.ReadFile(filepath.Join(dir, manifestName))
	if strings.Contains(string(list), "review.html") {
		t.Errorf("the last run wrote its report outside the folder, yet the list has it:\n%s", list)
	}
	if _, err := os.Stat(inside); err == nil {
		t.Errorf("the first run's report %s is still in the folder", inside)
	}
	if _, err := os.Stat(outside); err != nil {
		t.Errorf("the report outside the folder: %v", err)
	}
	code, _, errOut := runArgs("check", "../../examples/kestrel-park.toml", "--out", dir, "--report", inside)
	if list, _ := os.ReadFile(filepath.Join(dir, manifestName)); code != exitOK || !strings.Contains(string(list), "\nreview.html\n") {
		t.Errorf("report in the folder: exit %d, %s; list:\n%s", code, errOut, list)
	}
}

// TestOutFolderListCannotReachOutside: names on a planted list that leave
// the folder, are hidden or are not of a kind tripgrade writes are never
// removed.
func TestOutFolderListCannotReachOutside(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "out")
	os.MkdirAll(dir, 0o755)
	victims := []string{filepath.Join(root, "precious.txt"), filepath.Join(dir, "thesis.docx"), filepath.Join(dir, ".hidden.txt")}
	for _, v := range victims {
		os.WriteFile(v, []byte("x"), 0o644)
	}
	list := "../precious.txt\nthesis.docx\n.hidden.txt\n" + root + "/precious.txt\n"
	os.WriteFile(filepath.Join(dir, manifestName), []byte(list), 0o644)
	o, err := openOutFolder(dir)
	if err != nil {
		t.Fatal(err)
	}
	if gone, err := o.finish(); err != nil || len(gone) > 0 {
		t.Fatalf("removed %v, error %v", gone, err)
	}
	for _, v := range victims {
		if _, err := os.Stat(v); err != nil {
			t.Errorf("%s: %v", v, err)
		}
	}
}

// TestWriteErrorsNameTheUsersPath: a failed write names the file the user
// asked for, not the temporary file behind it.
func TestWriteErrorsNameTheUsersPath(t *testing.T) {
	dir := t.TempDir()
	blocker := filepath.Join(dir, "file")
	os.WriteFile(blocker, []byte("x"), 0o644)
	target := filepath.Join(blocker, "chart.svg")
	err := writeFileAtomic(target, []byte("data"))
	if err == nil || !strings.Contains(err.Error(), "cannot write "+target) || strings.Contains(err.Error(), ".tmp") {
		t.Errorf("got %v, want an error naming %s only", err, target)
	}
}

func listDir(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, e := range entries {
		out = append(out, e.Name())
	}
	sort.Strings(out)
	return out
}

// TestPanicIsOneLine: a bug shows as one line and exit status 3, never as
// a stack trace a pipeline would take for bad input.
func TestPanicIsOneLine(t *testing.T) {
	t.Setenv("TRIPGRADE_TRACE", "")
	var errOut strings.Builder
	code := runGuardedWith(func() int { panic("boom") }, &errOut)
	if code != exitBug || strings.Count(errOut.String(), "\n") != 1 || !strings.Contains(errOut.String(), "internal error") {
		t.Errorf("exit %d, stderr %q", code, errOut.String())
	}
}
