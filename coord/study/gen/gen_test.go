package gen_test

import (
	"bytes"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/study/gen"
)

// TestGeneratedStudiesLoadAndSolve: a generated study has exactly the
// buses asked for, is the same for the same seed, loads without a
// problem, and its network builds.
func TestGeneratedStudiesLoadAndSolve(t *testing.T) {
	for _, o := range []gen.Options{{Buses: gen.MinBuses, Seed: 1}, {Buses: 500, Seed: 7}, {Buses: 500, Seed: 7, Fuses: true}, {Buses: 500, Seed: 7, Reach: 8}, {Buses: gen.MinBuses, Seed: 2, Practice: true}, {Buses: 500, Seed: 7, Practice: true, Ranges: true}} {
		var a, b bytes.Buffer
		if err := gen.Write(&a, o); err != nil {
			t.Fatal(err)
		}
		gen.Write(&b, o)
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			t.Errorf("%+v: two runs differ", o)
		}
		s, err := study.Parse("gen.toml", a.Bytes(), nil)
		if err != nil {
			t.Fatalf("%+v: %v", o, err)
		}
		if len(s.Network.Buses) != o.Buses {
			t.Errorf("%+v: %d buses", o, len(s.Network.Buses))
		}
		fuses := strings.Count(a.String(), "[[fuse]]")
		if (fuses > 0) != (o.Fuses && o.Buses > 100) {
			t.Errorf("%+v: %d fuses", o, fuses)
		}
		if _, _, err := coord.Prepare(s); err != nil {
			t.Errorf("%+v: the network does not build: %v", o, err)
		}
	}
	if err := gen.Write(&bytes.Buffer{}, gen.Options{Buses: gen.MinBuses - 1}); err == nil {
		t.Errorf("a study below the minimum size was written")
	}
	if err := gen.Write(&bytes.Buffer{}, gen.Options{Buses: 100, Reach: 8, Practice: true}); err == nil {
		t.Errorf("a study laid out as in practice was written with a reach")
	}
	for _, reach := range []int{-1, 1} {
		if err := gen.Write(&bytes.Buffer{}, gen.Options{Buses: 100, Reach: reach}); err == nil {
			t.Errorf("a study with reach %d was written", reach)
		}
	}
}
