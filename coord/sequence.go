package coord

import (
	"math"

	"tripgrade/faults"
)

// A device's progress towards operating during a fault. Inverse-time
// relays integrate dt/t(I) (the usual model of an induction disc or a
// numerical relay's timer: with the current changing in steps, a relay
// trips when the sum of each step's share of its operating time reaches
// one); a relay whose current falls below its pickup resets at once
// (numerical relays' instantaneous reset, an assumption). A fuse's
// clearing and melting are integrated the same way.
//
// seqState holds that progress for every device a sequence touches, in
// arrays of the worker's reused from fault to fault.
type seqState struct {
	prog, progUp []float64
	prog0        []float64 // prog at the start of the step being advanced
	tripAt       []float64 // NaN until the device has tripped
	upAt         []float64 // NaN until its upstream-time progress has reached one (a fuse melted)
	open         []bool
	firstA       []float64 // its current in the intact network
	proj         []float64 // its upstream-time projection in the current state (+Inf: none)
	stamp        []uint32
	gen          uint32
	ids          []int // devices touched, in order
}

func (x *netIndex) newSeqState() *seqState {
	nd := len(x.s.Devices)
	return &seqState{prog: make([]float64, nd), prog0: make([]float64, nd), progUp: make([]float64, nd), tripAt: make([]float64, nd), upAt: make([]float64, nd),
		open: make([]bool, nd), firstA: make([]float64, nd), proj: make([]float64, nd), stamp: make([]uint32, nd)}
}

func (st *seqState) reset() {
	st.ids = st.ids[:0]
	st.gen++
	if st.gen == 0 {
		clear(st.stamp)
		st.gen = 1
	}
}

// tracked reports whether device d is tracked already.
func (st *seqState) tracked(d int) bool { return st.stamp[d] == st.gen }

// touch starts tracking device d (firstA its intact current).
func (st *seqState) touch(d int, firstA float64) {
	if st.stamp[d] == st.gen {
		return
	}
	st.stamp[d] = st.gen
	st.ids = append(st.ids, d)
	st.prog[d], st.progUp[d], st.tripAt[d], st.upAt[d], st.open[d], st.firstA[d], st.proj[d] = 0, 0, math.NaN(), math.NaN(), false, firstA, math.Inf(1)
}

// candidate reports whether a device is followed through a sequence: it
// operates in the intact network. A device that does not may come to
// operate as others open and currents move to it; the search for who must
// clear the fault in each state finds those on the paths that feed it.
func (x *netIndex) candidate(d int, tm *timing) bool {
	return !math.IsInf(tm.trip, 1) || !math.IsInf(tm.up, 1)
}

// followFactor bounds which devices a sequence follows: those that, in the
// intact network, operate within followFactor times the must-clear
// devices' clearing time (plus a margin). An opening moves current
// between paths, raising a remaining device's current by a factor of two
// or so in a ring or between parallel circuits, which shortens an inverse
// time by less than that; a device four times slower than the clearing
// it waits for cannot catch up before the fault is isolated (an
// assumption, stated in the README).
const followFactor = 4

// seqLimitS is how long after the fault a sequence is followed before the
// fault counts as not cleared.
func seqLimitS(crit Criteria) float64 { return math.Max(10*crit.MaxClearingS, 30) }

// isolatedShare is the share of its first current below which a fault
// counts as extinguished.
const isolatedShare = 1e-9

// sequence follows a fault fed from more than one side: devices trip in
// time order, each opening its branch end, and after every opening the
// network is solved again for the devices that remain (those the intact
// network's exploration found, and any the search for who must clear the
// fault reaches). It returns when the fault is isolated (+Inf when it
// never is) and the openings, and records every device's margin over the
// device whose opening relieved it.
//
// A source or generator whose own protection the study declares, feeding
// the fault with no device of the study between, is taken out at the
// maximum clearing time (the declaration's meaning). When the fault is
// left fed only by undeclared sources or generators with no device
// between, the sequence stops and returns their names: the rest of the
// clearing is outside the study.
func (x *netIndex) sequence(ws *workspace, t *tally, crit Criteria, v0 *view, tt0 *timeTable, cl0 clearing, ne nodeElem, k faults.Kind, key faultKey) (float64, []event, []int, []string, error) {
	eng := x.eng
	cs := v0.cs
	st := ws.seq
	st.reset()
	horizon := 0.0 // the intact network's clearing time by the must-clear devices
	for _, d := range cl0.must {
		if tm := tt0.get(d); !math.IsInf(tm.trip, 1) {
			horizon = math.Max(horizon, tm.trip+x.breaker(d))
		}
	}
	horizon = followFactor*horizon + crit.MarginS
	for i, d := range tt0.ids {
		if x.candidate(d, &tt0.rows[i]) && tt0.rows[i].up <= horizon {
			st.touch(d, tt0.governA(d))
		}
	}
	for _, d := range cl0.must {
		if !st.tracked(d) {
			st.touch(d, tt0.governA(d))
		}
	}
	var opening faults.Opening
	var evs []event
	T := 0.0
	tt, must, failed, own := tt0, cl0.must, cl0.failed, cl0.own
	size0 := faultSize(v0.kinds[k])
	limit := seqLimitS(crit)
	next := 1      // the sequence table to fill next
	lastDev := 0.0 // when the last device of the study opened
	for iter := 0; iter < 2*len(tt0.ids)+16; iter++ {
		// The next opening: a device that must clear the fault in this
		// state. A device that trips out of turn is reported (unwanted) and
		// the sequence goes on as if it had not opened: every device is
		// judged against the clearing its protection is meant to give.
		nextT := math.Inf(1)
		for _, d := range must {
			if st.isOpen(d) {
				continue
			}
			switch tm := tt.get(d); {
			case st.stamp[d] == st.gen && !math.IsNaN(st.tripAt[d]):
				nextT = math.Min(nextT, math.Max(T, st.tripAt[d]+x.breaker(d)))
			case !math.IsInf(tm.trip, 1):
				prog := 0.0
				if st.stamp[d] == st.gen {
					prog = st.prog[d]
				}
				nextT = math.Min(nextT, T+(1-prog)*tm.trip+x.breaker(d))
			}
		}
		ownAt := math.Inf(1)
		if len(own) > 0 {
			ownAt = math.Max(T, crit.MaxClearingS)
		}
		nextT = math.Min(nextT, ownAt)
		if math.IsInf(nextT, 1) || nextT > limit {
			return math.Inf(1), evs, failed, nil, nil
		}
		// Advance every device to it; an unwanted trip in the step is
		// judged against the must-clear devices' progress at its start.
		for _, d := range st.ids {
			st.prog0[d] = st.prog[d]
		}
		for _, d := range st.ids {
			if st.open[d] {
				continue
			}
			tm := tt.get(d)
			st.proj[d] = math.Inf(1)
			switch {
			case contains(must, d):
			case !math.IsNaN(st.upAt[d]):
				// It has reached its upstream time already (a fuse
				// has melted): that is when it operated, whatever its
				// current now.
				st.proj[d] = st.upAt[d]
			case !math.IsInf(tm.up, 1):
				st.proj[d] = T + (1-st.progUp[d])*tm.up
			}
			if math.IsNaN(st.tripAt[d]) {
				if math.IsInf(tm.trip, 1) {
					st.prog[d] = 0
				} else if p := st.prog[d] + (nextT-T)/tm.trip; p >= 1-1e-12 {
					st.tripAt[d] = T + (1-st.prog[d])*tm.trip
					st.prog[d] = 1
					if !contains(must, d) {
						x.unwanted(t, crit, d, st.tripAt[d], tt, st, must, T, ne, key)
					}
				} else {
					st.prog[d] = p
				}
			}
			switch {
			case !math.IsNaN(st.upAt[d]):
			case math.IsInf(tm.up, 1):
				st.progUp[d] = 0
			default:
				if p := st.progUp[d] + (nextT-T)/tm.up; p >= 1-1e-12 {
					st.upAt[d] = T + (1-st.progUp[d])*tm.up
					st.progUp[d] = 1
				} else {
					st.progUp[d] = p
				}
			}
		}
		// Open what opens now.
		first := -1
		for _, d := range st.ids {
			if st.open[d] || math.IsNaN(st.tripAt[d]) || !contains(must, d) || st.tripAt[d]+x.breaker(d) > nextT*(1+1e-12)+1e-12 {
				continue
			}
			st.open[d] = true
			if x.hook != nil {
				x.emitOpening(crit, d, &tt.get(d).seen, nextT, ne.place, key)
			}
			opening.Ends = append(opening.Ends, x.s.Devices[d].Point)
			evs = append(evs, event{dev: d, atS: nextT, intactA: st.firstA[d], openA: tt.governA(d)})
			lastDev = nextT
			if first < 0 || d < first {
				first = d
			}
		}
		if nextT == ownAt {
			for _, in := range own {
				if in.source {
					opening.Sources = append(opening.Sources, in.index)
				} else {
					opening.Generators = append(opening.Generators, in.index)
				}
				evs = append(evs, event{dev: -1, infeed: in.name, atS: nextT})
			}
		}
		sortEvents(evs)
		T = nextT
		relieve := func(d int) {
			// A device that has tripped already has its trip recorded
			// (unwanted): nothing relieved it.
			if first < 0 || d == first || contains(must, d) || math.IsInf(st.proj[d], 1) || !math.IsNaN(st.tripAt[d]) {
				return
			}
			x.offerRelief(t, crit, d, first, st.proj[d], st.tripAt[first], tt, ne, key)
		}
		p, err := x.state(ws, ne.place, cs, opening)
		if err != nil {
			return 0, nil, nil, nil, err
		}
		sol := p.sol
		// Isolated: cut off from every source, or left with no current of
		// this kind (an earth fault that has lost its last path to earth).
		if !sol.Energised() || faultSize(sol.WithKind(k, eng.CaseFault(ne.place, k, cs).ZOhm)) <= isolatedShare*size0 {
			for _, d := range st.ids {
				relieve(d)
			}
			// A fault isolated when a declared infeed's own protection
			// removed it: the study's devices are judged on their part,
			// the infeed's own protection is taken to act within the
			// maximum clearing time (the declaration's meaning).
			if len(evs) > 0 && evs[len(evs)-1].dev < 0 && lastDev > 0 {
				return lastDev, evs, nil, nil, nil
			}
			return T, evs, nil, nil, nil
		}
		// The new state: the same devices, seen through the changed network.
		v := &view{p: p, buf: ws.search, el: v0.el, cs: cs}
		for _, kk := range faults.Kinds {
			v.kinds[kk] = sol.WithKind(kk, eng.CaseFault(ne.place, kk, cs).ZOhm)
		}
		nt := ws.tables[next]
		next = 3 - next
		nt.reset(v, k)
		for _, d := range st.ids {
			if st.open[d] {
				continue
			}
			if tm := nt.get(d); math.IsInf(tm.trip, 1) && math.IsInf(tm.up, 1) {
				relieve(d)
			}
		}
		cl := v.search(func(d int) bool { return !st.isOpen(d) && nt.operates(d) }, nil)
		tt, must, failed, own = nt, cl.must, cl.failed, cl.own
		for i, d := range nt.ids {
			if !st.tracked(d) && x.candidate(d, &nt.rows[i]) && (contains(must, d) || nt.rows[i].up <= T+horizon) {
				st.touch(d, tt0.governA(d))
			}
		}
		if len(must) == 0 && len(failed) == 0 && len(own) == 0 && len(cl.direct) > 0 {
			return T, evs, nil, cl.direct, nil
		}
	}
	return math.Inf(1), evs, failed, nil, nil
}

// isOpen reports whether a tracked device has opened.
func (st *seqState) isOpen(d int) bool { return st.stamp[d] == st.gen && st.open[d] }

// offerRelief records device d's margin over device m, whose opening
// stopped d from operating: d would have operated at projS, m tripped at
// mTrip.
func (x *netIndex) offerRelief(t *tally, crit Criteria, d, m int, projS, mTrip float64, tt *timeTable, ne nodeElem, key faultKey) {
	x.offerSequenceOp(t, crit, d, m, projS, mTrip, false, tt, ne, key)
}

// offerSequenceOp records device d's operation at dS during a sequence
// against must-clear device m's trip at mS (tripped: d trips before the
// fault is isolated), with both devices' currents in the state tt.
func (x *netIndex) offerSequenceOp(t *tally, crit Criteria, d, m int, dS, mS float64, tripped bool, tt *timeTable, ne nodeElem, key faultKey) {
	t.ops[d].count++
	if x.hook != nil {
		x.emitMargin(crit, d, m, &tt.get(d).seen, &tt.get(m).seen, dS, mS, 1, ne.place, key, true)
	}
	margin, req := x.marginOf(crit, d, m, dS, mS)
	if !t.ops[d].worse(margin-req, key) {
		return
	}
	r := opRecord{slack: margin - req, margin: margin, required: req, key: key, place: ne.place, scale: 1,
		relief: m, dS: dS, reliefS: mS, tripped: tripped}
	sd := tt.get(d).seen
	r.dA, r.dQty = x.timers[d].governingSeen(&sd)
	r.forward = x.forward(d, &sd)
	sm := tt.get(m).seen
	r.reliefA, r.reliefQty = x.timers[m].governingSeen(&sm)
	t.ops[d].offer(r)
}

// unwanted records a device that trips during a fault's sequence while it
// is not one that must clear it: its margin over the must-clear device
// that would trip first.
func (x *netIndex) unwanted(t *tally, crit Criteria, d int, tripS float64, tt *timeTable, st *seqState, must []int, now float64, ne nodeElem, key faultKey) {
	m, mS := -1, math.Inf(1)
	for _, c := range must {
		tm := tt.get(c)
		if st.stamp[c] != st.gen || math.IsInf(tm.trip, 1) {
			continue
		}
		at := st.tripAt[c]
		if math.IsNaN(at) {
			at = now + (1-st.prog0[c])*tm.trip
		}
		if at < mS {
			m, mS = c, at
		}
	}
	if m < 0 {
		return
	}
	x.offerSequenceOp(t, crit, d, m, tripS, mS, true, tt, ne, key)
}

// sortEvents orders openings by time, then device.
func sortEvents(evs []event) {
	for i := 1; i < len(evs); i++ {
		for j := i; j > 0 && (evs[j].atS < evs[j-1].atS || evs[j].atS == evs[j-1].atS && evs[j].dev < evs[j-1].dev); j-- {
			evs[j], evs[j-1] = evs[j-1], evs[j]
		}
	}
}

// governA returns the current that sets device d's time for what it sees
// in the table's fault (its phase current, or what its ground stages
// measure), worked out once per timing.
func (tt *timeTable) governA(d int) float64 {
	tm := tt.get(d)
	if !tm.govSet {
		tm.govA, _ = tt.x.timers[d].governingSeen(&tm.seen)
		tm.govSet = true
	}
	return tm.govA
}
