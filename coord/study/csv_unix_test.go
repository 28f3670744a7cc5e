//go:build unix

package study

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestSpecialFilesAreRefused: a settings table that is a folder, a named
// pipe (reading it would wait forever) or larger than the limit is an
// error at the study's line, found without reading it.
func TestSpecialFilesAreRefused(t *testing.T) {
	root := t.TempDir()
	os.Mkdir(filepath.Join(root, "folder.csv"), 0o755)
	fifo := filepath.Join(root, "pipe.csv")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatalf("mkfifo: %v", err)
	}
	for ref, want := range map[string]string{"folder.csv": "is a folder", "pipe.csv": "not a regular file"} {
		study := filepath.Join(root, "s.toml")
		os.WriteFile(study, []byte(strings.Replace(settingsStudy, "TABLE", ref, 1)), 0o644)
		_, err := Load(study)
		if err == nil || !strings.Contains(err.Error(), want) || strings.Contains(err.Error(), "has no stages") {
			t.Errorf("%s: got %v, want %q alone", ref, err, want)
		}
	}
	big := filepath.Join(root, "big.toml")
	os.WriteFile(big, make([]byte, 2000), 0o644)
	if _, err := readLimited(big, 1000); err == nil || !strings.Contains(err.Error(), "more than") {
		t.Errorf("oversized file: %v", err)
	}
	if data, err := readLimited(big, 2000); err != nil || len(data) != 2000 {
		t.Errorf("file at the limit: %d bytes, %v", len(data), err)
	}
}
