package curves_test

import (
	"math/rand/v2"
	"testing"

	"tripgrade/curves"
)

// benchSink keeps the compiler from discarding the timed work.
var benchSink float64

// benchCurrents returns 1024 currents spread from just below pickupA to
// 40× it, so the benchmarks see every branch.
func benchCurrents(pickupA float64) []float64 {
	r := rand.New(rand.NewPCG(12, 12))
	out := make([]float64, 1024)
	for i := range out {
		out[i] = pickupA * logUniform(r, 0.9, 40)
	}
	return out
}

func benchTime(b *testing.B, ch curves.Characteristic, currents []float64) {
	b.ReportAllocs()
	var sum float64
	for i := 0; b.Loop(); i++ {
		t, st := ch.Time(currents[i&1023])
		if st == curves.Operates {
			sum += t
		}
	}
	benchSink = sum
}

// BenchmarkInverseTime: one stage at one current, called directly.
func BenchmarkInverseTime(b *testing.B) {
	law, _ := curves.ShapeIECSI.Law()
	s, _ := curves.NewInverseTime(law, 400, 0.1)
	s.MaxMultiple = 20
	currents := benchCurrents(400)
	b.ReportAllocs()
	var sum float64
	for i := 0; b.Loop(); i++ {
		t, st := s.Time(currents[i&1023])
		if st == curves.Operates {
			sum += t
		}
	}
	benchSink = sum
}

// BenchmarkInverseTimeInterface: the same through the Characteristic
// interface, as the checker calls it.
func BenchmarkInverseTimeInterface(b *testing.B) {
	law, _ := curves.ShapeIEEEVI.Law()
	s, _ := curves.NewInverseTime(law, 400, 2)
	benchTime(b, s, benchCurrents(400))
}

// BenchmarkFastest: a relay of three stages (51, 50/51 DT, 50).
func BenchmarkFastest(b *testing.B) {
	law, _ := curves.ShapeIECSI.Law()
	s, _ := curves.NewInverseTime(law, 400, 0.1)
	f := curves.Fastest{s, curves.DefiniteTime{PickupA: 2000, DelayS: 0.3}, curves.Instantaneous{PickupA: 8000}}
	benchTime(b, f, benchCurrents(400))
}

// BenchmarkTable: a 30-point tabulated curve.
func BenchmarkTable(b *testing.B) {
	pts := make([]curves.Point, 30)
	for i := range pts {
		c := 400 * (1 + float64(i)*1.5)
		pts[i] = curves.Point{CurrentA: c, TimeS: 1e8 / (c * c)}
	}
	tab, err := curves.NewTable("bench", pts)
	if err != nil {
		b.Fatal(err)
	}
	benchTime(b, tab, benchCurrents(420))
}

// BenchmarkThroughFault: a category III frequent-fault damage curve.
func BenchmarkThroughFault(b *testing.B) {
	tf, err := curves.NewThroughFault(curves.ThroughFaultSettings{Category: curves.CategoryIII, RatedA: 500, ZPct: 8,
		SourceZPct: 1, FrequentFaults: true})
	if err != nil {
		b.Fatal(err)
	}
	benchTime(b, tf, benchCurrents(1000))
}

// BenchmarkCurrentForBisection: the inverse question on a curve without a
// closed form (a table).
func BenchmarkCurrentForBisection(b *testing.B) {
	tab, _ := curves.NewTable("fuse", []curves.Point{{20, 300}, {40, 10}, {100, 1}, {400, 0.01}})
	b.ReportAllocs()
	var sum float64
	for i := 0; b.Loop(); i++ {
		c, _ := curves.CurrentFor(tab, 0.02+float64(i&255))
		sum += c
	}
	benchSink = sum
}
