package coord

import (
	"math"

	"tripgrade/curves"
	"tripgrade/faults"
)

// The sweep between and below solved faults.
//
// A fault of one kind at one place, given more fault impedance, drives
// every current of the network down by one common factor for LLL, LL and
// LG faults (a single sequence current, or equal sequence currents, scaled
// by the impedance), and about so for LLG. So the currents of a solved
// fault, scaled down, are currents the network can deliver, in the same
// ratio at every device; scaled up beyond the solved (bolted, maximum
// case) fault, they are not. The sweep therefore groups the solved faults
// of a pair into families of one kind whose currents stand in one ratio at
// the two devices (a radial feeder's faults at every place, in both cases,
// usually form one family per kind), and scales each family's largest
// member down to the study's weakest fault of that kind at the family's
// places (the minimum case), never up. Across a transformer the ratio of each
// kind is the transformer's own, so no swept point carries a current
// through a transformer in a proportion no fault gives, and a residual
// current never exceeds what the neutral earthing lets through.

// sweepStep is the ratio between neighbouring swept currents: 2 %.
// Inverse-time curves and withstand curves are smooth in log–log space
// between their knees, which are sampled exactly, so a crossing between
// two swept points changes the margin by well under the 0.01 s the reports
// show.
const sweepStep = 1.02

// kneeOffset places samples just below and just above a knee (a pickup, a
// definite-time or maximum-multiple point, a table point), where the time
// of a device jumps or bends.
const kneeOffset = 1e-7

// sample is one fault as two devices see it: the checked (downstream)
// device and the other device or the protected equipment.
type sample struct {
	dp, dr, up, ur float64 // device's and other's phase and ground currents
	dd, ud         Dirs    // how their directional elements decided
	kind           faults.Kind
	cs             faults.Case
	place          string
	at             faults.Place // the place place names
	// scale is 1 for a solved fault and the factor applied to the solved
	// fault's currents for a swept point.
	scale float64
}

// key is the device's current that orders samples: its phase current,
// or its residual current when it carries no phase current.
func (s sample) key() float64 {
	if s.dp > 0 {
		return s.dp
	}
	return s.dr
}

func (s sample) scaled(k float64) sample {
	s.dp, s.dr, s.up, s.ur = s.dp*k, s.dr*k, s.up*k, s.ur*k
	s.scale *= k
	return s
}

// swept reports whether the sample is a point of the sweep.
func (s sample) swept() bool { return s.scale != 1 }

// familyResolution is the resolution at which two solved faults count as
// standing in the same ratio: their currents, each divided by the largest
// of the four, agree to within it (a radial network gives exactly equal
// ratios, up to the rounding of the solves). Two faults that fall either
// side of a rounding boundary form two families; each is still swept down
// to the weakest fault at its own places with the same ratio, so nothing
// is lost.
const familyResolution = 1e-6

// familyKey identifies a family: the kind, which currents are not zero,
// and the four currents in proportion, to familyResolution.
type familyKey struct {
	kind    faults.Kind
	nonZero [4]bool
	ratio   [4]int64
}

func keyOf(s sample) (familyKey, bool) {
	v := [4]float64{s.dp, s.dr, s.up, s.ur}
	norm := math.Max(math.Max(v[0], v[1]), math.Max(v[2], v[3]))
	if !(norm > 0) || !(s.key() > 0) {
		return familyKey{}, false
	}
	k := familyKey{kind: s.kind}
	for i, x := range v {
		k.nonZero[i] = x > 0
		k.ratio[i] = int64(math.Round(x / norm / familyResolution))
	}
	return k, true
}

// family is a set of solved samples of one kind in one ratio: its
// largest member and the places of all its members.
type family struct {
	top    sample
	places []string
}

// families groups the solved samples into families, in the order the
// families first appear.
func families(pts []sample) []family {
	var fs []family
	index := map[familyKey]int{}
	for _, p := range pts {
		k, ok := keyOf(p)
		if !ok {
			continue
		}
		i, seen := index[k]
		if !seen {
			index[k] = len(fs)
			fs = append(fs, family{top: p, places: []string{p.place}})
			continue
		}
		if p.key() > fs[i].top.key()*(1+tieTolerance) {
			fs[i].top = p
		}
		fs[i].places = append(fs[i].places, p.place)
	}
	return fs
}

// sweep returns the swept points of the solved samples. Each family's
// largest member is scaled from 1 down to the smallest current the device
// sees (with byOther, the other's phase current: the equipment's) for any
// solved fault of the same kind at the family's places, in either case:
// the study's own weakest fault there. So every current between the
// minimum-case and maximum-case levels of each kind and place is
// examined, also where the two cases' ratios differ, and no fault is
// examined below the minimum case the study sets for it. The scales are
// log-spaced by sweepStep, plus the points just below and above every
// knee in that range (knees[0] and knees[1] of the device's phase and
// residual currents, knees[2] and knees[3] of the other's).
func sweep(pts []sample, knees [4][]float64, byOther bool) []sample {
	var out []sample
	sweepEach(pts, knees, byOther, func(s sample) { out = append(out, s) })
	return out
}

// sweepEach hands the swept points of sweep to fn one by one, without
// keeping them.
func sweepEach(pts []sample, knees [4][]float64, byOther bool, fn func(sample)) {
	bound := func(s sample) (float64, int) {
		switch {
		case byOther:
			return s.up, 0
		case s.dp > 0:
			return s.dp, 0
		}
		return s.dr, 1
	}
	// The weakest solved fault of each kind at each place, per quantity.
	type at struct {
		kind  faults.Kind
		place string
		q     int
	}
	weakest := map[at]float64{}
	for _, p := range pts {
		if b, q := bound(p); b > 0 {
			k := at{p.kind, p.place, q}
			if w, ok := weakest[k]; !ok || b < w {
				weakest[k] = b
			}
		}
	}
	for _, fam := range families(pts) {
		top := fam.top
		a, q := bound(top)
		if !(a > 0) {
			continue
		}
		low := a
		for _, pl := range fam.places {
			if w, ok := weakest[at{top.kind, pl, q}]; ok && w < low {
				low = w
			}
		}
		lo := low / a
		n := int(math.Ceil(math.Log(1/lo)/math.Log(sweepStep) - 1e-9))
		for j := 1; j <= n; j++ {
			// Scales from just below 1 down to exactly lo.
			fn(top.scaled(math.Pow(lo, float64(j)/float64(n))))
		}
		v := [4]float64{top.dp, top.dr, top.up, top.ur}
		for i, ks := range knees {
			if !(v[i] > 0) {
				continue
			}
			for _, k := range ks {
				for _, f := range [2]float64{1 - kneeOffset, 1 + kneeOffset} {
					if s := k * f / v[i]; s >= lo && s < 1 {
						fn(top.scaled(s))
					}
				}
			}
		}
	}
}

// knees returns the currents where device d's time for quantity q jumps
// or bends: every stage pickup, definite-time and maximum-multiple point
// and minimum-time point, and a fuse's table points (phase only).
func knees(d *Device, q Quantity) []float64 {
	if d.Kind == Fuse {
		if q != Phase {
			return nil
		}
		var out []float64
		for _, t := range []*curves.Table{d.Melt, d.Clear} {
			if t != nil {
				for _, p := range t.Points() {
					out = append(out, p.CurrentA)
				}
			}
		}
		return out
	}
	var out []float64
	for _, s := range d.Stages {
		if s.Measures != q {
			continue
		}
		out = append(out, s.PickupA)
		if c, ok := s.Curve.(curves.InverseTime); ok {
			if c.MaxMultiple > 0 {
				out = append(out, c.MaxMultiple*c.PickupA)
			}
			if c.MinTimeS > 0 {
				if a, st := c.CurrentFor(c.MinTimeS); st == curves.Operates {
					out = append(out, a)
				}
			}
		}
	}
	return out
}
