package tcc

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"tripgrade/coord"
	"tripgrade/curves"
	"tripgrade/faults"
)

// level is a fault level at a device: the largest or smallest current of
// the chart's kind (phase, or residual 3I0) it sees over the faults of its
// zone.
type level struct {
	device  int
	max     bool
	deviceA float64 // in the device's own amperes
	a       float64 // on the chart's axis
	timeS   float64 // the device's own time there, NaN when it does not operate
	label   string  // empty when another level at the same current carries the label
}

// vline is a labelled vertical line: a maximum load current.
type vline struct {
	a     float64
	label string
}

// inrushMark is a transformer inrush point.
type inrushMark struct {
	a, timeS float64
	label    string
}

// damage is a withstand curve of a transformer or cable.
type damage struct {
	label string
	runs  [][]Point
}

// margin is a pair's grading finding as the chart shows it.
type margin struct {
	pair     coord.Pair
	f        *coord.Finding
	dA, uA   float64 // the two devices' currents at the worst fault, on the axis
	dS, uS   float64 // their times there
	drawable bool
}

// fmtA formats a current compactly: "97 A", "190 A", "5.58 kA", "1.16 MA",
// the figure and its unit joined by a no-break space; a current that is
// not there is "none", never a figure.
func fmtA(a float64) string {
	switch {
	case !(a > 0) || math.IsInf(a, 0):
		return "none"
	case a >= 999.5e3:
		return fmt.Sprintf("%.3g\u00a0MA", a/1e6)
	case a >= 999.5:
		return fmt.Sprintf("%.3g\u00a0kA", a/1000)
	}
	return fmt.Sprintf("%.3g\u00a0A", a)
}

// extreme is one fault level of a device in its own amperes.
type extreme struct {
	a   float64
	max bool
}

// residueShare is the share of a device's largest fault current below
// which a smaller figure of the same kind is the rounding residue of a
// solve, not a current: no fault level is a millionth of another at one
// device. (The engine already returns exactly 0 for such residue; this
// keeps an axis from stretching to 1e-12 A should one ever get through.)
const residueShare = 1e-6

// levelsOf returns the fault levels of kind q that device i sees over its
// zone: the largest (maximum case) and the smallest (minimum case), each
// only when some fault drives current of that kind through it (a current
// of 0, or residue next to the largest, is "none", never a level).
func (a *Atlas) levelsOf(i int, q coord.Quantity) []extreme {
	sum := a.in.Levels[i]
	hi, lo := sum.PhaseMax, sum.PhaseMin
	if q == coord.Residual {
		hi, lo = sum.ResidualMax, sum.ResidualMin
	}
	var out []extreme
	for _, x := range []struct {
		e   faults.Extreme
		max bool
	}{{hi, true}, {lo, false}} {
		if x.e.Found && x.e.A > 0 && !math.IsInf(x.e.A, 0) {
			out = append(out, extreme{a: x.e.A, max: x.max})
		}
	}
	if len(out) == 2 && out[1].a < residueShare*out[0].a {
		out = out[:1]
	}
	return out
}

// faultLevels collects the drawn devices' fault levels of the chart's
// kind that lie on the axis, but not those of a last device that
// continues on the next part's chart. Levels of several devices at one
// current share one label; levels off the axis are named in the key.
func (c *Chart) faultLevels() []level {
	s := c.atlas.in.Study
	var out []level
	for k, i := range c.Devices {
		if c.spec.overlapTop && k == len(c.Devices)-1 && k > 0 {
			// Its fault levels are those of the next part of the path,
			// drawn on that part's chart.
			continue
		}
		for _, x := range c.atlas.levelsOf(i, c.Kind) {
			l := level{device: i, max: x.max, deviceA: x.a, a: x.a * c.factor(i, c.Kind)}
			if !c.within(l.a) {
				c.offAxis = append(c.offAxis, fmt.Sprintf("%s %s %s (%s on this axis)", s.Devices[i].Name, c.levelWord(x.max), fmtA(x.a), fmtA(l.a)))
				continue
			}
			out = append(out, l)
		}
	}
	// One label per current: "F1, T1-LV max 5.27 kA".
	for k := range out {
		var names []string
		first := true
		for j := range out {
			if out[j].max == out[k].max && math.Abs(out[j].a/out[k].a-1) < 0.005 {
				if j < k {
					first = false
				}
				names = append(names, s.Devices[out[j].device].Name)
			}
		}
		if first {
			out[k].label = fmt.Sprintf("%s %s %s", strings.Join(names, ", "), c.levelWord(out[k].max), fmtA(out[k].a))
		}
	}
	return out
}

// levelWord names a level on the chart: "max", "min", "3I0 max".
func (c *Chart) levelWord(isMax bool) string {
	w := "min"
	if isMax {
		w = "max"
	}
	if c.Kind == coord.Residual {
		w = "3I0 " + w
	}
	return w
}

// loadLines gives the maximum load current through each drawn device, one
// line for devices that carry the same current.
func (c *Chart) loadLines() []vline {
	in := c.atlas.in
	type group struct {
		a     float64
		names []string
	}
	var gs []*group
	for _, i := range c.Devices {
		la, _ := coord.LoadThrough(in.Study, in.Topology, i)
		if !(la > 0) {
			continue
		}
		a := la * c.factor(i, coord.Phase)
		var g *group
		for _, h := range gs {
			if math.Abs(h.a/a-1) < 0.005 {
				g = h
			}
		}
		if g == nil {
			g = &group{a: a}
			gs = append(gs, g)
		}
		g.names = append(g.names, in.Study.Devices[i].Name)
	}
	var out []vline
	for _, g := range gs {
		who := strings.Join(g.names, ", ")
		if len(g.names) > 2 {
			who = g.names[0] + " … " + g.names[len(g.names)-1] // devices in a row on the path
		}
		text := "load " + who + " " + fmtA(g.a)
		if !c.within(g.a) {
			c.offAxis = append(c.offAxis, text)
			continue
		}
		out = append(out, vline{a: g.a, label: text})
	}
	return out
}

// equipment returns the branches whose equipment the chart shows: those
// on the route between each two neighbouring devices drawn, and the zone
// of the most downstream one (what it protects).
func (c *Chart) equipment() []int {
	a := c.atlas
	out := slices.Clone(a.in.Topology.Zones[c.Devices[0]].Branches)
	add := func(bs []int) {
		for _, b := range bs {
			if !slices.Contains(out, b) {
				out = append(out, b)
			}
		}
	}
	for k := 0; k+1 < len(c.Devices); k++ {
		add(a.route(c.Devices[k+1], c.Devices[k]))
	}
	for _, p := range c.Pairs {
		add(a.route(p.Upstream, p.Downstream))
	}
	return out
}

// inrushMarks gives the inrush point of the transformers each drawn device
// energises, once per set of transformers, when every one of them lies on
// the chart's part of the path (a transformer on another feeder is not
// this path's equipment).
func (c *Chart) inrushMarks() []inrushMark {
	in := c.atlas.in
	crit := in.Study.Criteria
	if !(crit.InrushTimeS > 0) {
		return nil
	}
	own := c.equipment()
	seen := map[string]bool{}
	var out []inrushMark
	for _, i := range c.Devices {
		ia, mva := coord.InrushA(in.Study, in.Topology, i)
		trs := coord.TransformersEnergised(in.Study, in.Topology, i)
		if mva == 0 || !(ia > 0) || !containsAll(own, trs) {
			continue
		}
		var names []string
		for _, b := range trs {
			names = append(names, in.Study.Network.BranchName(b))
		}
		key := strings.Join(names, "\x00")
		if seen[key] {
			continue
		}
		seen[key] = true
		what := strings.Join(names, "+")
		if len(names) > 2 {
			what = fmt.Sprintf("%d transformers", len(names))
		}
		a := ia * c.factor(i, coord.Phase)
		text := fmt.Sprintf("inrush %s %s", what, fmtA(a))
		if !c.within(a) {
			c.offAxis = append(c.offAxis, text)
			continue
		}
		out = append(out, inrushMark{a: a, timeS: crit.InrushTimeS, label: text})
	}
	return out
}

func containsAll(set, xs []int) bool {
	for _, x := range xs {
		if !slices.Contains(set, x) {
			return false
		}
	}
	return true
}

// damageCurves samples the withstand curves of the transformers and cables
// on the chart's part of the path: for a transformer, the curve in amperes
// of its upstream side, where its protection sits, referred to the chart's
// bus. Cables of one withstand (the same conductor) share one curve.
func (c *Chart) damageCurves() []damage {
	in := c.atlas.in
	n := in.Study.Network
	type drawn struct {
		names []string
		what  string
		runs  [][]Point
	}
	var ds []*drawn
	for _, b := range c.equipment() {
		if b >= len(in.Study.Equipment) || in.Study.Equipment[b] == nil {
			continue
		}
		eq := in.Study.Equipment[b]
		from, to := n.BranchEnds(b)
		var ch curves.Characteristic
		bus, what := from, "I²t withstand"
		if n.IsTransformer(b) {
			side := 0
			if in.Topology.Downstream[b] == faults.From {
				side, bus = 1, to
			}
			ch, what = eq.Damage[side], fmt.Sprintf("C57.109 (cat. %s)", eq.Category)
		} else {
			ch = eq.Cable
		}
		if ch == nil {
			continue
		}
		f := in.Topology.ReferA(1, bus, c.refBus)
		lo, hi := ch.Span()
		runs := c.sample(ch, f, []float64{lo, hi}, false, c.xMin, c.xMax)
		if len(runs) == 0 {
			continue
		}
		var same *drawn
		for _, d := range ds {
			if d.what == what && slices.EqualFunc(d.runs, runs, slices.Equal) {
				same = d
			}
		}
		if same == nil {
			same = &drawn{what: what, runs: runs}
			ds = append(ds, same)
		}
		same.names = append(same.names, n.BranchName(b))
	}
	out := make([]damage, len(ds))
	for k, d := range ds {
		who := strings.Join(d.names, ", ")
		if len(d.names) > 2 {
			who = fmt.Sprintf("%s and %d more", d.names[0], len(d.names)-1)
		}
		out[k] = damage{label: who + " " + d.what, runs: d.runs}
	}
	return out
}

// marginMarks takes each pair's worst grading point from its finding,
// referred to the chart's axis.
func (c *Chart) marginMarks() []margin {
	in := c.atlas.in
	var out []margin
	for _, p := range c.Pairs {
		m := margin{pair: p, f: gradingFinding(in.Result, in.Study, p)}
		if m.f != nil && m.f.Valid && m.f.Fault != nil {
			r := m.f.Fault
			m.dA, m.uA = r.DeviceA*c.factor(p.Downstream, r.DeviceQty), r.OtherA*c.factor(p.Upstream, r.OtherQty)
			m.dS, m.uS = r.DeviceS, r.OtherS
			m.drawable = m.dA > 0 && m.uA > 0 && m.dS >= 0 && m.uS >= 0 &&
				!math.IsNaN(m.dS) && !math.IsNaN(m.uS) && !math.IsInf(m.dS, 0) && !math.IsInf(m.uS, 0) &&
				!math.IsInf(m.dA, 0) && !math.IsInf(m.uA, 0)
		}
		out = append(out, m)
	}
	return out
}

// marginText is a margin as the chart writes it: "0.21 s < 0.30 s" when it
// fails, "0.45 s ≥ 0.30 s" when it passes, with three decimals when two
// would make the two figures look equal.
func marginText(f *coord.Finding) string {
	rel := f.Relation
	if f.Verdict == coord.Fail {
		rel = "<"
	}
	for _, prec := range []int{2, 3} {
		m, r := fmtS(f.Measured, prec), fmtS(f.Required, prec)
		if m != r || prec == 3 {
			return nb(m+" s") + " " + rel + " " + nb(r+" s")
		}
	}
	return ""
}

// fmtS formats seconds with a true minus sign.
func fmtS(s float64, prec int) string {
	t := fmt.Sprintf("%.*f", prec, s)
	return strings.Replace(t, "-", "−", 1)
}
