package faults_test

import (
	"fmt"
	"testing"

	"tripgrade/faults"
)

// benchSizes are the bus counts of the generated networks the engine is
// benchmarked on: a large distribution study and a whole utility region.
var benchSizes = []int{1000, 10000}

// benchSettings are those of a typical study: minimum-case fault
// resistances, heated conductors and three positions along every line.
var benchSettings = faults.Settings{
	EarthFaultOhm:   10,
	EarthFaultOhmLV: 0.05,
	PhaseFaultOhm:   0.3,
	EndTempC:        80,
	LineFractions:   []float64{0.25, 0.5, 0.75},
}

// mustEngine builds the engine of net with benchSettings.
func mustEngine(b *testing.B, net *faults.Network) *faults.Engine {
	b.Helper()
	eng, err := faults.New(net, benchSettings)
	if err != nil {
		b.Fatal(err)
	}
	return eng
}

// BenchmarkNew measures building and factoring the three sequence networks
// of both cases.
func BenchmarkNew(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("buses=%d", n), func(b *testing.B) {
			net, _ := generateNetwork(1, n)
			for b.Loop() {
				mustEngine(b, net)
			}
		})
	}
}

// BenchmarkAllBuses measures the four fault kinds at every bus in both
// cases.
func BenchmarkAllBuses(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("buses=%d", n), func(b *testing.B) {
			net, _ := generateNetwork(1, n)
			eng := mustEngine(b, net)
			for b.Loop() {
				if _, err := eng.AllBuses(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkAllPoints measures the currents every relay needs: at each
// measuring point, the faults of its reach in both cases. Each iteration
// gets a fresh engine (built outside the timing), so the factor paths the
// engine caches on first use are paid for, as in a real run.
func BenchmarkAllPoints(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("buses=%d", n), func(b *testing.B) {
			net, pts := generateNetwork(1, n)
			for b.Loop() {
				b.StopTimer()
				eng := mustEngine(b, net)
				b.StartTimer()
				if _, err := eng.AllPoints(pts, nil); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(len(pts)), "points")
		})
	}
}

// BenchmarkAllPointsWarm is BenchmarkAllPoints on one engine whose factor
// paths are already cached: the cost of a second pass, such as a checker
// asking again after changing only the relays.
func BenchmarkAllPointsWarm(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("buses=%d", n), func(b *testing.B) {
			net, pts := generateNetwork(1, n)
			eng := mustEngine(b, net)
			if _, err := eng.AllPoints(pts, nil); err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				if _, err := eng.AllPoints(pts, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkStudy measures the whole fault study end to end: New, every
// bus, every relay point.
func BenchmarkStudy(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("buses=%d", n), func(b *testing.B) {
			net, pts := generateNetwork(1, n)
			for b.Loop() {
				eng := mustEngine(b, net)
				if _, err := eng.AllBuses(); err != nil {
					b.Fatal(err)
				}
				if _, err := eng.AllPoints(pts, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkAllDuties measures the peak, breaking and steady-state currents
// at every bus on a fresh engine: the equivalent-frequency network (and,
// with motors, the one without them) is factored on first use, so its cost
// is in the figure. The machine network adds three-winding transformers,
// motors and power station units to the generated one.
func BenchmarkAllDuties(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("buses=%d", n), func(b *testing.B) {
			net, _ := generateMachineNetwork(1, n)
			for b.Loop() {
				b.StopTimer()
				eng := mustEngine(b, net)
				b.StartTimer()
				if _, err := eng.AllDuties(); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
