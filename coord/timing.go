package coord

import (
	"math"
	"math/cmplx"

	"tripgrade/curves"
)

// Band selects a device's nominal time or an edge of its tolerance band.
type Band uint8

// Bands.
const (
	Nominal Band = iota
	Early        // earliest operating time within the declared accuracy
	Late         // latest operating time within the declared accuracy
)

// Timer answers how long one device takes at the currents of a fault. A
// relay operates at the fastest of its stages, phase stages on the largest
// phase current and ground stages on the residual current; a fuse melts
// and clears on its phase current.
type Timer struct {
	Dev *Device
	// Phase and Ground are the fastest of the relay's phase and ground
	// stages (nil when it has none), per Band, whatever their direction.
	Phase, Ground [3]curves.Characteristic
	// dir holds the characteristics by direction of a relay with a
	// directional stage (nil for the others, most of a large study).
	dir *timerDirs
}

// timerDirs are a directional relay's characteristics by Direction.
type timerDirs struct {
	// phase and ground are the fastest stages of each Direction, per
	// Band (nil where there are none).
	phase, ground [3][3]curves.Characteristic
	// towardPhase and towardGround are, per Direction of the current, the
	// fastest of the stages that operate for it (the non-directional
	// ones and those of that direction), per Band.
	towardPhase, towardGround [3][3]curves.Characteristic
}

// Toward returns the relay's phase and ground characteristics for
// current flowing in direction dir (Forward: from its bus into its
// branch): the fastest of its non-directional stages and of those set
// that way. For NonDirectional it returns Phase and Ground.
func (t *Timer) Toward(dir Direction) (phase, ground [3]curves.Characteristic) {
	if dir == NonDirectional || !t.Directional() {
		return t.Phase, t.Ground
	}
	return t.dir.towardPhase[dir], t.dir.towardGround[dir]
}

// NewTimer prepares a device's characteristics.
func NewTimer(d *Device) *Timer {
	t := &Timer{Dev: d}
	if d.Kind == Fuse {
		return t
	}
	var ph, gr curves.Fastest
	directional := false
	var phD, grD [3]curves.Fastest
	for _, s := range d.Stages {
		if s.Measures == Phase {
			ph = append(ph, s.Curve)
			phD[s.Direction] = append(phD[s.Direction], s.Curve)
		} else {
			gr = append(gr, s.Curve)
			grD[s.Direction] = append(grD[s.Direction], s.Curve)
		}
		if s.Direction != NonDirectional {
			directional = true
		}
	}
	set := func(dst *[3]curves.Characteristic, f curves.Fastest) {
		if len(f) == 0 {
			return
		}
		dst[Nominal], dst[Early], dst[Late] = f, f, f
		if d.Accuracy.ClassPct > 0 {
			var early, late curves.Fastest
			for _, c := range f {
				e, l := curves.Banded(c, d.Accuracy)
				early, late = append(early, e), append(late, l)
			}
			dst[Early], dst[Late] = early, late
		}
	}
	set(&t.Phase, ph)
	set(&t.Ground, gr)
	if !directional {
		return t
	}
	td := &timerDirs{}
	for dir := range phD {
		set(&td.phase[dir], phD[dir])
		set(&td.ground[dir], grD[dir])
	}
	for _, dir := range []Direction{Forward, Reverse} {
		set(&td.towardPhase[dir], append(append(curves.Fastest(nil), phD[NonDirectional]...), phD[dir]...))
		set(&td.towardGround[dir], append(append(curves.Fastest(nil), grD[NonDirectional]...), grD[dir]...))
	}
	t.dir = td
	return t
}

// Directional reports whether any stage of the device is directional.
func (t *Timer) Directional() bool { return t.dir != nil }

// Directions returns the decisions of the relay's phase elements and of
// its ground element for what it sees.
func (t *Timer) Directions(s *Seen) (phase [3]Direction, ground Direction) {
	return t.Dev.Dir.PhaseDirections(s), t.Dev.Dir.GroundDirection(s)
}

// OperateSeen returns the relay's operating time (without the breaker) in
// a band, or a fuse's total clearing time, for what the device sees: each
// phase stage on the largest phase current whose element looks its way
// (a non-directional stage on the largest phase current), each ground
// stage on 3I0 when the ground element looks its way.
func (t *Timer) OperateSeen(s *Seen, b Band) (float64, curves.Status) {
	if t.Dev.Kind == Fuse {
		return t.Dev.Clear.Time(s.PhaseA())
	}
	return t.relaySeen(s, b, allStages)
}

// MeltSeen returns a fuse's minimum melting time (for a relay, its
// operating time) for what it sees.
func (t *Timer) MeltSeen(s *Seen, b Band) (float64, curves.Status) {
	if t.Dev.Kind == Fuse {
		return t.Dev.Melt.Time(s.PhaseA())
	}
	return t.relaySeen(s, b, allStages)
}

// ClearingSeen returns the time to clear for what the device sees: a
// relay's operating time plus its breaker's, a fuse's clearing time.
func (t *Timer) ClearingSeen(s *Seen, b Band) (float64, curves.Status) {
	x, st := t.OperateSeen(s, b)
	if t.Dev.Kind == Relay && st == curves.Operates {
		x += t.Dev.BreakerS
	}
	return x, st
}

// Which of a relay's stages to time.
const (
	phaseStages  = 1
	groundStages = 2
	allStages    = phaseStages | groundStages
)

func (t *Timer) relaySeen(s *Seen, b Band, which int) (float64, curves.Status) {
	phaseA, residualA := s.PhaseA(), s.groundA(t.Dev)
	if !t.Directional() {
		return t.groups(phaseA, residualA, Dirs{}, b, which)
	}
	return t.groups(phaseA, residualA, t.dirs(s, phaseA), b, which)
}

// dirs are the decisions of the relay's elements for what it sees, with
// phaseA its largest phase current.
func (t *Timer) dirs(s *Seen, phaseA float64) Dirs {
	pd, gd := t.Directions(s)
	d := Dirs{Known: true, Ground: gd}
	for p, dir := range pd {
		a := cmplx.Abs(s.I[p])
		switch dir {
		case Forward:
			d.Fwd = math.Max(d.Fwd, a)
		case Reverse:
			d.Rev = math.Max(d.Rev, a)
		}
	}
	if phaseA > 0 {
		d.Fwd, d.Rev = d.Fwd/phaseA, d.Rev/phaseA
	}
	return d
}

// Dirs say how a directional relay's elements decided for one fault, in a
// form that scales with the fault's currents: the largest phase current
// whose element looks forward (reverse), as a share of the largest phase
// current, and the ground element's decision. The zero value (Known
// false) stands for a device whose direction is not asked: every stage
// sees its whole quantity.
type Dirs struct {
	Known    bool
	Fwd, Rev float64
	Ground   Direction
}

// groups times the relay's stage groups: non-directional stages on the
// whole phase (ground) current, directional stages on what their direction
// sees.
func (t *Timer) groups(phaseA, groundA float64, d Dirs, b Band, which int) (float64, curves.Status) {
	ph, gr := t.groupRaces(phaseA, groundA, d, b, which)
	return ph.join(gr).result()
}

// groupRaces times the relay's phase and its ground stages (those which
// selects) as groups does, each kind in a race of its own.
func (t *Timer) groupRaces(phaseA, groundA float64, d Dirs, b Band, which int) (ph, gr race) {
	if !t.Directional() || !d.Known {
		if which&phaseStages != 0 {
			ph.add(t.Phase[b], phaseA)
		}
		if which&groundStages != 0 {
			gr.add(t.Ground[b], groundA)
		}
		return ph, gr
	}
	quantity := [3]float64{NonDirectional: phaseA, Forward: d.Fwd * phaseA, Reverse: d.Rev * phaseA}
	var ground [3]float64
	ground[NonDirectional] = groundA
	if d.Ground != NonDirectional {
		ground[d.Ground] = groundA
	}
	for dir := range quantity {
		if which&phaseStages != 0 {
			ph.add(t.dir.phase[dir][b], quantity[dir])
		}
		if which&groundStages != 0 {
			gr.add(t.dir.ground[dir][b], ground[dir])
		}
	}
	return ph, gr
}

// operateGoverning returns the relay's nominal operating time for what it
// sees (OperateSeen) and the current that governs it (governingSeen),
// timing each stage once.
func (t *Timer) operateGoverning(s *Seen) (float64, curves.Status, float64) {
	phaseA, residualA := s.PhaseA(), s.groundA(t.Dev)
	var d Dirs
	if t.Directional() {
		d = t.dirs(s, phaseA)
	}
	ph, gr := t.groupRaces(phaseA, residualA, d, Nominal, allStages)
	x, st := ph.join(gr).result()
	gov := phaseA
	if t.Ground[Nominal] != nil {
		tg, _ := gr.result()
		tp, _ := ph.result()
		if t.Phase[Nominal] == nil || tg < tp {
			gov = residualA
		}
	}
	return x, st, gov
}

// OperateDir is Operate for a relay whose elements decided d: directional
// stages see only what their direction sees.
func (t *Timer) OperateDir(phaseA, groundA float64, d Dirs, b Band) (float64, curves.Status) {
	if t.Dev.Kind == Fuse {
		return t.Dev.Clear.Time(phaseA)
	}
	return t.groups(phaseA, groundA, d, b, allStages)
}

// MeltDir is Melt with the relay's directions.
func (t *Timer) MeltDir(phaseA, groundA float64, d Dirs, b Band) (float64, curves.Status) {
	if t.Dev.Kind == Fuse {
		return t.Dev.Melt.Time(phaseA)
	}
	return t.OperateDir(phaseA, groundA, d, b)
}

// ClearingDir is Clearing with the relay's directions.
func (t *Timer) ClearingDir(phaseA, groundA float64, d Dirs, b Band) (float64, curves.Status) {
	x, st := t.OperateDir(phaseA, groundA, d, b)
	if t.Dev.Kind == Relay && st == curves.Operates {
		x += t.Dev.BreakerS
	}
	return x, st
}

// effective returns the phase and ground currents a device's stage groups
// respond to for a fault whose elements decided d: the whole current for
// a group with a non-directional stage, else the current its directions
// see (the larger, for stages of both directions).
func (t *Timer) effective(phaseA, groundA float64, d Dirs) (float64, float64) {
	if !t.Directional() || !d.Known {
		return phaseA, groundA
	}
	ph, gr := 0.0, 0.0
	for _, st := range t.Dev.Stages {
		switch {
		case st.Measures == Phase && st.Direction == NonDirectional:
			ph = math.Max(ph, phaseA)
		case st.Measures == Phase && st.Direction == Forward:
			ph = math.Max(ph, d.Fwd*phaseA)
		case st.Measures == Phase:
			ph = math.Max(ph, d.Rev*phaseA)
		case st.Direction == NonDirectional || st.Direction == d.Ground:
			gr = groundA
		}
	}
	return ph, gr
}

// Operate returns the relay's operating time (without the breaker) in a
// band, or for a fuse its total clearing time, at the given currents.
func (t *Timer) Operate(phaseA, residualA float64, b Band) (float64, curves.Status) {
	if t.Dev.Kind == Fuse {
		return t.Dev.Clear.Time(phaseA)
	}
	return fastest(t.Phase[b], phaseA, t.Ground[b], residualA)
}

// Melt returns a fuse's minimum melting time (for a relay, its operating
// time in the band).
func (t *Timer) Melt(phaseA, residualA float64, b Band) (float64, curves.Status) {
	if t.Dev.Kind == Fuse {
		return t.Dev.Melt.Time(phaseA)
	}
	return t.Operate(phaseA, residualA, b)
}

// Clearing returns the time to clear: a relay's operating time plus its
// breaker's interrupting time, a fuse's total clearing time.
func (t *Timer) Clearing(phaseA, residualA float64, b Band) (float64, curves.Status) {
	s, st := t.Operate(phaseA, residualA, b)
	if t.Dev.Kind == Relay && st == curves.Operates {
		s += t.Dev.BreakerS
	}
	return s, st
}

// fastest combines the phase and ground answers as curves.Fastest does:
// the earlier of those that operate; otherwise NoTrip if either says so;
// otherwise Undefined.
func fastest(ph curves.Characteristic, phaseA float64, gr curves.Characteristic, residualA float64) (float64, curves.Status) {
	var r race
	r.add(ph, phaseA)
	r.add(gr, residualA)
	return r.result()
}

// race gathers the answers of several characteristics as curves.Fastest
// combines them: the earliest of those that operate; otherwise NoTrip if
// one says so or none was asked; otherwise Undefined.
type race struct {
	best                    float64
	operates, noTrip, asked bool
}

// add asks characteristic c (nil: none) at current a.
func (r *race) add(c curves.Characteristic, a float64) {
	if c == nil {
		return
	}
	r.asked = true
	x, st := c.Time(a)
	switch st {
	case curves.Operates:
		if !r.operates || x < r.best {
			r.best = x
		}
		r.operates = true
	case curves.NoTrip:
		r.noTrip = true
	}
}

// join returns the race of both races' characteristics.
func (r race) join(o race) race {
	out := r
	if o.operates && (!r.operates || o.best < r.best) {
		out.best = o.best
	}
	out.operates = r.operates || o.operates
	out.noTrip = r.noTrip || o.noTrip
	out.asked = r.asked || o.asked
	return out
}

func (r race) result() (float64, curves.Status) {
	switch {
	case r.operates:
		return r.best, curves.Operates
	case r.noTrip || !r.asked:
		return math.Inf(1), curves.NoTrip
	}
	return math.NaN(), curves.Undefined
}

// Pickup returns the lowest pickup of the device's stages measuring q (for
// a fuse and q = Phase, the current of the first point of its melting
// curve, where melting starts to be defined), or 0 when none.
func (d *Device) Pickup(q Quantity) float64 {
	if d.Kind == Fuse {
		if q != Phase || d.Melt == nil {
			return 0
		}
		lo, _ := d.Melt.Span()
		return lo
	}
	p := 0.0
	for _, s := range d.Stages {
		if s.Measures == q && (p == 0 || s.PickupA < p) {
			p = s.PickupA
		}
	}
	return p
}
