package main

import (
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"strings"
	"testing"
)

// withoutStages returns a study's text with its [[relay.stage]] tables
// removed (each runs from its header to the next blank line) and its
// settings read from the table csv instead.
func withoutStages(src, csv string) string {
	var out []string
	skip := false
	for _, line := range strings.Split(src, "\n") {
		switch {
		case strings.TrimSpace(line) == "[[relay.stage]]":
			skip = true
			continue
		case strings.TrimSpace(line) == "":
			skip = false
		case skip:
			continue
		}
		out = append(out, line)
		if line == "[study]" {
			out = append(out, fmt.Sprintf("settings_csv = %q", csv))
		}
	}
	return strings.Join(out, "\n")
}

// A proposal holds in every scenario the checker checks, not only as
// drawn: the normally open tie of hand-tie.toml closed makes R1 and R2
// back each other up, and the N-1 outages of n1-mesh.toml move the ring's
// currents. Each proposal's margins name the scenario they come from,
// and its settings table, read back by the study, passes tripgrade check
// in every scenario (exit 0), with no conflict to excuse a failure.
func TestProposeHoldsInEveryScenario(t *testing.T) {
	for _, name := range []string{"hand-tie", "n1-mesh"} {
		t.Run(name, func(t *testing.T) {
			study := filepath.Join("..", "..", "testdata", "scenarios", name+".toml")
			dir := t.TempDir()
			csv := filepath.Join(dir, "proposed.csv")
			code, out, errOut := runArgs("propose", study, "--out", csv)
			if code != exitOK {
				t.Fatalf("propose: exit %d\n%s\n%s", code, out, errOut)
			}
			if strings.Contains(out, "\nCONFLICTS\n") {
				t.Fatalf("propose found conflicts:\n%s", out)
			}
			if !regexp.MustCompile(`in scenario [^,\n]+`).MatchString(out) {
				t.Errorf("no binding margin names a scenario: the scenarios' constraints did not enter the search\n%s", out)
			}
			src, err := os.ReadFile(study)
			if err != nil {
				t.Fatal(err)
			}
			applied := filepath.Join(dir, name+".toml")
			if err := os.WriteFile(applied, []byte(withoutStages(string(src), "proposed.csv")), 0o644); err != nil {
				t.Fatal(err)
			}
			code, out, errOut = runArgs("check", applied)
			if code != exitOK {
				t.Errorf("check of the proposal: exit %d\n%s\n%s", code, errOut, out)
			}
			if !strings.Contains(out, " 0 FAIL: PASS") {
				t.Errorf("check of the proposal does not pass:\n%s", out)
			}
		})
	}
}

// The proposal is the same whatever the number of CPUs: equal
// constraints from different faults or scenarios reach the search in
// the order the checker's workers finish, and the margin printed as
// binding must not depend on it (the Ashcombe ring gives many equal
// ones across its scenarios).
func TestProposeDeterministic(t *testing.T) {
	study := filepath.Join("..", "..", "testdata", "scenarios", "ashcombe-ring.toml")
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	var first string
	for _, n := range []int{1, 2, 4, 8} {
		runtime.GOMAXPROCS(n)
		_, out, _ := runArgs("propose", study)
		if first == "" {
			first = out
			if !strings.Contains(out, "in scenario") {
				t.Fatalf("the proposal names no scenario:\n%s", out)
			}
		} else if out != first {
			t.Errorf("GOMAXPROCS %d: the proposal differs from GOMAXPROCS 1", n)
		}
	}
}
