package coord_test

import (
	"bytes"
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
	var src bytes.Buffer
	if err := gen.Write(&src, gen.Options{Buses: 150, Seed: 3}); err != nil {
		t.Fatal(err)
	}
	s, err := study.Parse("gen.toml", src.Bytes(), nil)
	if err != nil {
		t.Fatal(err)
	}
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	var first string
	for _, n := range []int{1, 2, 3, 8} {
		runtime.GOMAXPROCS(n)
		eng, topo, err := coord.Prepare(s)
		if err != nil {
			t.Fatal(err)
		}
		r, err := coord.Check(s, eng, topo)
		if err != nil {
			t.Fatal(err)
		}
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
