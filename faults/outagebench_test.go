package faults_test

import (
	"fmt"
	"testing"

	"tripgrade/faults"
)

// BenchmarkOutageScenario compares the two ways to solve the faults of an
// operating scenario with one line out of service (issue 11's N-1 sweep):
// factoring the changed network afresh (New on the network without the
// line), or keeping the intact factorization and taking the line out of
// every solve as a low-rank update (SolveOpen with both of its ends open).
// Each iteration solves a three-phase fault at every bus in both cases
// (faults), and also reads the current at every measuring point
// (faults+points), as a check of the scenario would. The fresh factorization is paid once per scenario; the update is
// paid in every solve.
func BenchmarkOutageScenario(b *testing.B) {
	for _, n := range []int{1000} {
		net, pts := generateNetwork(1, n)
		out := meshedLine(b, net)
		var cut faults.Network = *net
		cut.Lines = append(append([]faults.Line(nil), net.Lines[:out]...), net.Lines[out+1:]...)
		var cutPts []faults.Point
		for _, p := range pts {
			switch {
			case p.Branch < out:
				cutPts = append(cutPts, p)
			case p.Branch > out:
				cutPts = append(cutPts, faults.Point{Branch: p.Branch - 1, End: p.End})
			}
		}
		opening := faults.Opening{Ends: []faults.Point{{Branch: out, End: faults.From}, {Branch: out, End: faults.To}}}
		intact := mustEngine(b, net)
		solveAll := func(b *testing.B, eng *faults.Engine, pts []faults.Point, open bool) {
			for k := range eng.Network().Buses {
				for _, cs := range faults.Cases {
					f := eng.CaseFault(faults.AtBus(k), faults.LLL, cs)
					var s faults.Solution
					var err error
					if open {
						s, err = eng.SolveOpen(f, opening)
					} else {
						s, err = eng.Solve(f)
					}
					if err != nil {
						b.Fatal(err)
					}
					for _, p := range pts {
						s.At(p)
					}
				}
			}
		}
		for _, points := range []bool{false, true} {
			what := "faults"
			if points {
				what = "faults+points"
			}
			b.Run(fmt.Sprintf("buses=%d/%s/refactor", n, what), func(b *testing.B) {
				for b.Loop() {
					solveAll(b, mustEngine(b, &cut), pick(cutPts, points), false)
				}
			})
			b.Run(fmt.Sprintf("buses=%d/%s/low-rank", n, what), func(b *testing.B) {
				for b.Loop() {
					solveAll(b, intact, pick(pts, points), true)
				}
			})
		}
	}
}

func pick(pts []faults.Point, all bool) []faults.Point {
	if all {
		return pts
	}
	return nil
}

// meshedLine returns a line whose outage leaves every bus fed.
func meshedLine(b *testing.B, net *faults.Network) int {
	for i := range net.Lines {
		var cut faults.Network = *net
		cut.Lines = append(append([]faults.Line(nil), net.Lines[:i]...), net.Lines[i+1:]...)
		if len(cut.Islands()) == 0 {
			if _, err := faults.New(&cut, benchSettings); err == nil {
				return i
			}
		}
	}
	b.Fatal("no line whose outage leaves every bus fed")
	return -1
}
