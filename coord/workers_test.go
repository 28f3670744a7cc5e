package coord_test

import (
	"bytes"
	"fmt"
	"runtime"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/coord/study"
	"tripgrade/coord/study/gen"
)

// The fault-by-fault pass hands nodes to workers in chunks, in an order of
// its own, and merges what each worker found; the findings must not depend
// on how many workers there are or which took what. A generated meshed
// study (rings, parallel paths, every relay seeing faults from both sides)
// is checked on 1 to 8 workers and must give the same table byte for byte.
func TestCheckSameOnAnyNumberOfWorkers(t *testing.T) {
	s := generatedStudy(t, 150, 3)
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	var first string
	for _, n := range []int{1, 2, 3, 8} {
		runtime.GOMAXPROCS(n)
		r := checkStudy(t, s)
		var out bytes.Buffer
		if err := report.NewFindings(s, r).WriteText(&out); err != nil {
			t.Fatal(err)
		}
		if n == 1 {
			first = out.String()
			if len(r.Findings) < 100 {
				t.Fatalf("only %d findings: the study is too small to spread over workers", len(r.Findings))
			}
			continue
		}
		if out.String() != first {
			t.Fatalf("%d workers give a table different from 1 worker's", n)
		}
	}
}

// generatedStudy is the seeded meshed study of coord/study/gen with the
// given number of buses.
func generatedStudy(t *testing.T, buses int, seed uint64) *coord.Study {
	t.Helper()
	var src bytes.Buffer
	if err := gen.Write(&src, gen.Options{Buses: buses, Seed: seed}); err != nil {
		t.Fatal(err)
	}
	s, err := study.Parse(fmt.Sprintf("gen%d.toml", buses), src.Bytes(), nil)
	if err != nil {
		t.Fatal(err)
	}
	return s
}
