package study

import (
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study/internal/tomltext"
	"tripgrade/curves"
	"tripgrade/faults"
)

var update = flag.Bool("update", false, "rewrite the golden files under testdata/errors")

// loadAndPrepare loads a study and, when it loads, builds its fault
// engine, with the engine's errors located in the file as the command
// line reports them.
func loadAndPrepare(path string) error {
	s, err := Load(path)
	if err != nil {
		return err
	}
	if _, _, err := coord.Prepare(s); err != nil {
		return Locate(path, err)
	}
	return nil
}

// TestErrorsGolden loads each broken study under testdata/errors and
// compares every message with its golden file: the messages are the
// user interface of bad input, so any change to them must be deliberate.
func TestErrorsGolden(t *testing.T) {
	files, err := filepath.Glob("../../testdata/errors/*.toml")
	if err != nil || len(files) == 0 {
		t.Fatalf("no error studies found: %v", err)
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			err := loadAndPrepare(f)
			list, ok := err.(ErrorList)
			if !ok {
				t.Fatalf("got %v (%T), want an ErrorList", err, err)
			}
			got := strings.ReplaceAll(list.Error(), "../../testdata/errors/", "") + "\n"
			golden := strings.TrimSuffix(f, ".toml") + ".golden"
			if *update {
				if err := os.WriteFile(golden, []byte(got), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./coord/study -update to create it)", err)
			}
			if got != string(want) {
				t.Errorf("messages differ from %s\ngot:\n%s\nwant:\n%s", golden, got, want)
			}
		})
	}
}

// TestEveryProblemHasALine: each message of the broken studies names a
// line, except whole-network problems, which name an element.
func TestEveryProblemHasALine(t *testing.T) {
	files, _ := filepath.Glob("../../testdata/errors/*.toml")
	for _, f := range files {
		err := loadAndPrepare(f)
		for _, e := range err.(ErrorList) {
			if e.Line == 0 && e.Element == "" {
				t.Errorf("%s: %q has neither a line nor an element", f, e.Msg)
			}
		}
	}
}

func TestExampleLoads(t *testing.T) {
	s, err := Load("../../examples/kestrel-park.toml")
	if err != nil {
		t.Fatal(err)
	}
	n := s.Network
	if len(n.Buses) != 13 || len(n.Transformers) != 4 || len(n.Lines) != 9 || len(s.Devices) != 14 {
		t.Errorf("got %d buses, %d transformers, %d lines, %d devices; want 13, 4, 9, 14",
			len(n.Buses), len(n.Transformers), len(n.Lines), len(s.Devices))
	}
	if _, err := faults.New(n, s.Faults); err != nil {
		t.Errorf("the example's network does not build: %v", err)
	}
}

const tiny = `
[study]
name = "tiny"
[[bus]]
name = "A"
kv = 11
[[bus]]
name = "B"
kv = 11
[[source]]
name = "grid"
bus = "A"
sc_mva_max = 200
sc_mva_min = 100
x_r = 8
z0_z1 = 1.5
[[line]]
name = "L1"
from = "A"
to = "B"
type = "cable"
length_km = 2
r1_ohm_per_km = 0.1
x1_ohm_per_km = 0.2
r0_ohm_per_km = 0.4
x0_ohm_per_km = 0.6
[[load]]
bus = "B"
mva = 1.9053
[[relay]]
name = "R1"
branch = "L1"
at = "A"
ct_primary_a = 400
ct_secondary_a = 5
  [[relay.stage]]
  measures = "phase"
  curve = "ieee-vi"
  pickup_secondary_a = 4
  td = 2
  [[relay.stage]]
  measures = "ground"
  curve = "definite"
  pickup_a = 40
  delay_s = 0.5
`

// TestConversion checks that values reach the model in the units the
// engine expects: per-km impedances times length, secondary pickups times
// the CT ratio, load MVA as amperes at the bus voltage.
func TestConversion(t *testing.T) {
	s, err := Parse("tiny.toml", []byte(tiny), nil)
	if err != nil {
		t.Fatal(err)
	}
	l := s.Network.Lines[0]
	if l.Z1Ohm != complex(0.2, 0.4) || l.Z0Ohm != complex(0.8, 1.2) {
		t.Errorf("line impedances %v, %v; want (0.2+0.4i), (0.8+1.2i) Ω", l.Z1Ohm, l.Z0Ohm)
	}
	src := s.Network.Sources[0]
	if src.Max.SCMVA != 200 || src.Min.SCMVA != 100 || src.Max.XR != 8 || !src.Earthed || src.Z0Z1 != 1.5 {
		t.Errorf("source %+v", src)
	}
	d := s.Devices[0]
	if d.Point != (faults.Point{Branch: 0, End: faults.From}) {
		t.Errorf("relay point %+v", d.Point)
	}
	st := d.Stages
	if len(st) != 2 || st[0].PickupA != 320 || st[0].Multiplier != 2 || st[0].Shape != curves.ShapeIEEEVI ||
		st[0].Label != "51" || st[1].Measures != coord.Residual || st[1].DelayS != 0.5 || st[1].Label != "51NDT" {
		t.Errorf("stages %+v", st)
	}
	// 1.9053 MVA at 11 kV is 100 A: I = S/(√3·U).
	if a := s.Loads[0].CurrentA; a < 99.99 || a > 100.01 {
		t.Errorf("load current %g A, want 100 A", a)
	}
	if tm, st := d.Stages[0].Curve.Time(3200); st != curves.Operates || tm < 1.37 || tm > 1.39 {
		// IEEE C37.112 very inverse at TD 2 and 10×: 2·0.689 s.
		t.Errorf("stage time at 10× pickup %g s (%v), want 1.378 s", tm, st)
	}
}

// TestLineIndex: the decoder records the lines of tables and keys of
// arrays of tables, nested ones, and keys after values that span lines.
func TestLineIndex(t *testing.T) {
	src := "[study]\nname = \"x\" # comment with = sign\n\n[[relay]]\nname = \"a\"\n  [[relay.stage]]\n  curve = \"iec-si\"\n  [[relay.stage]]\n  tms = 0.1\n[[relay]]\nname = \"b\"\n[[fuse]]\nmelt = [\n  [1, 2],\n  [3, 4],\n]\nrating_a = 5\n"
	root, err := tomltext.Parse([]byte(src), tomltext.Limits{})
	if err != nil {
		t.Fatal(err)
	}
	d := newDecoder("x.toml", root)
	var raw rawFile
	d.table(root, "", "", &raw)
	ix := d.lines
	cases := []struct {
		path, key string
		want      int
	}{
		{"study", "name", 2},
		{"relay[0]", "name", 5},
		{"relay[0].stage[0]", "curve", 7},
		{"relay[0].stage[1]", "tms", 9},
		{"relay[1]", "name", 11},
		{"relay[1]", "missing", 10},
		{"fuse[0]", "melt", 13},
		{"fuse[0]", "rating_a", 17},
	}
	for _, c := range cases {
		if got := ix.key(c.path, c.key); got != c.want {
			t.Errorf("%s.%s: line %d, want %d", c.path, c.key, got, c.want)
		}
	}
}
