package gen

import (
	"math/rand/v2"
	"testing"
)

// TestReachKeepsTheMeshingLocal: with Options.Reach, every 33 kV chord and
// every primary's second transformer joins ring buses at most Reach places
// apart; without it, some reach across the ring.
func TestReachKeepsTheMeshingLocal(t *testing.T) {
	span := func(o Options) (worst int) {
		g := &generator{rng: rand.New(rand.NewPCG(o.Seed, 0x51ad)), o: o}
		g.layout()
		n33 := max(3, o.Buses/12)
		apart := func(a, b int) int {
			d := a - b
			if d < 0 {
				d = -d
			}
			return min(d, n33-d)
		}
		for _, l := range g.lines {
			if l.kv > 20 {
				worst = max(worst, apart(l.from, l.to))
			}
		}
		// A primary's transformers: the HV ends of those that share an LV bus.
		hv := map[int][]int{}
		for _, tr := range g.trs {
			hv[tr.to] = append(hv[tr.to], tr.from)
		}
		for _, ends := range hv {
			for _, e := range ends[1:] {
				worst = max(worst, apart(ends[0], e))
			}
		}
		return worst
	}
	for _, reach := range []int{2, 8} {
		if got := span(Options{Buses: 5000, Seed: 3, Reach: reach}); got > reach || got < 2 {
			t.Errorf("reach %d: 33 kV links span up to %d places", reach, got)
		}
	}
	if got := span(Options{Buses: 5000, Seed: 3}); got <= 8 {
		t.Errorf("without a reach, 33 kV links span at most %d places: not across the ring", got)
	}
}
