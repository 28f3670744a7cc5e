package coord_test

import (
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/faults"
	"tripgrade/faults/numpytest"
)

// The direction and discrimination tests take their expected figures
// from testdata/discrimination/handcheck.py, an independent numpy
// computation of each small network by symmetrical components (its
// docstring names the sources). handFigures (handfigures_test.go, written
// by the script's --go mode) embeds them so that the tests run without
// Python; TestHandcheckScript runs the script and asks that its output
// and the embedded table agree, so neither drifts.

const (
	// handRel is the agreement asked of the engine and the checker against
	// the script: the two solve the same equations by different routes
	// (sparse LDLᵀ and bus-impedance rules against dense inverses with the
	// fault node inserted), so they differ only by rounding.
	handRel = 1e-6
	// handAbs is the absolute floor for figures that are zero or nearly
	// (angles near 0°, margins of 0 s, rounding residue of a current that
	// is zero), in the figure's own unit.
	handAbs = 1e-6
	// handScript is the script, relative to this package.
	handScript = "../testdata/discrimination/handcheck.py"
)

// hand returns an embedded figure of the script, failing the test when
// the script gives none of that name.
func hand(t *testing.T, key string) float64 {
	t.Helper()
	v, ok := handFigures[key]
	if !ok {
		t.Fatalf("handcheck.py gives no figure %q", key)
	}
	return v
}

// agrees reports whether got matches the script's want.
func agrees(got, want float64) bool {
	return math.Abs(got-want) <= math.Max(handAbs, handRel*math.Max(math.Abs(got), math.Abs(want)))
}

// TestHandcheckScript runs testdata/discrimination/handcheck.py and checks
// that it gives exactly the figures handfigures_test.go embeds.
func TestHandcheckScript(t *testing.T) {
	crossRun(t, handScript, handFigures, "handfigures_test.go")
}

// crossRun runs a hand-figure script with numpy's interpreter and checks
// that it gives exactly the figures embedded (from file), no more and no
// fewer.
func crossRun(t *testing.T, script string, embedded map[string]float64, file string) {
	t.Helper()
	py := numpytest.Interpreter(t, filepath.Base(script), "numpy")
	out, err := exec.Command(py, script).Output()
	if err != nil {
		msg := ""
		if ee, ok := err.(*exec.ExitError); ok {
			msg = string(ee.Stderr)
		}
		t.Fatalf("%s %s: %v\n%s", py, script, err, msg)
	}
	var got map[string]float64
	if err := json.Unmarshal(out, &got); err != nil {
		t.Fatalf("%s output: %v", script, err)
	}
	keys := make([]string, 0, len(got))
	for k := range got {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		want, ok := embedded[k]
		switch {
		case !ok:
			t.Errorf("%s: the script gives %g, the embedded table nothing (regenerate %s with %s --go)", k, got[k], file, script)
		case !agrees(got[k], want):
			t.Errorf("%s: the script gives %.12g, the embedded table %.12g", k, got[k], want)
		}
	}
	for k := range embedded {
		if _, ok := got[k]; !ok {
			t.Errorf("%s: embedded but the script no longer gives it", k)
		}
	}
}

// loadVariant loads a study file with some text replaced (each old text
// must be there).
func loadVariant(t *testing.T, path string, replace ...string) *coord.Study {
	t.Helper()
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	text := string(src)
	for i := 0; i+1 < len(replace); i += 2 {
		if !strings.Contains(text, replace[i]) {
			t.Fatalf("%s has no %q", path, replace[i])
		}
		text = strings.ReplaceAll(text, replace[i], replace[i+1])
	}
	s, err := study.Parse(filepath.Base(path), []byte(text), nil)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// busIndex and branchIndex find a network element by name.
func busIndex(t *testing.T, n *faults.Network, name string) int {
	t.Helper()
	for i, b := range n.Buses {
		if b.Name == name {
			return i
		}
	}
	t.Fatalf("no bus %q", name)
	return -1
}

func branchIndex(t *testing.T, n *faults.Network, name string) int {
	t.Helper()
	for b := 0; b < n.BranchCount(); b++ {
		if n.BranchName(b) == name {
			return b
		}
	}
	t.Fatalf("no branch %q", name)
	return -1
}

// device returns a study's device by name.
func device(t *testing.T, s *coord.Study, name string) *coord.Device {
	t.Helper()
	for i := range s.Devices {
		if s.Devices[i].Name == name {
			return &s.Devices[i]
		}
	}
	t.Fatalf("no device %q", name)
	return nil
}

// seenFor returns what device d sees for a fault, by the route the
// fault-by-fault pass takes (coord's view.seen): the point's response to
// the fault place, its currents and its bus voltages for the fault of
// that kind with the study's fault impedance for the case, and the
// pre-fault voltages.
func seenFor(t *testing.T, eng *faults.Engine, d *coord.Device, place faults.Place, kind faults.Kind, cs faults.Case) coord.Seen {
	t.Helper()
	sol, err := eng.Solve(eng.CaseFault(place, kind, cs))
	if err != nil {
		t.Fatal(err)
	}
	r := sol.Response(d.Point)
	return coord.NewSeen(r.Currents(sol), r.Voltages(sol), r.Prefault())
}

// oneFinding returns the finding of a check for a device, failing when
// there is not exactly one.
func oneFinding(t *testing.T, r *coord.Result, check coord.CheckKind, device string) coord.Finding {
	t.Helper()
	var out []coord.Finding
	for _, f := range r.Findings {
		if f.Check == check && f.Device == device {
			out = append(out, f)
		}
	}
	if len(out) != 1 {
		t.Fatalf("%d %s findings for %s, want 1: %+v", len(out), check, device, out)
	}
	return out[0]
}
