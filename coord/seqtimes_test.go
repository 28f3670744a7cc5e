package coord_test

import (
	"bytes"
	"math"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/study/gen"
)

// A device that trips out of turn during an opening sequence is recorded
// once, at the moment it trips; its progress towards its time stops
// there. Before that rule, a device that had tripped kept integrating,
// and when a later opening relieved it, its "projected" time was
// extrapolated backwards from a progress above one: the generated
// 200-bus study reported relays operating at −17 s and −44 s. Every
// time a finding gives must be a moment after the fault began.
func TestSequenceTimesNeverPrecedeTheFault(t *testing.T) {
	var b bytes.Buffer
	if err := gen.Write(&b, gen.Options{Buses: 200, Seed: 1}); err != nil {
		t.Fatal(err)
	}
	s, err := study.Parse("gen200.toml", b.Bytes(), nil)
	if err != nil {
		t.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	r, err := coord.Check(s, eng, topo)
	if err != nil {
		t.Fatal(err)
	}
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
