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
	if code, _, errOut := runArgs("check", "../../testdata/checks/grading.toml", "--out", dir); code != exitFail || errOut != "" {
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
	if code, _, errOut := runArgs("check", "../../examples/kestrel-park.toml", "--out", dir); code != exitOK || errOut != "" {
		t.Fatalf("second run: exit %d, %s", code, errOut)
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
	if err := o.finish(); err != nil {
		t.Fatal(err)
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
