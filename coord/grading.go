package coord

import (
	"fmt"
	"math"
	"sort"

	"tripgrade/curves"
	"tripgrade/faults"
)

// sweepSteps is how many log-spaced points the grading check puts between
// two neighbouring solved fault levels. Inverse-time curves are smooth in
// log–log space, so two dozen points per interval put a sample within a
// few per cent of current of any crossing.
const sweepSteps = 24

// sample is one fault as two devices see it.
type sample struct {
	dp, dr, up, ur float64 // downstream and upstream phase and residual currents
	kind           faults.Kind
	cs             faults.Case
	place          string
	interpolated   bool
}

// key is the current that orders samples along the downstream device's
// curve.
func (s sample) key() float64 {
	if s.dp > 0 {
		return s.dp
	}
	return s.dr
}

func (s sample) scaled(k float64) sample {
	s.dp, s.dr, s.up, s.ur = s.dp*k, s.dr*k, s.up*k, s.ur*k
	s.interpolated = true
	return s
}

// gradeOutcome is the result of evaluating one sample.
type gradeOutcome struct {
	ok               bool // both devices operate: a margin exists
	dNoTrip, uNoTrip bool
	undefined        bool
	margin, required float64
	tU, tD           float64
}

// grader evaluates the margin of one pair at fault samples.
type grader struct {
	c    *checker
	u, d *Timer
}

func (g grader) eval(s sample) gradeOutcome {
	crit := g.c.s.Criteria
	uBand, dBand := Nominal, Nominal
	if crit.WorstCaseTimes && crit.Components == nil {
		uBand, dBand = Early, Late
	}
	var o gradeOutcome
	var stD, stU curves.Status
	upFuse, downFuse := g.u.Dev.Kind == Fuse, g.d.Dev.Kind == Fuse
	if upFuse {
		o.tD, stD = g.d.Clearing(s.dp, s.dr, dBand)
		o.tU, stU = g.u.Melt(s.up, s.ur, uBand)
	} else {
		o.tD, stD = g.d.Operate(s.dp, s.dr, dBand)
		o.tU, stU = g.u.Operate(s.up, s.ur, uBand)
	}
	switch {
	case stD == curves.NoTrip:
		o.dNoTrip = true
		return o
	case stD == curves.Undefined || stU == curves.Undefined:
		o.undefined = true
		return o
	case stU == curves.NoTrip:
		o.uNoTrip = true
		return o
	}
	o.ok = true
	o.margin = o.tU - o.tD
	switch {
	case upFuse:
		o.required = (1 - crit.FuseMeltRatio) * o.tU
	case downFuse:
		o.required = crit.MarginFuseS
	case crit.Components != nil:
		k := crit.Components
		o.required = (2*g.d.Dev.Accuracy.ClassPct+k.CTErrorPct)/100*o.tD + g.d.Dev.BreakerS + k.OvertravelS + k.SafetyS
	default:
		o.required = crit.MarginS
	}
	return o
}

// grading checks one backup pair over every fault of the downstream
// device's zone, both cases, every fault kind, and a dense sweep between
// neighbouring solved fault levels.
func (c *checker) grading(p Pair) (Finding, error) {
	g := grader{c: c, u: c.timers[p.Upstream], d: c.timers[p.Downstream]}
	f := Finding{Check: Grading, Device: g.d.Dev.Name, Other: g.u.Dev.Name}
	var worst *sample
	var best gradeOutcome
	var evaluated, dOps, undefined int
	consider := func(s sample) {
		o := g.eval(s)
		switch {
		case o.undefined:
			undefined++
		case !o.dNoTrip:
			dOps++
		}
		if !o.ok {
			return
		}
		evaluated++
		if worst == nil || o.margin-o.required < best.margin-best.required-tieTolerance {
			w := s
			worst, best = &w, o
		}
	}
	for _, cs := range faults.Cases {
		for _, k := range faults.Kinds {
			pts, err := c.samples(p.Downstream, p.Upstream, p.Downstream, k, cs)
			if err != nil {
				return f, err
			}
			for _, s := range pts {
				consider(s)
			}
			for _, s := range sweep(pts) {
				consider(s)
			}
		}
	}
	switch {
	case evaluated > 0:
		f = atLeast(Grading, best.margin, best.required, "s")
		f.Device, f.Other = g.d.Dev.Name, g.u.Dev.Name
		ref := FaultRef{Kind: worst.kind, Case: worst.cs, Place: worst.place, Interpolated: worst.interpolated,
			DeviceS: best.tD, OtherS: best.tU}
		ref.DeviceA, ref.DeviceQty = governing(g.d, worst.dp, worst.dr)
		ref.OtherA, ref.OtherQty = governing(g.u, worst.up, worst.ur)
		f.Fault = &ref
		if undefined > 0 {
			f.Note = fmt.Sprintf("%d fault points outside a curve's defined range were left out", undefined)
		}
	case dOps == 0 && undefined == 0:
		f = unchecked(Grading, "the downstream device does not operate for any fault in its zone (see primary sensitivity)")
		f.Device, f.Other = g.d.Dev.Name, g.u.Dev.Name
	case undefined > 0:
		f = unchecked(Grading, "a curve is not defined at the fault currents of this zone (outside a table's points)")
		f.Device, f.Other = g.d.Dev.Name, g.u.Dev.Name
	default:
		f.Verdict = Pass
		f.Note = "the upstream device does not operate for any fault that the downstream device clears (see backup sensitivity)"
	}
	return f, nil
}

// governing returns the current that sets a device's time and which it
// is: the residual current when a ground stage is faster, else the phase
// current.
func governing(t *Timer, phaseA, residualA float64) (float64, Quantity) {
	if t.Dev.Kind == Relay && t.Ground[Nominal] != nil && t.Phase[Nominal] != nil {
		tg, sg := t.Ground[Nominal].Time(residualA)
		tp, sp := t.Phase[Nominal].Time(phaseA)
		if sg == curves.Operates && (sp != curves.Operates || tg < tp) {
			return residualA, Residual
		}
	}
	if t.Dev.Kind == Relay && t.Phase[Nominal] == nil {
		return residualA, Residual
	}
	return phaseA, Phase
}

// samples solves every fault of zone z's places of kind k in case cs and
// returns what devices d (downstream) and u (upstream) see.
func (c *checker) samples(zone, u, d int, k faults.Kind, cs faults.Case) ([]sample, error) {
	n := c.s.Network
	var out []sample
	for _, pl := range c.places[zone] {
		sol, err := c.sol.solve(pl, k, cs)
		if err != nil {
			return nil, err
		}
		if !sol.Energised() {
			continue
		}
		dp, dr := Measured(sol.At(c.s.Devices[d].Point))
		up, ur := Measured(sol.At(c.s.Devices[u].Point))
		if dp == 0 && dr == 0 {
			continue
		}
		out = append(out, sample{dp: dp, dr: dr, up: up, ur: ur, kind: k, cs: cs, place: PlaceName(n, pl)})
	}
	return out, nil
}

// sweep returns points between neighbouring solved samples, log-spaced in
// the downstream current, each with the currents of the nearer solved
// sample scaled to it, so that a curve crossing between two solved fault
// levels cannot hide.
func sweep(pts []sample) []sample {
	sorted := append([]sample(nil), pts...)
	sort.SliceStable(sorted, func(i, j int) bool { return sorted[i].key() < sorted[j].key() })
	var out []sample
	for i := 0; i+1 < len(sorted); i++ {
		a, b := sorted[i], sorted[i+1]
		ka, kb := a.key(), b.key()
		if !(ka > 0) || kb/ka < 1+1e-6 {
			continue
		}
		for j := 1; j < sweepSteps; j++ {
			x := ka * math.Pow(kb/ka, float64(j)/sweepSteps)
			near := a
			if 2*j >= sweepSteps {
				near = b
			}
			s := near.scaled(x / near.key())
			s.place = fmt.Sprintf("between %s and %s", a.place, b.place)
			out = append(out, s)
		}
	}
	return out
}
