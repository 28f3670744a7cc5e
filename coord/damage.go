package coord

import (
	"errors"
	"fmt"
	"math"

	"tripgrade/curves"
	"tripgrade/faults"
)

// owners returns, per branch, the first device (in study order) whose
// zone contains it, or −1.
func (c *checker) owners() []int {
	own := make([]int, c.s.Network.BranchCount())
	for b := range own {
		own[b] = -1
	}
	for i, z := range c.topo.Zones {
		for _, b := range z.Branches {
			if own[b] < 0 {
				own[b] = i
			}
		}
	}
	return own
}

// damageSubject is one piece of equipment as the damage check judges it:
// its withstand, where its current is measured, the faults it carries
// and what the note must say about the withstand.
type damageSubject struct {
	name      string
	withstand curves.Characteristic
	at        faults.Point
	places    []faults.Place
	note      string
}

// damage: for every transformer and cable with withstand data, the device
// whose zone holds it clears every through-fault before the withstand
// time, over the solved faults and their sweep. A transformer is judged
// on every fault of the device's zone beyond it, a cable on every fault of
// the device's zone that flows through it.
func (c *checker) damage() ([]Finding, error) {
	n := c.s.Network
	var out []Finding
	own := c.owners()
	for b, eq := range c.s.Equipment {
		if eq == nil || (eq.Damage[0] == nil && eq.Cable == nil) {
			continue
		}
		fs, err := item(c.region, c.keep, partDamage, n.BranchName(b), c.region.branch(n, b), func() ([]Finding, error) {
			f, err := c.damageOfBranch(b, eq, own[b])
			return []Finding{f}, err
		})
		if err != nil {
			return nil, err
		}
		out = append(out, fs...)
	}
	// Three-winding transformers have no through-fault withstand curve
	// here: say so rather than let their absence read as checked.
	for i := range n.Transformers3 {
		hv := n.StarBranch(i, faults.HV)
		fs, _ := item(c.region, c.keep, partDamage, n.Transformers3[i].Name, c.region.branch(n, hv), func() ([]Finding, error) {
			f := unchecked(Damage, "no through-fault withstand curve for a three-winding transformer: check its windings by hand")
			f.Device, f.Other = "-", n.Transformers3[i].Name
			if dev := own[hv]; dev >= 0 {
				f.Device = c.s.Devices[dev].Name
			}
			return []Finding{f}, nil
		})
		out = append(out, fs...)
	}
	return out, nil
}

// damageOfBranch judges the protected equipment eq of branch b, whose
// zone is device dev's (−1: no device's).
func (c *checker) damageOfBranch(b int, eq *Equipment, dev int) (Finding, error) {
	name := c.s.Network.BranchName(b)
	if dev < 0 {
		f := unchecked(Damage, "no device's zone holds it: it is unprotected in this study")
		f.Device, f.Other = "-", name
		return f, nil
	}
	down := c.topo.Downstream[b]
	sub := damageSubject{name: name}
	if eq.Damage[0] != nil {
		var err error
		var nc *noWithstand
		sub, err = c.transformerSubject(b, eq, dev)
		if errors.As(err, &nc) {
			f := unchecked(Damage, nc.Error())
			f.Device, f.Other = c.s.Devices[dev].Name, name
			return f, nil
		}
		if err != nil {
			return Finding{}, err
		}
	} else {
		sub.withstand = eq.Cable
		sub.places = c.places[dev]
		sub.at = faults.Point{Branch: b, End: otherEnd(down)}
	}
	return c.damageOf(dev, sub)
}

// noWithstand is a transformer with no through-fault withstand curve to
// judge it by; its finding is "not checked".
type noWithstand struct{ msg string }

func (e *noWithstand) Error() string { return e.msg }

// transformerSubject prepares a transformer for the damage check: its
// withstand on the downstream side (for categories III and IV with the
// source impedance of IEEE C57.109's mechanical part), measured at its
// downstream terminal, over the faults of the device's zone beyond it.
func (c *checker) transformerSubject(b int, eq *Equipment, dev int) (damageSubject, error) {
	n := c.s.Network
	down := c.topo.Downstream[b]
	side := 0
	if down == faults.To {
		side = 1
	}
	sub := damageSubject{name: n.BranchName(b), withstand: eq.Damage[side], at: faults.Point{Branch: b, End: down}}
	sub.note = fmt.Sprintf("IEEE C57.109 category %s", eq.Category)
	if tf, ok := sub.withstand.(*curves.ThroughFault); ok && eq.Category >= curves.CategoryIII {
		zs, bus, err := c.sourceZPct(b, otherEnd(down))
		if err != nil {
			return sub, err
		}
		set := tf.Settings()
		set.SourceZPct = zs
		withSource, err := curves.NewThroughFault(set)
		if err != nil {
			// A weak supply (an outage scenario's long way round) can
			// hold every through-fault below the curve's start: there is
			// no curve to judge by, which is said, not passed.
			return sub, &noWithstand{fmt.Sprintf("IEEE C57.109 category %s with the source impedance %.3g %% (maximum-case Thevenin impedance at %s): %v; no withstand curve to judge by",
				eq.Category, zs, n.Buses[bus].Name, err)}
		}
		sub.withstand = withSource
		sub.note += fmt.Sprintf(", source impedance %.3g %% on the rating (maximum-case Thevenin impedance at %s)", zs, n.Buses[bus].Name)
	}
	beyond := c.busesBeyond(b)
	// The faults of the device's zone, and the buses where the devices it
	// backs up sit (the transformer's through-fault just beyond them).
	var ps placeSet
	for _, pl := range c.places[dev] {
		ps.add(pl)
	}
	for _, m := range c.topo.Zones[dev].Next {
		ps.add(faults.AtBus(DeviceBus(n, c.s.Devices[m])))
	}
	for _, pl := range ps.list {
		// A fault just inside the transformer at its terminal is the
		// terminal bus's fault seen from the other side of the current
		// transformer: at the downstream terminal only a backfeed (a
		// parallel unit's share) would flow, not the winding current.
		if pl.Branch == b {
			continue
		}
		if beyond[c.eng.PlaceBus(pl)] {
			sub.places = append(sub.places, pl)
		}
	}
	return sub, nil
}

// sourceZPct returns the source impedance of transformer b seen from its
// supply terminal (end e) in percent on the transformer's rating: the
// maximum-case Thevenin impedance there, |Z| = c_max·Un/(√3·I"k3)
// (IEC 60909-0), referred to the rated voltage of that winding. It is 0
// when no current reaches that bus.
func (c *checker) sourceZPct(b int, e faults.End) (float64, int, error) {
	n := c.s.Network
	bus := pointBus(n, faults.Point{Branch: b, End: e})
	sol, err := c.sol.solve(faults.AtBus(bus), faults.LLL, faults.Max)
	if err != nil {
		return 0, bus, err
	}
	ia := sol.FaultCurrents().PhaseMaxA()
	if !(ia > 0) {
		return 0, bus, nil
	}
	kv := n.Buses[bus].KV
	zOhm := c.s.Faults.VoltageFactor(kv, faults.Max) * kv * 1000 / (math.Sqrt(3) * ia)
	tr := n.Transformer(b)
	kvw := tr.KVFrom
	if e == faults.To {
		kvw = tr.KVTo
	}
	return zOhm / (kvw * kvw / tr.MVA) * 100, bus, nil
}

// busesBeyond returns the buses forward of branch b: its downstream bus
// and everything reached from there away from the sources.
func (c *checker) busesBeyond(b int) map[int]bool {
	n := c.s.Network
	t := c.topo
	start := pointBus(n, faults.Point{Branch: b, End: t.Downstream[b]})
	seen := map[int]bool{start: true}
	queue := []int{start}
	for len(queue) > 0 {
		x := queue[0]
		queue = queue[1:]
		for _, br := range t.BranchesAt(x) {
			if br == b || pointBus(n, faults.Point{Branch: br, End: otherEnd(t.Downstream[br])}) != x {
				continue
			}
			if y := pointBus(n, faults.Point{Branch: br, End: t.Downstream[br]}); !seen[y] {
				seen[y] = true
				queue = append(queue, y)
			}
		}
	}
	return seen
}

// damageTally counts the points of a damage check that give no margin.
type damageTally struct {
	noTrip      int           // solved faults the device does not clear
	undefined   undefinedSpan // the device's curve gives no time
	below       int           // under the withstand curve's start (overload, not a through-fault)
	beyond      undefinedSpan // above a transformer curve's end with no law to continue
	extended    int           // above a transformer curve's end, by its I²t law
	long        int           // points left out: a cable cleared after its adiabatic withstand beyond 5 s
	lowerBound  int           // cable points beyond 5 s judged on the adiabatic withstand as a lower bound
	byClearing  int           // cable points beyond 5 s the device does not clear in time, within the maximum clearing time
	endA, lowA  float64       // the transformer curve's span, for the note
	transformer bool
}

// withstandAt returns the equipment's withstand time at a current, or ok
// false when the curve gives none there (counted in the tally).
func (tl *damageTally) withstandAt(w curves.Characteristic, a float64) (float64, bool) {
	t, st := w.Time(a)
	if st == curves.Operates {
		return t, true
	}
	_, hi := w.Span()
	switch lim := w.(type) {
	case *curves.ThroughFault:
		if a > hi {
			if t, ok := lim.BeyondEnd(a); ok {
				tl.extended++
				return t, true
			}
			tl.beyond.add(a)
			return 0, false
		}
	}
	tl.below++
	return 0, false
}

// damageOf judges one piece of equipment against the device that clears
// its through-faults.
func (c *checker) damageOf(dev int, sub damageSubject) (Finding, error) {
	t := c.timers[dev]
	d := &c.s.Devices[dev]
	var pts []sample
	for _, cs := range faults.Cases {
		for _, k := range faults.Kinds {
			for _, pl := range sub.places {
				sol, err := c.sol.solve(pl, k, cs)
				if err != nil {
					return Finding{}, err
				}
				if !sol.Energised() {
					continue
				}
				eqA := sol.At(sub.at).PhaseMaxA()
				if eqA <= 0 {
					continue
				}
				dp, dr, dd := c.measure(dev, sol)
				// The equipment current rides in the other's phase slot so
				// that the sweep scales it with the device's currents.
				pts = append(pts, sample{dp: dp, dr: dr, dd: dd, up: eqA, kind: k, cs: cs, place: c.names.name(pl), at: pl, scale: 1})
			}
		}
	}
	lo, hi := sub.withstand.Span()
	tl := damageTally{lowA: lo, endA: hi}
	_, tl.transformer = sub.withstand.(*curves.ThroughFault)
	all := append(pts, sweep(pts, [4][]float64{knees(d, Phase), knees(d, Residual), {lo, hi}}, true)...)
	var worst *sample
	var worstT, worstW, worstMargin float64
	for i := range all {
		s := all[i]
		tc, stc := t.ClearingDir(s.dp, s.dr, s.dd, Nominal)
		var tw float64
		onCurve := false // tw is the withstand curve's time, not a cable's lower bound
		if lim, cable := sub.withstand.(curves.I2tLimit); cable && s.up < lo {
			// Beyond the adiabatic limit's 5 s validity the conductor
			// loses heat while it carries the current, so I²t/I² is a
			// lower bound of its real withstand (IEC 60949's
			// non-adiabatic factor is at least 1): a clearing within it
			// passes; one beyond it is not checked (the cable's
			// continuous rating and thermal time constant, which the
			// study does not give, govern it).
			tw = lim.I2tA2S / (s.up * s.up)
			if stc != curves.Operates || tc > tw {
				// The device is slower than that, or does not
				// operate: the fault-clearing check holds the fault
				// to the maximum clearing time, which is enough
				// when it is within the cable's time.
				if c.s.Criteria.MaxClearingS <= tw {
					tl.byClearing++
				} else {
					tl.long++
				}
				continue
			}
			tl.lowerBound++
		} else {
			var ok bool
			if tw, ok = tl.withstandAt(sub.withstand, s.up); !ok {
				continue
			}
			onCurve = true
		}
		switch stc {
		case curves.NoTrip:
			// A swept point below the device's pickup is no fault of the
			// study; the sensitivity checks judge what the device detects.
			if !s.swept() {
				tl.noTrip++
			}
			continue
		case curves.Undefined:
			tl.undefined.add(s.key())
			continue
		}
		if c.hook != nil && onCurve && finite(tc) && finite(tw) {
			c.emitDamage(dev, s, tc, tw, sub.name)
		}
		if m := tw - tc; worst == nil || m < worstMargin-tieTolerance {
			worst, worstT, worstW, worstMargin = &all[i], tc, tw, m
		}
	}
	return c.damageFinding(d, t, sub, worst, worstT, worstW, tl), nil
}

// damageFinding builds the finding of a damage check from its worst point
// and the tally of the points that gave no margin.
func (c *checker) damageFinding(d *Device, t *Timer, sub damageSubject, worst *sample, worstT, worstW float64, tl damageTally) Finding {
	var gaps []string
	if tl.undefined.points > 0 {
		gaps = append(gaps, tl.undefined.text(d.Name, curveName(t, false)))
	}
	if tl.beyond.points > 0 {
		gaps = append(gaps, fmt.Sprintf("%s above the end of its withstand curve (%s A), where the curve follows no law to continue", tl.beyond.text(sub.name, "current"), fmtA(tl.endA)))
	}
	if worst == nil {
		why := "the device does not operate for any through-fault where the withstand curve is defined"
		switch {
		case tl.long > 0:
			why = fmt.Sprintf("at %d points the device clears after the cable's adiabatic withstand, beyond its 5 s validity, where the cable's continuous rating and thermal time constant (not in the study) govern", tl.long)
		case tl.byClearing > 0 && len(gaps) == 0:
			f := Finding{Check: Damage, Verdict: Pass, Device: d.Name, Other: sub.name,
				Note: fmt.Sprintf("every through-fault current is one the cable withstands for longer than 5 s, and longer than the maximum clearing time, %g s, to which the fault-clearing check holds every fault (the device itself clears none of them in that time)", c.s.Criteria.MaxClearingS)}
			return f
		}
		if len(gaps) > 0 {
			why = "no time at the through-fault currents: " + joinNotes(gaps...)
		}
		f := unchecked(Damage, why)
		f.Device, f.Other = d.Name, sub.name
		return f
	}
	f := atMost(Damage, worstT, worstW, "s")
	f.Device, f.Other = d.Name, sub.name
	ref := FaultRef{Kind: worst.kind, Case: worst.cs, Place: worst.place, Interpolated: worst.swept(), Scale: worst.scale,
		OtherA: worst.up, OtherQty: Phase, DeviceS: worstT, OtherS: worstW}
	ref.DeviceA, ref.DeviceQty = governing(t, worst.dp, worst.dr, worst.dd)
	f.Fault = &ref
	notes := []string{"clearing time against the withstand time at the equipment's current", sub.note}
	if tl.extended > 0 {
		notes = append(notes, fmt.Sprintf("above the curve's end at %s A (the largest through-fault current its impedances allow) its I²t law is continued (IEEE C57.109's own form)", fmtA(tl.endA)))
	}
	if tl.below > 0 && tl.transformer {
		notes = append(notes, fmt.Sprintf("below %s A (2× rated) C57.109 sets no through-fault limit", fmtA(tl.lowA)))
	}
	if tl.noTrip > 0 {
		notes = append(notes, fmt.Sprintf("the device does not operate at %d through-fault points where the withstand curve is defined", tl.noTrip))
		if f.Verdict == Pass {
			f.Verdict = Warn
		}
	}
	if len(gaps) > 0 {
		notes = append(notes, "not checked: "+joinNotes(gaps...))
		if f.Verdict == Pass {
			f.Verdict = Warn
		}
	}
	if tl.lowerBound > 0 {
		notes = append(notes, "below the current the cable withstands for 5 s (the adiabatic limit's validity), I²t/I² is taken as a lower bound of its withstand (heat loss neglected)")
	}
	if tl.byClearing > 0 {
		notes = append(notes, fmt.Sprintf("at %d points beyond 5 s the device clears after the cable's adiabatic time or not at all; the fault-clearing check holds those faults to the maximum clearing time, %g s, which the cable withstands there", tl.byClearing, c.s.Criteria.MaxClearingS))
	}
	if tl.long > 0 {
		notes = append(notes, fmt.Sprintf("not checked: %d points where the device clears after the adiabatic withstand, which beyond 5 s understates what the cable bears (its continuous rating and thermal time constant, which the study does not give, govern there)", tl.long))
		if f.Verdict == Pass {
			f.Verdict = Warn
		}
	}
	f.Note = joinNotes(notes...)
	return f
}
