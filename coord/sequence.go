package coord

import (
	"math"

	"tripgrade/faults"
)

// devState is one device's progress towards operating during a fault.
// Inverse-time relays integrate dt/t(I) (the usual model of an induction
// disc or a numerical relay's timer: with the current changing in steps,
// a relay trips when the sum of each step's share of its operating time
// reaches one); a relay whose current falls below its pickup resets at
// once (numerical relays' instantaneous reset, an assumption). A fuse's
// clearing and melting are integrated the same way.
type devState struct {
	prog, progUp float64
	tripAt       float64 // NaN until the device has tripped
	open         bool
	firstA       float64 // its current in the intact network
}

// seqLimitS is how long after the fault a sequence is followed before the
// fault counts as not cleared.
func seqLimitS(crit Criteria) float64 { return math.Max(10*crit.MaxClearingS, 30) }

// sequence follows a fault fed from more than one side: devices trip in
// time order, each opening its branch end, and after every opening the
// network is solved again for the devices that remain. It returns when
// the fault is isolated (+Inf when it never is) and the openings, and
// records every device's margin over the device whose opening relieved it.
//
// A source or generator whose own protection the study declares, feeding
// the fault with no device of the study between, is taken out at the
// maximum clearing time (the declaration's meaning). When the fault is
// left fed only by undeclared sources or generators with no device
// between, the sequence stops and returns their names: the rest of the
// clearing is outside the study.
func (x *netIndex) sequence(ws *workspace, t *tally, crit Criteria, v0 *view, devs0 []int, times0 map[int]timing, cl0 clearing, ne nodeElem, k faults.Kind, key faultKey) (float64, []event, []int, []string, error) {
	eng := x.eng
	cs := v0.cs
	state := map[int]*devState{}
	get := func(d int) *devState {
		s, ok := state[d]
		if !ok {
			s = &devState{tripAt: math.NaN()}
			state[d] = s
		}
		return s
	}
	for _, d := range devs0 {
		get(d).firstA = phaseOf(times0[d].seen)
	}
	var opening faults.Opening
	var evs []event
	T := 0.0
	devs, times, must, failed, own := devs0, times0, cl0.must, cl0.failed, cl0.own
	size0 := faultSize(v0.kinds[k])
	isMust := func(d int) bool {
		for _, m := range must {
			if m == d {
				return true
			}
		}
		return false
	}
	projected := map[int]float64{} // upstream-time projections of the current state
	limit := seqLimitS(crit)
	for iter := 0; iter < 2*len(devs0)+16; iter++ {
		// The next opening.
		next := math.Inf(1)
		for d, s := range state {
			if s.open {
				continue
			}
			tm, ok := times[d]
			var at float64
			switch {
			case !math.IsNaN(s.tripAt):
				at = s.tripAt + x.breaker(d)
			case ok && !math.IsInf(tm.trip, 1):
				at = T + (1-s.prog)*tm.trip + x.breaker(d)
			default:
				continue
			}
			next = math.Min(next, at)
		}
		ownAt := math.Inf(1)
		if len(own) > 0 {
			ownAt = math.Max(T, crit.MaxClearingS)
		}
		if ownAt < next {
			next = ownAt
		}
		if math.IsInf(next, 1) || next > limit {
			return math.Inf(1), evs, failed, nil, nil
		}
		// Advance every device to it.
		clear(projected)
		for _, d := range devs {
			s := get(d)
			if s.open {
				continue
			}
			tm := times[d]
			if !math.IsInf(tm.up, 1) && !isMust(d) {
				projected[d] = T + (1-s.progUp)*tm.up
			}
			if math.IsNaN(s.tripAt) {
				if math.IsInf(tm.trip, 1) {
					s.prog = 0
				} else if p := s.prog + (next-T)/tm.trip; p >= 1-1e-12 {
					s.tripAt = T + (1-s.prog)*tm.trip
					s.prog = 1
					if !isMust(d) {
						x.unwanted(t, crit, d, s.tripAt, times, state, must, T, ne, key)
					}
				} else {
					s.prog = p
				}
			}
			if math.IsInf(tm.up, 1) {
				s.progUp = 0
			} else {
				s.progUp += (next - T) / tm.up
			}
		}
		// Open what opens now.
		first := -1
		for d, s := range state {
			if s.open || math.IsNaN(s.tripAt) || s.tripAt+x.breaker(d) > next*(1+1e-12)+1e-12 {
				continue
			}
			s.open = true
			opening.Ends = append(opening.Ends, x.s.Devices[d].Point)
			evs = append(evs, event{dev: d, atS: next, beforeA: phaseOf(times[d].seen), afterA: s.firstA, unwanted: !isMust(d)})
			if first < 0 || d < first {
				first = d
			}
		}
		if next == ownAt {
			for _, in := range own {
				if in.source {
					opening.Sources = append(opening.Sources, in.index)
				} else {
					opening.Generators = append(opening.Generators, in.index)
				}
				evs = append(evs, event{dev: -1, infeed: in.name, atS: next})
			}
		}
		sortEvents(evs)
		T = next
		relieve := func(d int) {
			if first < 0 || d == first || isMust(d) {
				return
			}
			if p, ok := projected[d]; ok && !math.IsNaN(state[first].tripAt) {
				x.offerRelief(t, crit, d, first, p, state[first].tripAt, times, ne, key)
			}
		}
		sol, err := eng.SolveOpen(eng.CaseFault(ne.place, faults.LLL, cs), opening)
		if err != nil {
			return 0, nil, nil, nil, err
		}
		// Isolated: cut off from every source, or left with no current of
		// this kind (an earth fault that has lost its last path to earth).
		if !sol.Energised() || faultSize(sol.WithKind(k, eng.CaseFault(ne.place, k, cs).ZOhm)) <= isolatedShare*size0 {
			for _, d := range devs {
				relieve(d)
			}
			return T, evs, nil, nil, nil
		}
		// The new state.
		sol = sol.Use(ws.scOpen)
		p := x.newProbe(&ws.open, sol, opening.Ends)
		i, j, _ := sol.Node()
		p.explore(i, j)
		v := &view{p: p, el: v0.el, cs: cs}
		for _, kk := range faults.Kinds {
			v.kinds[kk] = sol.WithKind(kk, eng.CaseFault(ne.place, kk, cs).ZOhm)
		}
		newDevs := p.devices()
		newTimes := make(map[int]timing, len(newDevs))
		for _, d := range newDevs {
			if s, ok := state[d]; ok && s.open {
				continue
			}
			newTimes[d] = x.timeOf(d, v.seen(d, k), Nominal)
			get(d)
		}
		for _, d := range devs {
			if _, still := newTimes[d]; !still || math.IsInf(newTimes[d].trip, 1) && math.IsInf(newTimes[d].up, 1) {
				relieve(d)
			}
		}
		ops := func(d int) bool { tm, ok := newTimes[d]; return ok && !math.IsInf(tm.trip, 1) }
		cl := v.search(ops, nil)
		devs, times, must, failed, own = newDevs, newTimes, cl.must, cl.failed, cl.own
		if len(must) == 0 && len(failed) == 0 && len(own) == 0 && len(cl.direct) > 0 {
			return T, evs, nil, cl.direct, nil
		}
		for d, s := range state {
			if _, ok := times[d]; !ok && !s.open {
				times[d] = timing{trip: noTime, up: noTime}
			}
		}
	}
	return math.Inf(1), evs, failed, nil, nil
}

// isolatedShare is the share of its first current below which a fault
// counts as extinguished.
const isolatedShare = 1e-9

// offerRelief records device d's margin over device m, whose opening
// stopped d from operating: d would have operated at projS, m tripped at
// mTrip.
func (x *netIndex) offerRelief(t *tally, crit Criteria, d, m int, projS, mTrip float64, times map[int]timing, ne nodeElem, key faultKey) {
	margin, req := x.marginOf(crit, d, m, projS, mTrip)
	r := opRecord{slack: margin - req, margin: margin, required: req, key: key, place: ne.place, scale: 1,
		relief: m, dS: projS, reliefS: mTrip}
	if tm, ok := times[d]; ok {
		r.dA, r.dQty = x.timers[d].governingSeen(&tm.seen)
		r.forward = x.forward(d, &tm.seen)
	}
	if tm, ok := times[m]; ok {
		r.reliefA, r.reliefQty = x.timers[m].governingSeen(&tm.seen)
	}
	t.ops[d].offer(r)
}

// unwanted records a device that trips during a fault's sequence while it
// is not one that must clear it: its margin over the must-clear device
// that would trip first.
func (x *netIndex) unwanted(t *tally, crit Criteria, d int, tripS float64, times map[int]timing, state map[int]*devState, must []int, now float64, ne nodeElem, key faultKey) {
	m, mS := -1, math.Inf(1)
	for _, c := range must {
		s := state[c]
		tm, ok := times[c]
		if s == nil || !ok || math.IsInf(tm.trip, 1) {
			continue
		}
		at := s.tripAt
		if math.IsNaN(at) {
			at = now + (1-s.prog)*tm.trip
		}
		if at < mS {
			m, mS = c, at
		}
	}
	if m < 0 {
		return
	}
	margin, req := x.marginOf(crit, d, m, tripS, mS)
	r := opRecord{slack: margin - req, margin: margin, required: req, key: key, place: ne.place, scale: 1,
		relief: m, dS: tripS, reliefS: mS, tripped: true}
	tm := times[d]
	r.dA, r.dQty = x.timers[d].governingSeen(&tm.seen)
	r.forward = x.forward(d, &tm.seen)
	tmm := times[m]
	r.reliefA, r.reliefQty = x.timers[m].governingSeen(&tmm.seen)
	t.ops[d].offer(r)
}

// sortEvents orders openings by time, then device.
func sortEvents(evs []event) {
	for i := 1; i < len(evs); i++ {
		for j := i; j > 0 && (evs[j].atS < evs[j-1].atS || evs[j].atS == evs[j-1].atS && evs[j].dev < evs[j-1].dev); j-- {
			evs[j], evs[j-1] = evs[j-1], evs[j]
		}
	}
}

func phaseOf(s Seen) float64 { return s.PhaseA() }
