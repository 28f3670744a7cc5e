package coord

import (
	"math"
	"testing"

	"tripgrade/faults"
)

// TestSweepFamilies: the sweep scales each family of solved faults down
// from its largest member only, keeps the family's ratio of currents, and
// goes down to the weakest solved fault of the same kind at the family's
// places. Here an 11 kV earth fault seen with its residual current
// (400 A max, 300 A min) and a 400 V earth fault behind a delta winding,
// which drives phase current only (1500 A), are one kind but two families:
// no swept point may carry more than 400 A of residual current, or any
// residual current in the 400 V family.
func TestSweepFamilies(t *testing.T) {
	hv := func(a float64, cs faults.Case) sample {
		return sample{dp: a, dr: a, up: a, ur: a, kind: faults.LG, cs: cs, place: "M", scale: 1}
	}
	lv := sample{dp: 1500, up: 1500, kind: faults.LG, cs: faults.Max, place: "P", scale: 1}
	pts := []sample{hv(400, faults.Max), hv(300, faults.Min), lv}
	knees := [4][]float64{{350}, {50}, {}, {60}}
	out := sweep(pts, knees, false)
	var sawKnee, sawLow bool
	for _, s := range out {
		switch {
		case s.dr > 0:
			if s.dr > 400*(1+1e-12) || s.dr < 300*(1-1e-12) || s.dp != s.dr || s.ur != s.dr {
				t.Errorf("11 kV family point %+v outside 300–400 A or off its ratio", s)
			}
			sawKnee = sawKnee || math.Abs(s.dp-350*(1-kneeOffset)) < 1e-9
			sawLow = sawLow || math.Abs(s.dp-300) < 1e-9
		default:
			if s.dp > 1500 || s.ur != 0 || s.up != s.dp {
				t.Errorf("400 V family point %+v above 1500 A or off its ratio", s)
			}
		}
		if !(s.scale < 1) {
			t.Errorf("swept point %+v not scaled down", s)
		}
	}
	if !sawKnee || !sawLow {
		t.Errorf("the sweep misses the knee just below 350 A (%v) or the minimum-case 300 A (%v)", sawKnee, sawLow)
	}
	// Neighbouring swept points are at most sweepStep apart.
	prev := 400.0
	for _, s := range out {
		if s.dr > 0 && s.dp != 350*(1-kneeOffset) && s.dp != 350*(1+kneeOffset) {
			if prev/s.dp > sweepStep*(1+1e-9) {
				t.Errorf("step from %g A to %g A exceeds %g", prev, s.dp, sweepStep)
			}
			prev = s.dp
		}
	}
}
