package coord

import (
	"math"
	"math/cmplx"
	"slices"
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

// timeTable holds the timings of the devices one fault is judged on, each
// computed on first use: the search for who must clear a fault may reach
// devices the exploration did not.
type timeTable struct {
	x     *netIndex
	v     *view
	k     faults.Kind
	ids   []int    // devices with a timing, in the order first asked
	rows  []timing // by slot
	slot  []int32  // device → slot, valid where stamp == gen
	stamp []uint32
	gen   uint32
}

func (x *netIndex) newTimeTable() *timeTable {
	nd := len(x.s.Devices)
	return &timeTable{x: x, slot: make([]int32, nd), stamp: make([]uint32, nd)}
}

// reset empties the table for the fault of kind k seen through v.
func (tt *timeTable) reset(v *view, k faults.Kind) {
	tt.v, tt.k = v, k
	tt.ids, tt.rows = tt.ids[:0], tt.rows[:0]
	tt.gen++
	if tt.gen == 0 {
		clear(tt.stamp)
		tt.gen = 1
	}
}

// get returns device d's timing, computing it on first use.
func (tt *timeTable) get(d int) *timing {
	if tt.stamp[d] != tt.gen {
		tt.put(d, tt.compute(d))
	}
	return &tt.rows[tt.slot[d]]
}

// put records device d's timing.
func (tt *timeTable) put(d int, tm timing) {
	tt.stamp[d] = tt.gen
	tt.slot[d] = int32(len(tt.rows))
	tt.ids = append(tt.ids, d)
	tt.rows = append(tt.rows, tm)
}

// compute works out device d's timing. A relay whose currents cannot
// reach any of its pickups (by the bound |Ix| ≤ |I0|+|I1|+|I2|) does not
// operate, and its phasors are not worked out.
func (tt *timeTable) compute(d int) timing {
	x := tt.x
	if lim := x.limits[d]; lim.cheap {
		c := tt.v.at(x.s.Devices[d].Point).Currents(tt.v.kinds[tt.k])
		var ph float64
		for _, i := range c.Seq {
			ph += abs(i)
		}
		if ph < lim.phaseA && 3*abs(c.Seq[0]) < lim.groundA {
			return timing{trip: noTime, up: noTime}
		}
	}
	return x.timeOf(d, tt.v.seen(d, tt.k), Nominal)
}

// copyFrom takes device d's timing from another table of the same fault
// node and kind (whose view sees d the same way).
func (tt *timeTable) copyFrom(base *timeTable, d int) {
	if tt.stamp[d] != tt.gen {
		tt.put(d, *base.get(d))
	}
}

// has reports whether device d has a timing in the table.
func (tt *timeTable) has(d int) bool { return tt.stamp[d] == tt.gen }

// operates reports whether device d trips for the fault (or would: a
// fuse above its table's currents melts, though the table gives no time).
func (tt *timeTable) operates(d int) bool {
	tm := tt.get(d)
	return !math.IsInf(tm.trip, 1) || tm.undef
}

// judge judges the fault of kind k of one element in the intact network,
// and its sequence when it is fed from more than one side.
func (x *netIndex) judge(ws *workspace, t *tally, crit Criteria, v *view, devs []int, ne nodeElem, k faults.Kind, key faultKey) error {
	tt := ws.tables[0]
	tt.reset(v, k)
	base := ws.node[k]
	for _, d := range devs {
		if v.hasOwn && x.s.Devices[d].Point.Branch == v.el.branch {
			tt.get(d)
		} else {
			tt.copyFrom(base, d)
		}
	}
	cl := v.search(tt.operates, nil)
	t.judged++
	if len(cl.direct) > 0 {
		t.outside[ne.index] = union(t.outside[ne.index], cl.direct)
	}
	for _, in := range cl.own {
		t.ownFaults[in.name]++
	}
	if len(cl.must) == 0 && len(cl.failed) == 0 {
		if len(cl.own) > 0 {
			t.ownOnly[ne.index] = true
		}
		return nil // fed only along paths without any device of the study
	}
	rec := clearRecord{key: key, place: ne.place, must: cl.must, failed: cl.failed, board: cl.board, isoS: math.Inf(1), above: -1}
	if k.Earth() {
		// An earth fault beyond a delta winding from a device that must
		// clear it, or that stands unoperated between it and an infeed,
		// where the study declares protection it does not model for such
		// faults (earth_faults_cleared_by): left to that protection,
		// counted, not judged.
		for _, d := range append(cl.must[:len(cl.must):len(cl.must)], cl.earthBy...) {
			if x.s.Devices[d].EarthFaultsBy != "" && beyondDelta(v.seen(d, k)) {
				rec.isoS, rec.earthBy = math.NaN(), d+1
				t.clears[ne.index].offer(rec)
				return nil
			}
		}
	}
	m := -1
	if cl.sides <= 1 && len(cl.failed) == 0 && len(cl.direct) == 0 && len(cl.own) == 0 && onePoint(x, cl.must) {
		m = cl.must[0]
		for _, d := range cl.must[1:] {
			if tt.get(d).trip+x.breaker(d) < tt.get(m).trip+x.breaker(m) {
				m = d
			}
		}
		// Fed from one side, the fault is isolated when the fastest
		// device there opens, unless the opening leaves it connected to
		// an infeed some other way (a transformer fault fed back through
		// its parallel unit once its own HV breaker opens): then the
		// sequence follows it.
		if x.isl.fedAfter(x.s.Devices[m].Point, ne.place, v.cs) {
			m = -1
		}
	}
	if m >= 0 {
		rec.isoS = tt.get(m).trip + x.breaker(m)
		if tt.get(m).above {
			rec.above = m
		}
		if tt.get(m).undef {
			rec.isoS, rec.undef, rec.undefSet = math.NaN(), m, true
		} else if x.hook != nil && !math.IsInf(rec.isoS, 1) {
			x.emitClearing(crit, m, &tt.get(m).seen, tt.get(m).trip, ne.place, key)
		}
		x.judgeOthers(ws, t, crit, v, tt, cl.must, m, ne, k, key)
	} else {
		iso, evs, failed, outside, err := x.sequence(ws, t, crit, v, tt, cl, ne, k, key)
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

// beyondDelta reports whether an earth fault lies beyond a delta winding
// from a device: it drives no residual current through the device and
// leaves no zero-sequence voltage at the device's bus (a fault on the
// device's own side of the winding raises one there). Phases and voltages
// summed leave some 1e-16 of their size; 1e-9 of it is none.
func beyondDelta(s Seen) bool {
	v0 := abs(s.V[0] + s.V[1] + s.V[2])
	return s.ResidualA() <= 1e-9*s.PhaseA() && v0 <= 1e-9*abs(s.Pre[0])
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
// Elements of one node share their sweeps where neither device sits on
// the element's own branch (they see the same currents).
func (x *netIndex) judgeOthers(ws *workspace, t *tally, crit Criteria, v *view, tt *timeTable, must []int, m int, ne nodeElem, k faults.Kind, key faultKey) {
	upB, downB := bands(crit)
	sm := tt.get(m).seen
	tmm := tt.get(m)
	for i := 0; i < len(tt.ids); i++ {
		d := tt.ids[i]
		if contains(must, d) || math.IsInf(tt.rows[i].up, 1) {
			continue
		}
		sd := tt.rows[i].seen
		if upB == Nominal && downB == Nominal {
			x.offerMargin(t, crit, d, m, &sd, &sm, tt.rows[i].up, tmm.trip, 1, ne, key, false)
		} else {
			td, tm := x.timeOf(d, sd, upB), x.timeOf(m, sm, downB)
			x.offerMargin(t, crit, d, m, &sd, &sm, td.up, tm.trip, 1, ne, key, false)
		}
		// The sweep judges the devices behind m on its side (its backups,
		// by the zones): where a crossing between solved fault levels can
		// hide. Every other device is judged at every solved fault.
		if k == faults.LLG || v.cs != faults.Max || !(v.sweepTo[k] < 1) || !x.backsUp(d, m) {
			continue
		}
		own := v.hasOwn && (x.s.Devices[d].Point.Branch == v.el.branch || x.s.Devices[m].Point.Branch == v.el.branch)
		if !own {
			sk := sweepKey{d, m, k}
			if ws.swept[sk] {
				continue
			}
			ws.swept[sk] = true
		}
		ws.scales = sweepScales(x, d, m, &sd, &sm, v.sweepTo[k], ws.scales[:0])
		for j, s := range ws.scales {
			kk := key
			kk.sweep = j + 1
			sds, sms := scaleSeen(sd, s), scaleSeen(sm, s)
			td, tm := x.timeOf(d, sds, upB), x.timeOf(m, sms, downB)
			x.offerMargin(t, crit, d, m, &sds, &sms, td.up, tm.trip, s, ne, kk, false)
		}
	}
}

// backsUp reports whether device d backs device m up (by the zones).
func (x *netIndex) backsUp(d, m int) bool {
	return x.topo != nil && contains(x.topo.Zones[d].Next, m)
}

// sweepKey names a sweep of one pair of devices for one kind at a node.
type sweepKey struct {
	d, m int
	k    faults.Kind
}

// contains reports whether ds holds d.
func contains(ds []int, d int) bool {
	for _, e := range ds {
		if e == d {
			return true
		}
	}
	return false
}

// offerMargin records device d's margin over device m for what each sees,
// d operating (as the upstream device) at upS and m tripping at mTrip.
func (x *netIndex) offerMargin(t *tally, crit Criteria, d, m int, sd, sm *Seen, upS, mTrip, scale float64, ne nodeElem, key faultKey, tripped bool) {
	// A must-clear device slower than a sequence is followed leaves the
	// fault uncleared: the clearing check reports that, not a margin.
	if math.IsInf(upS, 1) || math.IsInf(mTrip, 1) || mTrip > seqLimitS(crit) {
		return
	}
	if x.hook != nil {
		x.emitMargin(crit, d, m, sd, sm, upS, mTrip, scale, ne.place, key, false)
	}
	if key.sweep == 0 {
		t.ops[d].count++
	}
	margin, req := x.marginOf(crit, d, m, upS, mTrip)
	if !t.ops[d].worse(margin-req, key) {
		return
	}
	r := opRecord{slack: margin - req, margin: margin, required: req, key: key, place: ne.place, scale: scale,
		relief: m, dS: upS, reliefS: mTrip, tripped: tripped, count: t.ops[d].count}
	r.dA, r.dQty = x.timers[d].governingSeen(sd)
	r.reliefA, r.reliefQty = x.timers[m].governingSeen(sm)
	r.forward = x.forward(d, sd)
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
// so every point is a fault the network can give. The shares are
// appended to out (a worker's buffer), largest first.
func sweepScales(x *netIndex, d, m int, sd, sm *Seen, floor float64, out []float64) []float64 {
	const steps = 16
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
	slices.Sort(out)
	slices.Reverse(out)
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
