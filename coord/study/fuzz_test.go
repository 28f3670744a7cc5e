package study

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"
	"unicode/utf8"

	"tripgrade/coord"
)

// FuzzParse feeds the loader mangled study files: whatever the input, it
// returns a study or errors, never panics, and a study it accepts goes
// through the fault engine and every check without panicking either.
func FuzzParse(f *testing.F) {
	seeds, _ := filepath.Glob("../../testdata/*/*.toml")
	examples, _ := filepath.Glob("../../examples/*.toml")
	for _, p := range append(seeds, examples...) {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte(tiny))
	f.Fuzz(func(t *testing.T, src []byte) {
		s, err := Parse("fuzz.toml", src, nil)
		if err != nil {
			if _, ok := err.(ErrorList); !ok {
				t.Fatalf("error of type %T, want ErrorList: %v", err, err)
			}
			return
		}
		eng, topo, err := coord.Prepare(s)
		if err != nil {
			t.Logf("accepted study does not build an engine: %v", err)
			return
		}
		if _, err := coord.Check(s, eng, topo); err != nil {
			t.Logf("check: %v", err)
		}
	})
}

// FuzzSettingsTable feeds the settings-table reader mangled spreadsheet
// exports, read from a folder beside the study: whatever the bytes, it
// returns a study or errors, never panics; every message names the study
// or the table with a line, and echoes no more than a few hundred
// characters of the input; a table it accepts gives stages of finite
// settings that go through the engine and every check.
func FuzzSettingsTable(f *testing.F) {
	tables, _ := filepath.Glob("../../testdata/errors/*.csv")
	tables = append(tables, "../../examples/fenwick-quay-settings.csv")
	for _, p := range tables {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte("relay;measures;curve;pickup_a;tms;multiplier_range\nR1;phase;iec-si;300;0,1;0,05:1:0,05\nR2;ground;definite;40;;\n"))
	study := []byte(strings.Replace(settingsStudy, "TABLE", "tables/s.csv", 1))
	f.Fuzz(func(t *testing.T, table []byte) {
		dir := fstest.MapFS{"tables/s.csv": {Data: table}}
		s, err := Parse("s.toml", study, dir)
		if err != nil {
			list, ok := err.(ErrorList)
			if !ok {
				t.Fatalf("error of type %T: %v", err, err)
			}
			for _, e := range list {
				if (e.File != "s.toml" && e.File != "tables/s.csv") || (e.Line <= 0 && e.Element == "") {
					t.Errorf("message without a place: %q", e.Error())
				}
				if n := utf8.RuneCountInString(e.Msg) + utf8.RuneCountInString(e.Element); n > maxEchoMessage+maxEchoElement+1 {
					t.Errorf("message of %d characters: %.200q…", n, e.Error())
				}
			}
			return
		}
		for _, d := range s.Devices {
			for _, st := range d.Stages {
				for _, v := range []float64{st.PickupA, st.Multiplier, st.DelayS, st.PickupRange.Min, st.PickupRange.Max, st.MultiplierRange.Max} {
					if math.IsNaN(v) || math.IsInf(v, 0) {
						t.Fatalf("relay %s stage %s: a setting that is not finite: %+v", d.Name, st.Label, st)
					}
				}
				if !(st.PickupA > 0) {
					t.Fatalf("relay %s stage %s: pickup %g", d.Name, st.Label, st.PickupA)
				}
			}
		}
		eng, topo, err := coord.Prepare(s)
		if err != nil {
			t.Fatalf("the study's network does not build: %v", err)
		}
		r, err := coord.Check(s, eng, topo)
		if err != nil {
			t.Fatalf("check: %v", err)
		}
		for _, x := range r.Findings {
			if x.Valid && x.Verdict == coord.Pass && (math.IsNaN(x.Margin) || math.IsInf(x.Margin, 0)) {
				t.Errorf("PASS with margin %v: %+v", x.Margin, x)
			}
		}
	})
}
