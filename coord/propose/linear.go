package propose

import (
	"math"

	"tripgrade/coord"
	"tripgrade/curves"
)

// Linearising a margin.
//
// An inverse-time stage with pickup Is and multiplier x operates at
// current I in t = max(x·g(I), t_min), g the curve's time at multiplier 1
// (IEC 60255-151:2009 and IEEE C37.112 equations: the multiplier scales
// the whole expression), so at one fault the stage's time is linear in
// its own multiplier (above t_min). A relay operates at the fastest of its
// stages, and a margin holds when
//
//	α·min_s t_U,s − β·min_r t_D,r ≥ γ.
//
// The first minimum is exact as a set of constraints, one per operating
// stage s of the upstream relay (every stage must wait). The second is
// bounded from above by any one stage's time; the search takes the stage
// r* that governs the downstream relay at the settings being linearised
// (so the constraint is exact there, and safe everywhere: the real
// downstream time is never longer). Tolerance bands and t_min are
// straight pieces too (the limiting error is a share of the time or a
// floor, whichever is larger), so every margin becomes a few constraints
//
//	A·x_U − B·x_D ≥ C,  A, B ≥ 0,
//
// each of two multipliers at most. A margin judged in an opening
// sequence (the checker integrates each device's progress over the
// network's states) is linearised in the two devices' multipliers with
// the other openings held where they were. The checker then verifies the
// rounded proposal, and its margins at the new settings are linearised
// again (propose.go).

// piece is an affine function of one stage's multiplier: Slope·x + Off.
type piece struct{ slope, off float64 }

// timing prepares, per device, what the linearisation needs.
type linearizer struct {
	s      *coord.Study
	timers []*coord.Timer
	index  [][]int    // variable of each (device, stage), −1 when fixed
	x      []float64  // the multipliers of the study being linearised, per variable
	vars   []Variable // the variables (for the pickup search; nil otherwise)
}

func newLinearizer(s *coord.Study, index [][]int, x []float64) *linearizer {
	l := &linearizer{s: s, index: index, x: x}
	for i := range s.Devices {
		l.timers = append(l.timers, coord.NewTimer(&s.Devices[i]))
	}
	return l
}

// unit returns an inverse-time stage's time at multiplier 1 and without
// its minimum time, and whether it operates.
func unit(st coord.Stage, a float64) (float64, bool) {
	c := st.Curve.(curves.InverseTime)
	c.Multiplier, c.MinTimeS = 1, 0
	g, status := c.Time(a)
	return g, status == curves.Operates && g > 0 && !math.IsInf(g, 1)
}

// errorShare returns the limiting error of a stage at current a: the
// share e of the time and the floor f (IEC 60255-151:2009 cl. 5.2, as
// curves.Banded applies it).
func errorShare(d *coord.Device, st coord.Stage, a float64) (e, f float64) {
	e = d.Accuracy.ClassPct / 100
	if _, ok := st.Curve.(curves.InverseTime); ok {
		e *= curves.LimitingErrorFactor(a / st.PickupA)
	}
	return e, d.Accuracy.MinErrorS
}

// stageTime returns a stage's time in a band at current a.
func stageTime(d *coord.Device, st coord.Stage, a float64, b coord.Band) (float64, bool) {
	c := st.Curve
	if b != coord.Nominal && d.Accuracy.ClassPct > 0 {
		early, late := curves.Banded(c, d.Accuracy)
		c = early
		if b == coord.Late {
			c = late
		}
	}
	t, status := c.Time(a)
	return t, status == curves.Operates && !math.IsInf(t, 1) && !math.IsNaN(t)
}

// stageTimeG is stageTime that also returns, for an inverse-time stage
// timed nominally, its time at multiplier 1 (0 otherwise), computed once:
// the stage's time is then its multiplier times it, or its minimum time
// (curves.InverseTime.Time, the same arithmetic).
func stageTimeG(d *coord.Device, st coord.Stage, a float64, b coord.Band) (t, g float64, ok bool) {
	c, inverse := st.Curve.(curves.InverseTime)
	if !inverse || b != coord.Nominal && d.Accuracy.ClassPct > 0 {
		t, ok = stageTime(d, st, a, b)
		return t, 0, ok
	}
	c.Multiplier, c.MinTimeS = 1, 0
	g, status := c.Time(a)
	if status != curves.Operates {
		return 0, 0, false
	}
	t = st.Curve.(curves.InverseTime).Multiplier * g
	if tmin := st.Curve.(curves.InverseTime).MinTimeS; t < tmin {
		t = tmin
	}
	return t, g, !math.IsInf(t, 1) && !math.IsNaN(t)
}

// upPieces returns, for each stage of the upstream device that operates,
// its variable (−1 when fixed) and pieces whose minimum is at most the
// stage's time. ok is false when no time is known (a fuse outside its
// tables).
func (l *linearizer) upPieces(dev int, at coord.Operating, b coord.Band) (vars []int, pieces [][]piece, labels []int) {
	d := &l.s.Devices[dev]
	tm := l.timers[dev]
	if d.Kind == coord.Fuse {
		t, st := tm.MeltDir(at.PhaseA, at.GroundA, at.Dirs, b)
		if st != curves.Operates {
			return nil, nil, nil
		}
		return []int{-1}, [][]piece{{{0, t}}}, []int{-1}
	}
	for i, st := range d.Stages {
		a := tm.StageCurrentA(i, at)
		v := l.index[dev][i]
		if v >= 0 {
			g, ok := unit(st, a)
			if !ok {
				continue
			}
			ps := []piece{{g, 0}}
			if b == coord.Early && d.Accuracy.ClassPct > 0 {
				e, f := errorShare(d, st, a)
				ps = []piece{{math.Max(0, 1-e) * g, 0}, {g, -f}}
			}
			vars, pieces, labels = append(vars, v), append(pieces, ps), append(labels, i)
			continue
		}
		t, ok := stageTime(d, st, a, b)
		if !ok {
			continue
		}
		vars, pieces, labels = append(vars, -1), append(pieces, []piece{{0, t}}), append(labels, i)
	}
	return vars, pieces, labels
}

// downPieces returns the variable of the stage that governs the
// downstream device at the linearised settings (−1 when fixed) and pieces
// whose maximum is at least its time. ok is false when it does not
// operate.
func (l *linearizer) downPieces(dev int, at coord.Operating, b coord.Band) (int, []piece, bool) {
	d := &l.s.Devices[dev]
	tm := l.timers[dev]
	if d.Kind == coord.Fuse {
		t, st := tm.OperateDir(at.PhaseA, at.GroundA, at.Dirs, b)
		return -1, []piece{{0, t}}, st == curves.Operates
	}
	best, bestS, bestG, bestA := -1, math.Inf(1), 0.0, 0.0
	for i, st := range d.Stages {
		a := tm.StageCurrentA(i, at)
		if t, g, ok := stageTimeG(d, st, a, b); ok && t < bestS {
			best, bestS, bestG, bestA = i, t, g, a
		}
	}
	if best < 0 {
		return -1, nil, false
	}
	v := l.index[dev][best]
	if v < 0 {
		return -1, []piece{{0, bestS}}, true
	}
	st := d.Stages[best]
	a, g := bestA, bestG
	if g == 0 {
		g, _ = unit(st, a)
	}
	tmin := st.Curve.(curves.InverseTime).MinTimeS
	ps := []piece{{g, 0}}
	if tmin > 0 {
		ps = append(ps, piece{0, tmin})
	}
	if b == coord.Late && d.Accuracy.ClassPct > 0 {
		e, f := errorShare(d, st, a)
		late := make([]piece, 0, 2*len(ps))
		for _, p := range ps {
			late = append(late, piece{(1 + e) * p.slope, (1 + e) * p.off}, piece{p.slope, p.off + f})
		}
		ps = late
	}
	return v, ps, true
}

// slope returns the time per unit multiplier of the stage that governs a
// device at a fault (for a margin of a sequence) and its variable; 0 and
// −1 when that stage is fixed or the device does not operate.
func (l *linearizer) slope(dev int, at coord.Operating) (int, float64) {
	d := &l.s.Devices[dev]
	if d.Kind == coord.Fuse {
		return -1, 0
	}
	tm := l.timers[dev]
	best, bestS, g := -1, math.Inf(1), 0.0
	for i, st := range d.Stages {
		if t, gi, ok := stageTimeG(d, st, tm.StageCurrentA(i, at), coord.Nominal); ok && t < bestS {
			best, bestS, g = i, t, gi
		}
	}
	if best < 0 || l.index[dev][best] < 0 {
		return -1, 0
	}
	st := d.Stages[best]
	ok := g > 0 && !math.IsInf(g, 1)
	if !ok || bestS <= st.Curve.(curves.InverseTime).MinTimeS && st.Curve.(curves.InverseTime).MinTimeS > 0 {
		return -1, 0
	}
	return l.index[dev][best], g
}

// constraint is A·x_U − B·x_D ≥ C, U or D −1 when the term is fixed,
// from stage upStage (−1: the device as a whole) of the upstream device.
// For the pickup search it also records the currents ua and da at which
// the two variable stages were timed (A and B are proportional to their
// times at multiplier 1 there) and the parts cu and cd of C that scale
// with those times (a margin of a sequence: its integrated times).
type constraint struct {
	u, d    int
	a, b, c float64
	upStage int
	ua, da  float64
	cu, cd  float64
}

// constraints linearises one margin.
func (l *linearizer) constraints(ms *coord.MarginSample, emit func(constraint)) {
	if ms.Sequence {
		l.sequenceConstraint(ms, emit)
		return
	}
	dv, dps, ok := l.downPieces(ms.Down, ms.DownAt, ms.DownBand)
	if !ok {
		return
	}
	da := l.varCurrent(dv, ms.DownAt)
	if ms.Up < 0 {
		// A clearing bound: −β·t_D ≥ γ.
		for _, q := range dps {
			emit(constraint{u: -1, d: dv, a: 0, b: ms.Beta * q.slope, c: ms.Gamma + ms.Beta*q.off, upStage: -1, da: da})
		}
		return
	}
	uvars, ups, stages := l.upPieces(ms.Up, ms.UpAt, ms.UpBand)
	for i, uv := range uvars {
		ua := l.varCurrent(uv, ms.UpAt)
		for _, p := range ups[i] {
			for _, q := range dps {
				emit(constraint{u: uv, d: dv, a: ms.Alpha * p.slope, b: ms.Beta * q.slope,
					c: ms.Gamma - ms.Alpha*p.off + ms.Beta*q.off, upStage: stages[i], ua: ua, da: da})
			}
		}
	}
}

// varCurrent returns the current the stage of variable v responds to at
// a fault (0 for −1).
func (l *linearizer) varCurrent(v int, at coord.Operating) float64 {
	if v < 0 || l.vars == nil {
		return 0
	}
	x := l.vars[v]
	return l.timers[x.Device].StageCurrentA(x.Stage, at)
}

// sequenceConstraint linearises a margin of an opening sequence in the
// two devices' multipliers, the other openings held.
func (l *linearizer) sequenceConstraint(ms *coord.MarginSample, emit func(constraint)) {
	uv, gu := -1, 0.0
	if ms.Up >= 0 {
		uv, gu = l.slope(ms.Up, ms.UpAt)
	}
	dv, gd := l.slope(ms.Down, ms.DownAt)
	upS, downS := ms.UpS, ms.DownS
	// C = γ − α·t_U + β·t_D + α·g_U·x_U − β·g_D·x_D, the times of the
	// variable stages' devices split off as the parts that scale with
	// them.
	k := constraint{u: uv, d: dv, a: ms.Alpha * gu, b: ms.Beta * gd, c: ms.Gamma, upStage: -1}
	if uv >= 0 {
		k.cu = ms.Alpha * (gu*l.x[uv] - upS)
		k.ua = l.varCurrent(uv, ms.UpAt)
	} else {
		k.c -= ms.Alpha * upS
	}
	if dv >= 0 {
		k.cd = ms.Beta * (downS - gd*l.x[dv])
		k.da = l.varCurrent(dv, ms.DownAt)
	} else {
		k.c += ms.Beta * downS
	}
	k.c += k.cu + k.cd
	emit(k)
}
