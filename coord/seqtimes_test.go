package coord_test

import (
	"math"
	"testing"

	"tripgrade/coord"
)

// A device that trips out of turn during an opening sequence is recorded
// once, at the moment it trips; its progress towards its time stops
// there. Before that rule, a device that had tripped kept integrating,
// and when a later opening relieved it, its "projected" time was
// extrapolated backwards from a progress above one: the generated
// 200-bus study reported relays operating at −17 s and −44 s. Every
// time a finding gives must be a moment after the fault began.
func TestSequenceTimesNeverPrecedeTheFault(t *testing.T) {
	r := checkStudy(t, generatedStudy(t, 200, 1))
	n := 0
	for _, f := range r.Findings {
		if f.Check != coord.Discrimination || f.Fault == nil {
			continue
		}
		n++
		for _, ts := range []float64{f.Fault.DeviceS, f.Fault.OtherS} {
			if ts < 0 || math.IsNaN(ts) {
				t.Errorf("%s over %s at %s %s @ %s: a time of %g s", f.Device, f.Other, f.Fault.Kind, f.Fault.Case, f.Fault.Place, ts)
			}
		}
	}
	if n < 100 {
		t.Fatalf("only %d discrimination findings with a fault: the study no longer exercises opening sequences", n)
	}
}
