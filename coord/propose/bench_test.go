package propose

import (
	"fmt"
	"testing"

	"tripgrade/coord/study/gen"
)

// BenchmarkPropose runs the whole search on a generated meshed study
// (coord/study/gen: 33 kV rings, 33/11 kV primaries, 11 kV loops, a relay
// with an inverse phase stage and a definite-time ground stage at every
// line end), the study prepared once:
// go test -run X -bench Propose -benchtime 1x ./coord/propose/
//
// With pickups, every phase stage declares a pickup range (gen.Options
// Ranges) and the search chooses the pickups first. The practice study
// is laid out as an engineer would protect it (gen.Options Practice: ring
// mains with directional relays, transformer relays, radial feeders).
func BenchmarkPropose(b *testing.B) {
	for _, c := range []struct {
		n                 int
		pickups, practice bool
	}{{1000, false, false}, {1000, true, false}, {1000, false, true}, {1000, true, true}} {
		name := fmt.Sprintf("buses=%d", c.n)
		if c.practice {
			name += "/practice"
		}
		if c.pickups {
			name += "/pickups"
		}
		b.Run(name, func(b *testing.B) {
			s, eng, topo := generated(b, gen.Options{Buses: c.n, Seed: 1, Ranges: c.pickups, Practice: c.practice})
			b.ResetTimer()
			for b.Loop() {
				pr, err := Propose(s, eng, topo, Settings{Pickups: c.pickups})
				if err != nil {
					b.Fatal(err)
				}
				b.ReportMetric(float64(pr.Rounds), "rounds")
				b.ReportMetric(float64(pr.Constraints), "constraints")
				if c.pickups {
					b.ReportMetric(float64(pr.PickupEvals), "pickup-sets")
				}
			}
		})
	}
}
