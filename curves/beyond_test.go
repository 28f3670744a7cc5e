package curves

import (
	"math"
	"testing"
)

// TestBeyondEnd: above the end of its curve, 1/(Z_T + Z_S) per unit, a
// transformer's withstand continues the I²t law the curve ends on: the
// mechanical part I²t = 2·(1/(Z_T + Z_S))² for category IV, and for
// category II with frequent faults (from memory, IEEE C57.109), category
// I's I²t = 1250 (IEEE C57.109). A category II curve without the
// mechanical part ends on the thermal points and has no law to continue.
func TestBeyondEnd(t *testing.T) {
	cases := []struct {
		name string
		set  ThroughFaultSettings
		pu   float64 // current in per unit of rated
		want float64 // 0: no law
	}{
		{"category IV, 10 % above", ThroughFaultSettings{Category: CategoryIV, RatedA: 700, ZPct: 12.5, SourceZPct: 1}, 1.1 / 0.135, 2 / 1.21},
		{"category II frequent", ThroughFaultSettings{Category: CategoryII, RatedA: 100, ZPct: 5, FrequentFaults: true}, 22, 2 * 20 * 20 / (22.0 * 22)},
		{"category I", ThroughFaultSettings{Category: CategoryI, RatedA: 20, ZPct: 4}, 30, 1250 / 900.0},
		{"category II thermal only", ThroughFaultSettings{Category: CategoryII, RatedA: 100, ZPct: 5}, 22, 0},
		{"inside the curve", ThroughFaultSettings{Category: CategoryIV, RatedA: 700, ZPct: 12.5}, 7, 0},
	}
	for _, c := range cases {
		tf, err := NewThroughFault(c.set)
		if err != nil {
			t.Fatal(err)
		}
		got, ok := tf.BeyondEnd(c.pu * c.set.RatedA)
		if ok != (c.want > 0) || math.Abs(got-c.want) > 1e-12*c.want {
			t.Errorf("%s: %g s (%v), want %g s", c.name, got, ok, c.want)
		}
		if _, st := tf.Time(c.pu * c.set.RatedA); c.want > 0 && st != Undefined {
			t.Errorf("%s: Time defined beyond the end", c.name)
		}
	}
}
