package coord_test

import (
	"math"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
)

// iec60255 is the dependent-time equation of IEC 60255-151:2009 Table 1,
// t = TMS·k/((I/Is)^α − 1), written out here apart from package curves.
func iec60255(k, alpha, tms, multiple float64) float64 {
	return tms * k / (math.Pow(multiple, alpha) - 1)
}

// limitingError is IEC 60255-151:2009 cl. 5.2: the class times 2.5 from 2
// to 5 × setting, 1.5 from 5 to 10 ×, 1 above, for dependent-time stages
// (the plain class for definite-time ones), never below the floor.
func limitingError(classPct, floorS, timeS, multiple float64, dependent bool) float64 {
	f := 1.0
	if dependent {
		switch {
		case multiple < 5:
			f = 2.5
		case multiple < 10:
			f = 1.5
		}
	}
	return math.Max(timeS*classPct/100*f, floorS)
}

// The test sheet of a relay declaring 5 % or 40 ms, CT 400/1 A: times at
// 2, 5 and 10 × against IEC 60255-151:2009 Table 1 (standard inverse: k
// 0.14 s, α 0.02; extremely inverse: k 80 s, α 2), bands against cl. 5.2,
// secondary currents by the CT ratio.
func TestInjectionsAgainstIEC60255(t *testing.T) {
	s, err := study.Load("../testdata/testsheet/relay.toml")
	if err != nil {
		t.Fatal(err)
	}
	ins, err := coord.Injections(s, "", coord.InjectionSettings{})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-9 // the same formula, evaluated twice
	type want struct {
		label     string
		multiple  float64
		timeS     float64
		dependent bool
	}
	wants := []want{
		{"51", 2, iec60255(0.14, 0.02, 0.25, 2), true},
		{"51", 5, iec60255(0.14, 0.02, 0.25, 5), true},
		{"51", 10, iec60255(0.14, 0.02, 0.25, 10), true},
		{"51DT", 2, 0.3, false},
		{"51DT", 5, 0.3, false},
		{"51DT", 10, 0.3, false},
		// An instantaneous stage takes the study's instantaneous
		// operating time (criteria instantaneous_time_s, default 0.03 s,
		// common practice).
		{"50", 1.2, 0.03, false},
		{"51N", 2, iec60255(80, 2, 0.5, 2), true},
		{"51N", 5, iec60255(80, 2, 0.5, 5), true},
		{"51N", 10, iec60255(80, 2, 0.5, 10), true},
	}
	// Two values recalled in reference form (IEC 60255-151 Table 1 at TMS
	// 1: standard inverse 10.03 s at 2 ×, 2.971 s at 10 ×) pin the
	// equation itself.
	if got := iec60255(0.14, 0.02, 1, 2); math.Abs(got-10.03) > 0.005 {
		t.Fatalf("SI at 2 ×: %g, want 10.03 s", got)
	}
	if got := iec60255(0.14, 0.02, 1, 10); math.Abs(got-2.971) > 0.0005 {
		t.Fatalf("SI at 10 ×: %g, want 2.971 s", got)
	}
	var got []coord.Injection
	var labels []string
	var pickups []float64
	for _, si := range ins {
		st := s.Devices[si.Device].Stages[si.Stage]
		if math.Abs(si.PickupSecondaryA-st.PickupA/400) > tol {
			t.Errorf("%s: secondary setting %g A, want %g A", st.Label, si.PickupSecondaryA, st.PickupA/400)
		}
		for _, p := range si.Points {
			got = append(got, p)
			labels = append(labels, st.Label)
			pickups = append(pickups, st.PickupA)
		}
	}
	if len(got) != len(wants) {
		t.Fatalf("%d injections, want %d", len(got), len(wants))
	}
	for i, w := range wants {
		p := got[i]
		if labels[i] != w.label || p.Multiple != w.multiple {
			t.Fatalf("injection %d: %s at %g ×, want %s at %g ×", i, labels[i], p.Multiple, w.label, w.multiple)
		}
		if want := w.multiple * pickups[i] / 400; math.Abs(p.SecondaryA-want) > tol {
			t.Errorf("%s %g ×: inject %g A secondary, want %g A", w.label, w.multiple, p.SecondaryA, want)
		}
		if math.Abs(p.TimeS-w.timeS) > tol*math.Max(1, w.timeS) {
			t.Errorf("%s %g ×: expected %g s, want %g s (IEC 60255-151 Table 1)", w.label, w.multiple, p.TimeS, w.timeS)
		}
		e := limitingError(5, 0.04, w.timeS, w.multiple, w.dependent)
		if !p.Banded || math.Abs(p.LateS-(w.timeS+e)) > tol || math.Abs(p.EarlyS-math.Max(w.timeS-e, 0)) > tol {
			t.Errorf("%s %g ×: band %g–%g s, want %g–%g s (IEC 60255-151 cl. 5.2)", w.label, w.multiple, p.EarlyS, p.LateS, math.Max(w.timeS-e, 0), w.timeS+e)
		}
	}
	// At 5 × the definite-time stage (6000 A) the instantaneous stage
	// operates first and must be blocked; at 2 × (2400 A) it does not.
	if f := got[4].Faster; len(f) != 1 || !strings.HasPrefix(f[0], "50 ") {
		t.Errorf("51DT at 5 ×: faster stages %v, want 50", f)
	}
	if f := got[3].Faster; len(f) != 0 {
		t.Errorf("51DT at 2 ×: faster stages %v, want none", f)
	}
}

func TestInjectionsErrors(t *testing.T) {
	s, err := study.Load("../examples/fenwick-quay.toml")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		device string
		set    coord.InjectionSettings
		want   string
	}{
		{"NOPE", coord.InjectionSettings{}, `no relay named "NOPE"`},
		{"BY-FUSE", coord.InjectionSettings{}, "is a fuse"},
		{"", coord.InjectionSettings{Multiples: []float64{2, 1}}, "above 1"},
		{"", coord.InjectionSettings{InstantaneousMultiple: math.NaN()}, "above 1"},
	} {
		if _, err := coord.Injections(s, c.device, c.set); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q %+v: %v, want %q", c.device, c.set, err, c.want)
		}
	}
}
