package coord

import (
	"tripgrade/faults"
)

// Margins the checker judges, handed out one by one to a setting search
// (package coord/propose): every grading sample (solved faults and the
// sweep), every margin of the fault-by-fault pass (an operating device
// over the must-clear device that relieves it, in the intact network, in
// its sweep and in opening sequences) and every clearing time a single
// device gives. A search rebuilds the operating times from the currents
// and directions each sample carries, stage by stage, so a time
// multiplier's effect on every margin comes from the checker's own
// figures, not from a second derivation of the faults.

// Options are the optional parts of a check. The zero value is a plain
// check.
type Options struct {
	// Margins, when not nil, receives every margin the checks judge. It is
	// called from several goroutines at once and must be safe for that;
	// the Sample and what it points to are valid only during the call.
	Margins func(*MarginSample)
}

// Operating is what one device's stages respond to at one fault: its
// largest phase current, the current its ground stages measure (3I0, or
// a neutral CT's current) and how its directional elements decided.
type Operating struct {
	PhaseA, GroundA float64
	Dirs            Dirs
}

// MarginSample is one margin as the checker judges it: with tUp the
// upstream device's operating time (a fuse's minimum melting time) and
// tDown the downstream device's operating time without its breaker (a
// fuse's total clearing time), the margin holds when
//
//	Alpha·tUp − Beta·tDown ≥ Gamma.
//
// Grading: Alpha 1, Beta 1, Gamma the required margin; with margin
// components Beta is 1 + (2·E_R + E_CT)/100; below an upstream fuse Alpha
// is the fuse melt ratio and Gamma the downstream breaker time. A
// clearing-time bound has Up −1, Alpha 0, Beta 1 and Gamma = breaker −
// maximum clearing time (tDown + breaker ≤ maximum); a damage bound the
// same with the equipment's withstand time at its current in place of the
// maximum (tDown + breaker ≤ withstand).
type MarginSample struct {
	Check              CheckKind // Grading, Discrimination, Clearing or Damage
	Up, Down           int       // device indices; Up −1 for a clearing or damage bound
	Alpha, Beta, Gamma float64
	// UpBand and DownBand are the tolerance bands the times are taken in.
	UpBand, DownBand Band
	// UpAt and DownAt are what each device responds to at this fault
	// (for a sample of a sequence, in the state where its time was
	// judged).
	UpAt, DownAt Operating
	// Sequence is true for a margin judged in an opening sequence: UpS
	// and DownS are then the times the checker compared, integrated over
	// the sequence's states (the upstream device's projected or actual
	// trip, the downstream device's), which a multiplier changes by its
	// stage's time per unit multiplier in the state UpAt and DownAt
	// describe.
	Sequence     bool
	UpS, DownS   float64
	Kind         faults.Kind
	Case         faults.Case
	Place        faults.Place
	Scale        float64 // 1 for a solved fault, the factor of a swept point
	MarginS      float64 // the margin the checker found (for a clearing or damage bound, the clearing time)
	RequiredS    float64 // the margin it required (for a clearing bound, the maximum; for a damage bound, the withstand time)
	UpS0, DownS0 float64 // the two times the checker found
	Equipment    string  // the equipment of a damage bound
}

// marginRule returns the linear form of the margin up must keep over
// down: Alpha·tUp − Beta·tDown ≥ Gamma, with pairS the pair's own margin
// (0 when the criteria's applies). It states grader.eval's and
// netIndex.marginOf's rules; TestMarginRuleMatchesChecks holds them
// together.
func marginRule(crit Criteria, u, d *Device, pairS float64) (alpha, beta, gamma float64) {
	breaker := 0.0
	if d.Kind == Relay {
		breaker = d.BreakerS
	}
	switch {
	case u.Kind == Fuse:
		// clearing ≤ ratio × melting: ratio·tUp − tDown ≥ breaker.
		return crit.FuseMeltRatio, 1, breaker
	case pairS > 0:
		return 1, 1, pairS
	case d.Kind == Fuse:
		return 1, 1, crit.MarginFuseS
	case crit.Components != nil:
		k := crit.Components
		return 1, 1 + (2*d.Accuracy.ClassPct+k.CTErrorPct)/100, d.BreakerS + k.OvertravelS + k.SafetyS
	}
	return 1, 1, crit.MarginS
}

// dirsSeen says how a directional relay's elements decided for what it
// sees (the zero Dirs for a relay without directional stages).
func (t *Timer) dirsSeen(s *Seen) Dirs {
	if !t.Directional() {
		return Dirs{}
	}
	return t.dirs(s, s.PhaseA())
}

// operatingSeen returns what the device's stages respond to for what it
// sees.
func (t *Timer) operatingSeen(s *Seen) Operating {
	return Operating{PhaseA: s.PhaseA(), GroundA: s.groundA(t.Dev), Dirs: t.dirsSeen(s)}
}

// StageCurrentA returns the current stage i of the relay responds to at a
// fault: the phase or ground current for a non-directional stage, what
// its direction sees for a directional one (0 when its element decides
// the other way). The fastest of the stages' times at these currents is
// the relay's time (Timer.OperateDir).
func (t *Timer) StageCurrentA(i int, at Operating) float64 {
	st := t.Dev.Stages[i]
	d := at.Dirs
	if st.Measures == Residual {
		if !t.Directional() || !d.Known || st.Direction == NonDirectional || st.Direction == d.Ground {
			return at.GroundA
		}
		return 0
	}
	if !t.Directional() || !d.Known {
		return at.PhaseA
	}
	switch st.Direction {
	case Forward:
		return d.Fwd * at.PhaseA
	case Reverse:
		return d.Rev * at.PhaseA
	}
	return at.PhaseA
}

// emitGrading hands a grading sample to the hook.
func (g grader) emitGrading(s sample, o gradeOutcome) {
	u, d := g.u.Dev, g.d.Dev
	ms := MarginSample{Check: Grading, Up: g.up, Down: g.down, Kind: s.kind, Case: s.cs, Place: s.at, Scale: s.scale,
		UpAt: Operating{s.up, s.ur, s.ud}, DownAt: Operating{s.dp, s.dr, s.dd},
		MarginS: o.margin, RequiredS: o.required, UpS0: o.tU, DownS0: o.tD}
	ms.UpBand, ms.DownBand = bands(g.c.s.Criteria)
	ms.Alpha, ms.Beta, ms.Gamma = marginRule(g.c.s.Criteria, u, d, g.marginS)
	if u.Kind == Fuse && d.Kind == Relay {
		ms.DownS0 -= d.BreakerS // grading compares the clearing time below a fuse
	}
	g.c.hook(&ms)
}

// emitMargin hands a margin of the fault-by-fault pass to the hook: d
// operating (as the upstream device) at upS over m tripping at mTrip,
// for what each sees. seq is true for a margin judged in a sequence.
func (x *netIndex) emitMargin(crit Criteria, d, m int, sd, sm *Seen, upS, mTrip, scale float64, pl faults.Place, key faultKey, seq bool) {
	ms := MarginSample{Check: Discrimination, Up: d, Down: m, Kind: key.kind, Case: key.cs, Place: pl, Scale: scale,
		UpAt: x.timers[d].operatingSeen(sd), DownAt: x.timers[m].operatingSeen(sm),
		Sequence: seq, UpS: upS, DownS: mTrip, UpS0: upS, DownS0: mTrip}
	if !seq {
		ms.UpBand, ms.DownBand = bands(crit)
	}
	ms.MarginS, ms.RequiredS = x.marginOf(crit, d, m, upS, mTrip)
	ms.Alpha, ms.Beta, ms.Gamma = marginRule(crit, &x.s.Devices[d], &x.s.Devices[m], x.pairMarginS(d, m))
	x.hook(&ms)
}

// emitClearing hands the clearing time of a fault that device m isolates
// alone to the hook: its trip plus breaker within the maximum clearing
// time.
func (x *netIndex) emitClearing(crit Criteria, m int, sm *Seen, trip float64, pl faults.Place, key faultKey) {
	b := x.breaker(m)
	ms := MarginSample{Check: Clearing, Up: -1, Down: m, Kind: key.kind, Case: key.cs, Place: pl, Scale: 1,
		DownAt: x.timers[m].operatingSeen(sm), Beta: 1, Gamma: b - crit.MaxClearingS,
		MarginS: trip + b, RequiredS: crit.MaxClearingS, DownS0: trip}
	x.hook(&ms)
}

// emitDamage hands a through-fault of the damage check to the hook as a
// bound: device dev, clearing in tc, clears it within the equipment's
// withstand time tw at the equipment's current.
func (c *checker) emitDamage(dev int, s sample, tc, tw float64, equipment string) {
	b := 0.0
	if d := &c.s.Devices[dev]; d.Kind == Relay {
		b = d.BreakerS
	}
	ms := MarginSample{Check: Damage, Up: -1, Down: dev, Kind: s.kind, Case: s.cs, Place: s.at, Scale: s.scale,
		DownAt: Operating{s.dp, s.dr, s.dd}, Beta: 1, Gamma: b - tw,
		MarginS: tc, RequiredS: tw, DownS0: tc - b, Equipment: equipment}
	c.hook(&ms)
}

// emitOpening hands the opening of must-clear device m in a fault's
// sequence, at atS, to the hook as a clearing bound: every opening that
// isolates the fault comes within the maximum clearing time.
func (x *netIndex) emitOpening(crit Criteria, m int, sm *Seen, atS float64, pl faults.Place, key faultKey) {
	b := x.breaker(m)
	ms := MarginSample{Check: Clearing, Up: -1, Down: m, Kind: key.kind, Case: key.cs, Place: pl, Scale: 1,
		DownAt: x.timers[m].operatingSeen(sm), Beta: 1, Gamma: b - crit.MaxClearingS, Sequence: true, DownS: atS - b,
		MarginS: atS, RequiredS: crit.MaxClearingS, DownS0: atS - b}
	x.hook(&ms)
}
