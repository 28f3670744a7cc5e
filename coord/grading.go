package coord

import (
	"fmt"
	"strings"

	"tripgrade/curves"
	"tripgrade/faults"
)

// gradeOutcome is the result of evaluating one sample.
type gradeOutcome struct {
	ok               bool // both devices operate: a margin exists
	dNoTrip, uNoTrip bool
	undefined        bool // some curve gives no time
	dUndefined       bool // the downstream device's curve gives no time
	margin, required float64
	tU, tD           float64
}

// grader evaluates the margin of one pair at fault samples.
type grader struct {
	c    *checker
	u, d *Timer
	// marginS is the pair's own required margin (from a [[pair]] entry or
	// the upstream relay's margin_s), 0 when the criteria's applies.
	marginS float64
	// up and down are the two devices' indices (for the margins hook).
	up, down int
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
		o.tD, stD = g.d.ClearingDir(s.dp, s.dr, s.dd, dBand)
		o.tU, stU = g.u.MeltDir(s.up, s.ur, s.ud, uBand)
	} else {
		o.tD, stD = g.d.OperateDir(s.dp, s.dr, s.dd, dBand)
		o.tU, stU = g.u.OperateDir(s.up, s.ur, s.ud, uBand)
	}
	switch {
	case stD == curves.NoTrip:
		o.dNoTrip = true
		return o
	case stD == curves.Undefined:
		o.undefined, o.dUndefined = true, true
		return o
	case stU == curves.Undefined:
		o.undefined = true
		return o
	case stU == curves.NoTrip:
		o.uNoTrip = true
		return o
	}
	o.ok = true
	o.margin = timeDiff(o.tU, o.tD)
	switch {
	case upFuse:
		o.required = (1 - crit.FuseMeltRatio) * o.tU
	case g.marginS > 0:
		o.required = g.marginS
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

// pairMargin returns the margin a pair must keep when the study sets one
// for it: a [[pair]] entry's margin_s first, then the upstream relay's
// margin_s; 0 when the criteria's applies. The note says where it came
// from.
func (c *checker) pairMargin(p Pair) (float64, string) {
	u, d := &c.s.Devices[p.Upstream], &c.s.Devices[p.Downstream]
	for _, r := range c.s.Pairs {
		if !r.Exclude && r.MarginS > 0 && r.Upstream == u.Name && r.Downstream == d.Name {
			return r.MarginS, fmt.Sprintf("margin %.3g s set for this pair by [[pair]]", r.MarginS)
		}
	}
	if u.Kind == Relay && u.MarginS > 0 {
		return u.MarginS, fmt.Sprintf("margin %.3g s set for %s as upstream device", u.MarginS, u.Name)
	}
	return 0, ""
}

// undefinedSpan collects the currents at which a device's curve gives no
// time.
type undefinedSpan struct {
	points int
	lo, hi float64
}

func (u *undefinedSpan) add(a float64) {
	if u.points == 0 || a < u.lo {
		u.lo = a
	}
	if u.points == 0 || a > u.hi {
		u.hi = a
	}
	u.points++
}

// text describes the span for a note: "ML-TX-FUSE's melting table at
// 35.2–79.9 A".
func (u undefinedSpan) text(name, what string) string {
	r := fmtA(u.lo) + " A"
	if u.hi > u.lo*(1+1e-3) {
		r = fmtA(u.lo) + "–" + fmtA(u.hi) + " A"
	}
	return fmt.Sprintf("%s's %s at %s", name, what, r)
}

// curveName says which curve of a device a grading time comes from.
func curveName(t *Timer, melting bool) string {
	switch {
	case t.Dev.Kind == Relay:
		return "curve"
	case melting:
		return "melting table"
	}
	return "clearing table"
}

// grading checks one backup pair over every fault of the downstream
// device's zone, both cases, every fault kind, and the sweep of each
// family of those faults down to the smallest current the downstream
// device sees (sweep.go).
func (c *checker) grading(p Pair) (Finding, error) {
	g := grader{c: c, u: c.timers[p.Upstream], d: c.timers[p.Downstream], up: p.Upstream, down: p.Downstream}
	var marginNote string
	g.marginS, marginNote = c.pairMargin(p)
	var worst *sample
	var best gradeOutcome
	var evaluated, dOps int
	var undefD, undefU undefinedSpan
	consider := func(s sample) {
		o := g.eval(s)
		// A swept point where the downstream device takes longer than a
		// fault is followed (it barely operates) measures no grading: the
		// fault-clearing check judges such slow clearing.
		if s.swept() && o.ok && o.tD > seqLimitS(c.s.Criteria) {
			return
		}
		switch {
		case o.dUndefined:
			undefD.add(s.key())
		case o.undefined:
			dOps++
			a, _ := governing(g.u, s.up, s.ur, s.ud)
			undefU.add(a)
		case !o.dNoTrip:
			dOps++
		}
		if !o.ok {
			return
		}
		if c.hook != nil {
			g.emitGrading(s, o)
		}
		evaluated++
		if worst == nil || o.margin-o.required < best.margin-best.required-tieTolerance {
			w := s
			worst, best = &w, o
		}
	}
	var pts []sample
	for _, cs := range faults.Cases {
		for _, k := range faults.Kinds {
			s, err := c.samples(c.pairPlaces(p), p.Upstream, p.Downstream, k, cs)
			if err != nil {
				return Finding{}, err
			}
			pts = append(pts, s...)
		}
	}
	for _, s := range pts {
		consider(s)
	}
	du, dd := &c.s.Devices[p.Upstream], &c.s.Devices[p.Downstream]
	sweepEach(pts, [4][]float64{knees(dd, Phase), knees(dd, Residual), knees(du, Phase), knees(du, Residual)}, false, consider)
	var uncovered []string
	if undefD.points > 0 {
		uncovered = append(uncovered, undefD.text(dd.Name, curveName(g.d, false)))
	}
	if undefU.points > 0 {
		uncovered = append(uncovered, undefU.text(du.Name, curveName(g.u, g.u.Dev.Kind == Fuse)))
	}
	var f Finding
	switch {
	case evaluated > 0:
		f = atLeast(Grading, best.margin, best.required, "s")
		ref := FaultRef{Kind: worst.kind, Case: worst.cs, Place: worst.place, Interpolated: worst.swept(), Scale: worst.scale,
			DeviceS: best.tD, OtherS: best.tU}
		ref.DeviceA, ref.DeviceQty = governing(g.d, worst.dp, worst.dr, worst.dd)
		ref.OtherA, ref.OtherQty = governing(g.u, worst.up, worst.ur, worst.ud)
		f.Fault = &ref
		f.Note = marginNote
		if len(uncovered) > 0 {
			f.Note = joinNotes(f.Note, "not checked where no curve gives a time: "+strings.Join(uncovered, "; ")+" (outside a table's points)")
			if f.Verdict == Pass {
				f.Verdict = Warn
			}
		}
	case dOps == 0 && undefD.points == 0:
		f = unchecked(Grading, "the downstream device does not operate for any fault in its zone (see primary sensitivity)")
	case len(uncovered) > 0:
		f = unchecked(Grading, "no curve gives a time at the fault currents of this zone: "+strings.Join(uncovered, "; ")+" (outside a table's points)")
	default:
		f.Check, f.Verdict = Grading, Pass
		f.Note = "the upstream device does not operate for any fault that the downstream device clears (see backup sensitivity)"
	}
	f.Device, f.Other = dd.Name, du.Name
	return f, nil
}

// joinNotes joins the parts of a note that are not empty with "; ".
func joinNotes(parts ...string) string {
	var out []string
	for _, p := range parts {
		if p != "" {
			out = append(out, p)
		}
	}
	return strings.Join(out, "; ")
}

// governing returns the current that sets a device's time and which it
// is: the residual current when a ground stage is faster, else the phase
// current.
func governing(t *Timer, phaseA, residualA float64, d Dirs) (float64, Quantity) {
	if t.Dev.Kind == Relay && t.Ground[Nominal] != nil && t.Phase[Nominal] != nil {
		tg, sg := t.groups(phaseA, residualA, d, Nominal, groundStages)
		tp, sp := t.groups(phaseA, residualA, d, Nominal, phaseStages)
		if sg == curves.Operates && (sp != curves.Operates || tg < tp) {
			return residualA, Residual
		}
	}
	if t.Dev.Kind == Relay && t.Phase[Nominal] == nil {
		return residualA, Residual
	}
	return phaseA, Phase
}

// pairPlaces are the faults a pair is graded on: those for which the
// upstream device backs the downstream one up, or, for a pair the study
// adds by hand, the downstream device's whole zone.
func (c *checker) pairPlaces(p Pair) []faults.Place {
	if pl := c.topo.PairPlaces(p.Upstream, p.Downstream); pl != nil {
		return pl
	}
	return c.places[p.Downstream]
}

// samples solves every fault of the given places of kind k in case cs and
// returns what devices d (downstream) and u (upstream) see.
func (c *checker) samples(places []faults.Place, u, d int, k faults.Kind, cs faults.Case) ([]sample, error) {
	var out []sample
	for _, pl := range places {
		sol, err := c.sol.solve(pl, k, cs)
		if err != nil {
			return nil, err
		}
		if !sol.Energised() {
			continue
		}
		dp, dr, dd := c.measure(d, sol)
		up, ur, ud := c.measure(u, sol)
		if dp == 0 && dr == 0 {
			continue
		}
		out = append(out, sample{dp: dp, dr: dr, up: up, ur: ur, dd: dd, ud: ud, kind: k, cs: cs, place: c.names.name(pl), at: pl, scale: 1})
	}
	return out, nil
}
