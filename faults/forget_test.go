package faults_test

import (
	"testing"

	"tripgrade/faults"
	"tripgrade/faults/randnet"
)

// TestForgetPathsKeepsTheFigures: after the engine drops the factor paths
// it keeps, the impedance entries it computes again give the same currents,
// bit for bit, for faults with a branch end open (the case that reads
// entries between buses through the paths).
func TestForgetPathsKeepsTheFigures(t *testing.T) {
	built := 0
	for seed := range uint64(4) {
		n, set := randnet.Network(randnet.Options{Buses: 12, Seed: seed})
		e, err := faults.New(n, set)
		if err != nil {
			continue
		}
		built++
		solveAll := func() []faults.Currents {
			var out []faults.Currents
			for k := range n.Buses {
				for b := 0; b < n.BranchCount(); b++ {
					open := faults.Opening{Ends: []faults.Point{{Branch: b, End: faults.From}}}
					s, err := e.SolveOpen(faults.Fault{Place: faults.AtBus(k), Kind: faults.LG, Case: faults.Max}, open)
					if err != nil {
						t.Fatal(err)
					}
					for p := 0; p < n.BranchCount(); p++ {
						out = append(out, s.At(faults.Point{Branch: p, End: faults.To}))
					}
				}
			}
			return out
		}
		before := solveAll()
		e.ForgetPaths()
		after := solveAll()
		for i := range before {
			if before[i] != after[i] {
				t.Fatalf("seed %d: figure %d was %v, is %v after ForgetPaths", seed, i, before[i], after[i])
			}
		}
	}
	if built == 0 {
		t.Fatal("no network built")
	}
}
