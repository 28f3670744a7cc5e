package propose

import (
	"math"
	"sort"
	"sync"

	"tripgrade/coord"
	"tripgrade/curves"
)

// Margins by pair of devices, for the pickup search.
//
// A pickup moves only the margins of its own device, so the search keeps
// the constraints of each pair of devices (upstream, downstream; −1
// upstream for clearing times) apart: a group. It keeps no margins
// themselves (a large study hands out millions), only the constraints
// that bind in two runs of the checker (probes), with every searched
// stage at the lowest and at the highest admissible pickup, each with the
// currents its variable stages were timed at. A constraint
//
//	A·x_U − B·x_D ≥ C
//
// has A and B proportional to the two stages' times at multiplier 1,
// g(I/Is) (IEC 60255-151, IEEE C37.112), so at other pickups it is the
// same constraint with A, B and the parts of C that are those stages'
// times (a sequence's) scaled by g(I/Is')/g(I/Is). A constraint whose
// stage no longer operates at a pickup is left out there. The envelopes
// of the two probes hold, between them, the constraints that bind at the
// ends of every admissible interval; one that binds only in between, or
// only where several pickups moved, is the estimate's error, which the
// verifying check and its rounds correct.

// scon is a constraint kept from a probe, with what rescales it.
type scon struct {
	u, d     int     // multiplier variables, −1 when fixed
	a, b, c  float64 // A, B and C at the probe's pickups
	cu, cd   float64 // the parts of C that scale with U's and D's time
	ua, da   float64 // the currents the variable stages were timed at
	pu, pd   float64 // their pickups in the probe
	gu0, gd0 float64 // their times at multiplier 1 there
}

// kind says whether a constraint links two multipliers (line), bounds
// the upstream one from below (low) or the downstream one from above
// (high), or neither.
func (k scon) kind() (line, low, high bool) {
	hasU, hasD := k.u >= 0 && k.a > 0, k.d >= 0 && k.b > 0
	return hasU && hasD, hasU && !hasD, hasD && !hasU
}

// group is the constraints of one pair of devices.
type group struct {
	up, down int
	cons     []scon   // kept from the probes
	lines    []edge   // at the current pickups: x_U ≥ K·x_D + B
	lows     []vbound // lower bounds of one multiplier, the highest of each
	highs    []vbound // upper bounds, the lowest of each
}

// vbound is a bound on multiplier v.
type vbound struct {
	v int
	x float64
}

// add files one constraint in the group's current lines and bounds, as
// collector.add does.
func (g *group) add(k scon, vars []Variable) {
	switch line, low, high := k.kind(); {
	case line:
		g.addLine(edge{u: k.u, d: k.d, k: k.b / k.a, b: k.c / k.a}, vars[k.d].Range)
	case low:
		g.lows = setBound(g.lows, k.u, k.c/k.a, math.Max)
	case high:
		g.highs = setBound(g.highs, k.d, -k.c/k.b, math.Min)
	}
}

// setBound keeps, per variable, the bound pick chooses.
func setBound(bs []vbound, v int, x float64, pick func(a, b float64) float64) []vbound {
	for i := range bs {
		if bs[i].v == v {
			bs[i].x = pick(bs[i].x, x)
			return bs
		}
	}
	return append(bs, vbound{v, x})
}

// addLine keeps the upper envelope of the lines between two multipliers
// over the lower one's range (as collector.addLine).
func (g *group) addLine(l edge, r coord.Range) {
	at := func(m edge, x float64) float64 { return m.k*x + m.b }
	for _, m := range g.lines {
		if m.u == l.u && m.d == l.d && at(m, r.Min) >= at(l, r.Min) && at(m, r.Max) >= at(l, r.Max) {
			return
		}
	}
	kept := g.lines[:0]
	for _, m := range g.lines {
		if !(m.u == l.u && m.d == l.d && at(l, r.Min) >= at(m, r.Min) && at(l, r.Max) >= at(m, r.Max)) {
			kept = append(kept, m)
		}
	}
	g.lines = append(kept, l)
}

// sortLines puts a group's current constraints in a fixed order (the
// label-correcting search drops conflicting lines in the order it meets
// them).
func (g *group) sortLines() {
	sort.Slice(g.lines, func(i, j int) bool {
		a, b := g.lines[i], g.lines[j]
		switch {
		case a.u != b.u:
			return a.u < b.u
		case a.d != b.d:
			return a.d < b.d
		case a.k != b.k:
			return a.k < b.k
		}
		return a.b < b.b
	})
	sort.Slice(g.lows, func(i, j int) bool { return g.lows[i].v < g.lows[j].v })
	sort.Slice(g.highs, func(i, j int) bool { return g.highs[i].v < g.highs[j].v })
}

// evaluate sets a group's current lines and bounds: its constraints
// rescaled to the current pickups.
func (sr *search) evaluate(g *group) {
	g.lines, g.lows, g.highs = nil, nil, nil
	for _, k := range g.cons {
		if r, ok := sr.rescale(k); ok {
			g.add(r, sr.vars)
		}
	}
	g.sortLines()
}

// rescale returns a probe's constraint at the current pickups, and false
// when one of its stages does not operate there.
func (sr *search) rescale(k scon) (scon, bool) {
	ratio := func(v int, a, p0, g0 float64) (float64, bool) {
		if v < 0 || sr.ofVar[v] < 0 {
			return 1, true
		}
		x := sr.vars[v]
		st := sr.s.Devices[x.Device].Stages[x.Stage]
		if st.PickupA == p0 {
			return 1, g0 > 0
		}
		g, ok := unitTime(st, st.PickupA, a)
		if !ok || g0 <= 0 {
			return 0, false
		}
		return g / g0, true
	}
	ru, ok := ratio(k.u, k.ua, k.pu, k.gu0)
	if !ok && k.u >= 0 && k.a > 0 {
		return k, false
	}
	rd, ok := ratio(k.d, k.da, k.pd, k.gd0)
	if !ok && k.d >= 0 && k.b > 0 {
		return k, false
	}
	if ru == 1 && rd == 1 {
		return k, true
	}
	k.c += k.cu*(ru-1) + k.cd*(rd-1)
	k.a *= ru
	k.b *= rd
	return k, true
}

// probe gathers, per group, the constraints that bind in one run of the
// checker: the envelope of the lines between two multipliers and the
// highest lower and lowest upper bound of each multiplier.
type probe struct {
	lines, lows, highs []scon
}

// add keeps k if it binds among the probe's constraints.
func (pb *probe) add(k scon, vars []Variable) {
	switch line, low, high := k.kind(); {
	case line:
		r := vars[k.d].Range
		at := func(m scon, x float64) float64 { return (m.b*x + m.c) / m.a }
		kLo, kHi := at(k, r.Min), at(k, r.Max)
		for i, m := range pb.lines {
			if m.u != k.u || m.d != k.d {
				continue
			}
			mLo, mHi := at(m, r.Min), at(m, r.Max)
			if mLo == kLo && mHi == kHi {
				// The same line from two margins: which is kept must not
				// depend on the order the checker hands them out.
				if sconLess(k, m) {
					pb.lines[i] = k
				}
				return
			}
			if mLo >= kLo && mHi >= kHi {
				return
			}
		}
		kept := pb.lines[:0]
		for _, m := range pb.lines {
			if m.u != k.u || m.d != k.d || !(kLo >= at(m, r.Min) && kHi >= at(m, r.Max)) {
				kept = append(kept, m)
			}
		}
		pb.lines = append(kept, k)
	case low:
		pb.lows = keepBound(pb.lows, k, func(m scon) (int, float64) { return m.u, m.c / m.a }, func(a, b float64) bool { return a > b })
	case high:
		pb.highs = keepBound(pb.highs, k, func(m scon) (int, float64) { return m.d, -m.c / m.b }, func(a, b float64) bool { return a < b })
	}
}

// keepBound keeps, per variable, the constraint whose bound wins.
func keepBound(bs []scon, k scon, bound func(scon) (int, float64), wins func(a, b float64) bool) []scon {
	v, x := bound(k)
	for i, m := range bs {
		if mv, mx := bound(m); mv == v {
			if wins(x, mx) || x == mx && sconLess(k, m) {
				bs[i] = k
			}
			return bs
		}
	}
	return append(bs, k)
}

// sconLess orders two constraints that ask the same at the probe's
// pickups, so that which one is kept is fixed.
func sconLess(a, b scon) bool {
	for _, d := range [...][2]float64{{a.ua, b.ua}, {a.da, b.da}, {a.a, b.a}, {a.b, b.b}, {a.cu, b.cu}, {a.cd, b.cd}} {
		if d[0] != d[1] {
			return d[0] < d[1]
		}
	}
	return false
}

// pairCollector receives the margins of one probe: it files each
// margin's constraints in the probe of its pair of devices and, when col
// is not nil, in a collector (the first round's, when the search raises
// no pickup). In the probe at the lowest pickups it also records, per
// multiplier, the least current at which its stage alone operates a
// device for a fault that device must clear (caps): a higher pickup would
// leave the fault to others.
type pairCollector struct {
	col    *collector
	lin    *linearizer
	vars   []Variable
	mu     sync.Mutex
	probes map[[2]int]*probe
	caps   []float64
}

// pairs returns the (upper, lower) device pairs of the probes, in order.
func (pc *pairCollector) pairs() [][2]int {
	keys := make([][2]int, 0, len(pc.probes))
	for key := range pc.probes {
		keys = append(keys, key)
	}
	sort.Slice(keys, func(i, j int) bool {
		if keys[i][0] != keys[j][0] {
			return keys[i][0] < keys[j][0]
		}
		return keys[i][1] < keys[j][1]
	})
	return keys
}

func newPairCollector(col *collector, lin *linearizer, vars []Variable) *pairCollector {
	lin.vars = vars
	pc := &pairCollector{col: col, lin: lin, vars: vars, probes: map[[2]int]*probe{}}
	if col != nil {
		pc.caps = make([]float64, len(vars))
		for i := range pc.caps {
			pc.caps[i] = math.Inf(1)
		}
	}
	return pc
}

// margin receives one margin from the checker (coord.Options.Margins).
func (pc *pairCollector) margin(ms *coord.MarginSample) {
	var buf [16]constraint
	cons := buf[:0]
	pc.lin.constraints(ms, func(k constraint) { cons = append(cons, k) })
	capV, capA := -1, 0.0
	if pc.caps != nil && mustOperate(ms) {
		capV, capA = pc.alone(ms.Down, ms.DownAt)
	}
	var sbuf [16]scon
	scons := sbuf[:0]
	for _, k := range cons {
		scons = append(scons, pc.scon(k))
	}
	pc.mu.Lock()
	defer pc.mu.Unlock()
	if pc.col != nil {
		pc.col.n++
		for _, k := range cons {
			pc.col.add(k, ms, nil)
		}
	}
	key := [2]int{ms.Up, ms.Down}
	pb := pc.probes[key]
	if pb == nil {
		pb = &probe{}
		pc.probes[key] = pb
	}
	for _, k := range scons {
		pb.add(k, pc.vars)
	}
	if capV >= 0 && capA < pc.caps[capV] {
		pc.caps[capV] = capA
	}
}

// scon records a constraint with what rescales it.
func (pc *pairCollector) scon(k constraint) scon {
	out := scon{u: k.u, d: k.d, a: k.a, b: k.b, c: k.c, cu: k.cu, cd: k.cd, ua: k.ua, da: k.da}
	if k.u >= 0 {
		out.pu, out.gu0 = pc.unit(k.u, k.ua)
	}
	if k.d >= 0 {
		out.pd, out.gd0 = pc.unit(k.d, k.da)
	}
	return out
}

// unit returns the pickup of variable v's stage in the probe and its
// time at multiplier 1 at current a (0 when it does not operate).
func (pc *pairCollector) unit(v int, a float64) (float64, float64) {
	x := pc.vars[v]
	st := pc.lin.s.Devices[x.Device].Stages[x.Stage]
	g, _ := unitTime(st, st.PickupA, a)
	return st.PickupA, g
}

// alone returns the variable whose stage alone operates device dev at a
// fault, and the current it sees; −1 when another stage operates too, or
// the stage is fixed.
func (pc *pairCollector) alone(dev int, at coord.Operating) (int, float64) {
	d := &pc.lin.s.Devices[dev]
	if d.Kind != coord.Relay {
		return -1, 0
	}
	v, a, n := -1, 0.0, 0
	for i, st := range d.Stages {
		ia := pc.lin.timers[dev].StageCurrentA(i, at)
		if _, ok := stageTime(d, st, ia, coord.Nominal); ok {
			n++
			v, a = pc.lin.index[dev][i], ia
		}
	}
	if n != 1 {
		return -1, 0
	}
	return v, a
}

// mustOperate reports whether a margin's downstream device is one that
// must clear its fault (a solved fault of the intact network).
func mustOperate(ms *coord.MarginSample) bool {
	return (ms.Check == coord.Clearing || ms.Check == coord.Discrimination) && ms.Scale == 1 && !ms.Sequence
}

// unitTime returns an inverse-time stage's time at multiplier 1 with
// pickup pickupA at current a, and false when it does not operate there.
func unitTime(st coord.Stage, pickupA, a float64) (float64, bool) {
	c := st.Curve.(curves.InverseTime)
	c.Multiplier, c.MinTimeS, c.PickupA = 1, 0, pickupA
	g, status := c.Time(a)
	return g, status == curves.Operates && g > 0 && !math.IsInf(g, 1)
}
