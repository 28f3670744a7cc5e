package coord_test

import (
	"testing"

	"tripgrade/coord"
)

// TestLoadThroughSumsTheLoadsBeyond: the load through every device of a
// generated meshed study is the sum, in the study's order, of the loads at
// the buses beyond it, each referred to the device's bus, bit for bit
// (the figure the load margin is judged on).
func TestLoadThroughSumsTheLoadsBeyond(t *testing.T) {
	s := generatedStudy(t, 400, 5)
	_, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	nonzero := 0
	for i := range s.Devices {
		beyond := map[int]bool{}
		for _, b := range topo.Beyond(i) {
			beyond[b] = true
		}
		bus := coord.DeviceBus(s.Network, s.Devices[i])
		want := 0.0
		for _, l := range s.Loads {
			if beyond[l.Bus] {
				want += topo.ReferA(l.CurrentA, l.Bus, bus)
			}
		}
		got, declared := coord.LoadThrough(s, topo, i)
		if declared {
			continue
		}
		if got != want {
			t.Errorf("%s: load through %v A, the loads beyond sum to %v A", s.Devices[i].Name, got, want)
		}
		if want > 0 {
			nonzero++
		}
	}
	if nonzero < len(s.Devices)/4 {
		t.Errorf("only %d of %d devices have load beyond them", nonzero, len(s.Devices))
	}
}
