package tomltext

import (
	"encoding/json"
	"fmt"
	"io/fs"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
)

// The conformance check: the toml-test suite (github.com/toml-lang/toml-test,
// MIT licence), as vendored in the module of github.com/BurntSushi/toml,
// a dependency of this module, so the Go module cache holds it wherever
// the tests build. Every valid document must parse to the JSON the suite
// gives; every invalid one must be refused. The suite's own version file
// (internal/toml-test/version.go in that module) lists which files do not
// apply to TOML 1.1; they are left out here in the same way.
var notFor11 = []string{
	"valid/spec-1.0.0/",
	"invalid/spec-1.0.0/",
	"invalid/datetime/no-secs",
	"invalid/local-time/no-secs",
	"invalid/local-datetime/no-secs",
	"invalid/string/basic-byte-escapes",
	"invalid/inline-table/trailing-comma",
	"invalid/inline-table/linebreak-01",
	"invalid/inline-table/linebreak-02",
	"invalid/inline-table/linebreak-03",
	"invalid/inline-table/linebreak-04",
}

func suiteDir(t *testing.T) string {
	t.Helper()
	out, err := exec.Command("go", "list", "-m", "-f", "{{.Dir}}", "github.com/BurntSushi/toml").Output()
	if err != nil {
		t.Fatalf("finding the toml-test suite: go list: %v", err)
	}
	dir := filepath.Join(strings.TrimSpace(string(out)), "internal", "toml-test", "tests")
	if _, err := os.Stat(dir); err != nil {
		t.Fatalf("the toml-test suite is not where it should be: %v", err)
	}
	return dir
}

func skipped(rel string) bool {
	for _, s := range notFor11 {
		if strings.HasPrefix(rel, s) {
			return true
		}
	}
	return false
}

func suiteFiles(t *testing.T, dir, sub string) []string {
	var files []string
	err := filepath.WalkDir(filepath.Join(dir, sub), func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if strings.HasSuffix(path, ".toml") {
			rel, _ := filepath.Rel(dir, path)
			if !skipped(filepath.ToSlash(rel)) {
				files = append(files, path)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(files) < 100 {
		t.Fatalf("only %d files under %s", len(files), sub)
	}
	return files
}

func TestSuiteValid(t *testing.T) {
	dir := suiteDir(t)
	for _, path := range suiteFiles(t, dir, "valid") {
		rel, _ := filepath.Rel(dir, path)
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		root, err := Parse(src, Limits{})
		if err != nil {
			t.Errorf("%s: refused: %v", rel, err)
			continue
		}
		wantJSON, err := os.ReadFile(strings.TrimSuffix(path, ".toml") + ".json")
		if err != nil {
			t.Fatal(err)
		}
		var want any
		if err := json.Unmarshal(wantJSON, &want); err != nil {
			t.Fatal(err)
		}
		if diff := compare("", want, tableJSON(root)); diff != "" {
			t.Errorf("%s: %s", rel, diff)
		}
	}
}

func TestSuiteInvalid(t *testing.T) {
	dir := suiteDir(t)
	for _, path := range suiteFiles(t, dir, "invalid") {
		rel, _ := filepath.Rel(dir, path)
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := Parse(src, Limits{}); err == nil {
			t.Errorf("%s: accepted, want an error", rel)
		} else if e, ok := err.(*Error); !ok || e.Line < 1 {
			t.Errorf("%s: error %v (%T) without a line", rel, err, err)
		}
	}
}

// tableJSON turns a parsed table into the suite's JSON shape.
func tableJSON(t *Tab) map[string]any {
	m := map[string]any{}
	for _, e := range t.Entries {
		m[e.Key] = valueJSON(e.Value)
	}
	return m
}

func valueJSON(v *Value) any {
	switch v.Kind {
	case Table:
		return tableJSON(v.Table)
	case Array:
		a := []any{}
		for _, it := range v.Items {
			a = append(a, valueJSON(it))
		}
		return a
	case String:
		return map[string]any{"type": "string", "value": v.Str}
	case Integer:
		return map[string]any{"type": "integer", "value": strconv.FormatInt(v.Int, 10)}
	case Float:
		return map[string]any{"type": "float", "value": v.Float}
	case Bool:
		return map[string]any{"type": "bool", "value": strconv.FormatBool(v.Bool)}
	case Datetime:
		return map[string]any{"type": "datetime", "value": v.Str}
	}
	return nil
}

// compare returns "" when have matches want, or where they first differ.
// Floats compare by value (the suite writes them in several forms);
// date-times by kind only, since the suite normalises their text.
func compare(at string, want, have any) string {
	switch w := want.(type) {
	case map[string]any:
		h, ok := have.(map[string]any)
		if !ok {
			return fmt.Sprintf("%s: want a table, have %v", at, have)
		}
		if typ, ok := w["type"].(string); ok && len(w) == 2 {
			return compareScalar(at, typ, w["value"], h)
		}
		if len(w) != len(h) {
			return fmt.Sprintf("%s: want keys %v, have %v", at, keysOf(w), keysOf(h))
		}
		for k, wv := range w {
			hv, ok := h[k]
			if !ok {
				return fmt.Sprintf("%s: key %q missing", at, k)
			}
			if d := compare(at+"."+k, wv, hv); d != "" {
				return d
			}
		}
	case []any:
		h, ok := have.([]any)
		if !ok || len(h) != len(w) {
			return fmt.Sprintf("%s: want a list of %d, have %v", at, len(w), have)
		}
		for i := range w {
			if d := compare(fmt.Sprintf("%s[%d]", at, i), w[i], h[i]); d != "" {
				return d
			}
		}
	}
	return ""
}

func compareScalar(at, typ string, want any, h map[string]any) string {
	ht, _ := h["type"].(string)
	if strings.HasPrefix(typ, "datetime") || strings.HasSuffix(typ, "-local") {
		if ht != "datetime" {
			return fmt.Sprintf("%s: want %s, have %s", at, typ, ht)
		}
		return ""
	}
	if ht != typ {
		return fmt.Sprintf("%s: want %s %v, have %s %v", at, typ, want, ht, h["value"])
	}
	if typ == "float" {
		ws := want.(string)
		wf, err := strconv.ParseFloat(strings.ReplaceAll(ws, "_", ""), 64)
		if err != nil {
			return fmt.Sprintf("%s: cannot read the suite's float %q", at, ws)
		}
		hf := h["value"].(float64)
		if math.IsNaN(wf) != math.IsNaN(hf) || (!math.IsNaN(wf) && wf != hf) {
			return fmt.Sprintf("%s: want %v, have %v", at, wf, hf)
		}
		return ""
	}
	if want != h["value"] {
		return fmt.Sprintf("%s: want %q, have %q", at, want, h["value"])
	}
	return ""
}

func keysOf(m map[string]any) []string {
	var k []string
	for s := range m {
		k = append(k, s)
	}
	sort.Strings(k)
	return k
}
