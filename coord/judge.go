package coord

import (
	"math"
	"math/cmplx"
	"sort"

	"tripgrade/curves"
	"tripgrade/faults"
)

// bands returns the tolerance bands margins are judged in: nominal times,
// or upstream earliest against downstream latest.
func bands(crit Criteria) (up, down Band) {
	if crit.WorstCaseTimes && crit.Components == nil {
		return Early, Late
	}
	return Nominal, Nominal
}

// judge judges the fault of kind k of one element in the intact network,
// and its sequence when it is fed from more than one side.
func (x *netIndex) judge(ws *workspace, t *tally, crit Criteria, v *view, devs []int, ne nodeElem, k faults.Kind, key faultKey) error {
	times := make(map[int]timing, len(devs))
	for _, d := range devs {
		times[d] = x.timeOf(d, v.seen(d, k), Nominal)
	}
	ops := func(d int) bool { return !math.IsInf(times[d].trip, 1) }
	cl := v.search(ops, nil)
	t.judged++
	if len(cl.direct) > 0 {
		t.outside[ne.index] = union(t.outside[ne.index], cl.direct)
	}
	for _, in := range cl.own {
		t.ownFaults[in.name]++
	}
	if len(cl.must) == 0 && len(cl.failed) == 0 {
		return nil // fed only along paths without any device of the study
	}
	rec := clearRecord{key: key, place: ne.place, must: cl.must, failed: cl.failed, board: cl.board, isoS: math.Inf(1)}
	if len(cl.failed) == 0 && len(cl.direct) == 0 && len(cl.own) == 0 && onePoint(x, cl.must) {
		// One side: the fastest device there isolates the fault.
		m := cl.must[0]
		for _, d := range cl.must[1:] {
			if times[d].trip+x.breaker(d) < times[m].trip+x.breaker(m) {
				m = d
			}
		}
		rec.isoS = times[m].trip + x.breaker(m)
		x.judgeOthers(t, crit, v, devs, times, cl.must, m, ne, k, key)
	} else {
		iso, evs, failed, outside, err := x.sequence(ws, t, crit, v, devs, times, cl, ne, k, key)
		if err != nil {
			return err
		}
		rec.isoS, rec.sequence, rec.failed = iso, evs, failed
		if len(outside) > 0 {
			t.outside[ne.index] = union(t.outside[ne.index], outside)
			return nil
		}
	}
	t.clears[ne.index].offer(rec)
	return nil
}

// union returns the sorted union of two sorted name lists.
func union(a, b []string) []string {
	seen := map[string]bool{}
	var out []string
	for _, s := range append(append([]string(nil), a...), b...) {
		if !seen[s] {
			seen[s] = true
			out = append(out, s)
		}
	}
	sort.Strings(out)
	return out
}

// onePoint reports whether every device of ds sits at one branch end.
func onePoint(x *netIndex, ds []int) bool {
	for _, d := range ds[1:] {
		if x.s.Devices[d].Point != x.s.Devices[ds[0]].Point {
			return false
		}
	}
	return true
}

// judgeOthers judges every device that operates for a fault that device
// m clears alone: its margin over m, at the solved fault and, for the
// kinds whose currents all scale with the fault's, at reduced currents
// down to m's pickup (the same fault through a growing fault impedance).
func (x *netIndex) judgeOthers(t *tally, crit Criteria, v *view, devs []int, times map[int]timing, must []int, m int, ne nodeElem, k faults.Kind, key faultKey) {
	upB, downB := bands(crit)
	isMust := map[int]bool{}
	for _, d := range must {
		isMust[d] = true
	}
	sm := times[m].seen
	for _, d := range devs {
		if isMust[d] || math.IsInf(times[d].up, 1) {
			continue
		}
		sd := times[d].seen
		x.offerMargin(t, crit, d, m, sd, sm, upB, downB, 1, ne, key, false)
		if k == faults.LLG || v.cs != faults.Max || !(v.sweepTo[k] < 1) {
			continue
		}
		for i, s := range sweepScales(x, d, m, &sd, &sm, v.sweepTo[k]) {
			kk := key
			kk.sweep = i + 1
			x.offerMargin(t, crit, d, m, scaleSeen(sd, s), scaleSeen(sm, s), upB, downB, s, ne, kk, false)
		}
	}
}

// offerMargin records device d's margin over device m for what each sees.
func (x *netIndex) offerMargin(t *tally, crit Criteria, d, m int, sd, sm Seen, upB, downB Band, scale float64, ne nodeElem, key faultKey, tripped bool) {
	td := x.timeOf(d, sd, upB)
	tm := x.timeOf(m, sm, downB)
	// A must-clear device slower than a sequence is followed leaves the
	// fault uncleared: the clearing check reports that, not a margin.
	if math.IsInf(td.up, 1) || math.IsInf(tm.trip, 1) || tm.trip > seqLimitS(crit) {
		return
	}
	margin, req := x.marginOf(crit, d, m, td.up, tm.trip)
	r := opRecord{slack: margin - req, margin: margin, required: req, key: key, place: ne.place, scale: scale,
		relief: m, dS: td.up, reliefS: tm.trip, tripped: tripped}
	r.dA, r.dQty = x.timers[d].governingSeen(&sd)
	r.reliefA, r.reliefQty = x.timers[m].governingSeen(&sm)
	r.forward = x.forward(d, &sd)
	t.ops[d].offer(r)
}

// forward reports whether the current a device sees flows from its bus
// into its branch: its governing phase current (or 3I0) against the
// pre-fault voltage of that phase, within ±90° of the direction a fault in
// front of it gives.
func (x *netIndex) forward(d int, s *Seen) bool {
	a, q := x.timers[d].governingSeen(s)
	if a == 0 {
		return true
	}
	if q == Residual {
		// 3I0 against −3V0 turned by −45° (the default ground element).
		return decide(s.Residual(), -(s.V[0]+s.V[1]+s.V[2]), -45, 90) != Reverse
	}
	p := 0
	for i := range s.I {
		if cmplx.Abs(s.I[i]) > cmplx.Abs(s.I[p]) {
			p = i
		}
	}
	q2 := quadrature[p]
	return decide(s.I[p], s.Pre[q2[0]]-s.Pre[q2[1]], 45, 90) != Reverse
}

// governingSeen returns the current that sets a device's time and which
// quantity it is.
func (t *Timer) governingSeen(s *Seen) (float64, Quantity) {
	if t.Dev.Kind == Relay && t.Ground[Nominal] != nil {
		if t.Phase[Nominal] == nil {
			return s.groundA(t.Dev), Residual
		}
		tg, _ := t.relaySeen(s, Nominal, groundStages)
		tp, _ := t.relaySeen(s, Nominal, phaseStages)
		if tg < tp {
			return s.groundA(t.Dev), Residual
		}
	}
	return s.PhaseA(), Phase
}

// sweepScales lists the shares of the solved currents at which a margin
// between d (upstream) and m (downstream) is also judged: log-spaced from
// the solved fault down to the share floor (the minimum case's current
// at the same place) or m's lowest pickup, whichever is higher, and
// every stage pickup, definite-time knee and maximum-multiple point of
// both devices in that range. The same fault through a fault impedance
// of the Thevenin impedance's angle scales every current by one factor,
// so every point is a fault the network can give.
func sweepScales(x *netIndex, d, m int, sd, sm *Seen, floor float64) []float64 {
	const steps = 16
	var out []float64
	lowest := 1.0
	for _, st := range x.s.Devices[m].Stages {
		if a := quantityOf(sm, st.Measures, &x.s.Devices[m]); a > 0 {
			lowest = math.Min(lowest, st.PickupA/a)
		}
	}
	if x.s.Devices[m].Kind == Fuse && x.s.Devices[m].Clear != nil {
		if a := sm.PhaseA(); a > 0 {
			lo, _ := x.s.Devices[m].Clear.Span()
			lowest = math.Min(lowest, lo/a)
		}
	}
	lowest = math.Max(lowest, floor)
	if !(lowest > 0 && lowest < 1) {
		return nil
	}
	for i := 1; i < steps; i++ {
		out = append(out, math.Pow(lowest, float64(i)/steps))
	}
	knees := func(dev int, s *Seen) {
		for _, st := range x.s.Devices[dev].Stages {
			a := quantityOf(s, st.Measures, &x.s.Devices[dev])
			if a <= 0 {
				continue
			}
			for _, i := range []float64{st.PickupA * (1 + 1e-6), st.PickupA * maxMultipleOf(st)} {
				if f := i / a; f > lowest && f < 1 {
					out = append(out, f)
				}
			}
		}
	}
	knees(d, sd)
	knees(m, sm)
	sort.Sort(sort.Reverse(sort.Float64Slice(out)))
	return out
}

// maxMultipleOf returns the multiple of pickup above which an inverse
// stage is definite (0 when it has none).
func maxMultipleOf(st Stage) float64 {
	if c, ok := st.Curve.(curves.InverseTime); ok {
		return c.MaxMultiple
	}
	return 0
}

func quantityOf(s *Seen, q Quantity, d *Device) float64 {
	if q == Phase {
		return s.PhaseA()
	}
	return s.groundA(d)
}

// scaleSeen returns what a device sees for the same fault through a fault
// impedance that scales every current by f: currents f times, voltages
// moved from their pre-fault values by f times the change.
func scaleSeen(s Seen, f float64) Seen {
	c := complex(f, 0)
	for p := range s.I {
		s.I[p] *= c
		s.V[p] = s.Pre[p] + c*(s.V[p]-s.Pre[p])
	}
	s.Pol *= c
	s.Neutral *= c
	return s
}
