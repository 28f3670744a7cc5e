package tcc

import (
	"fmt"
	"math"
	"strings"

	"tripgrade/coord"
	"tripgrade/curves"
	"tripgrade/faults"
)

// level is a fault level at a device: the largest or smallest phase or
// residual current it sees over the faults of its zone.
type level struct {
	device  int
	ground  bool
	max     bool
	deviceA float64 // in the device's own amperes
	a       float64 // on the chart's axis
	timeS   float64 // the device's own time there, NaN when it does not operate
	label   string
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

// fmtA formats a current compactly: "97 A", "190 A", "5.58 kA", "1.16 MA".
func fmtA(a float64) string {
	if a >= 999.5e3 {
		return fmt.Sprintf("%.3g MA", a/1e6)
	}
	if a >= 999.5 {
		return fmt.Sprintf("%.3g kA", a/1000)
	}
	return fmt.Sprintf("%.3g A", a)
}

// faultLevels collects the four fault levels of every device that has a
// stage to see them: phase levels for phase stages and fuses, residual
// levels for ground stages.
func (c *Chart) faultLevels() []level {
	s := c.atlas.in.Study
	var out []level
	for _, i := range c.Devices {
		d := &s.Devices[i]
		sum := c.atlas.in.Levels[i]
		f := c.factor(i)
		phase := d.Kind == coord.Fuse || d.Pickup(coord.Phase) > 0
		ground := d.Kind == coord.Relay && d.Pickup(coord.Residual) > 0
		add := func(x faults.Extreme, isGround, isMax bool, what string) {
			if !x.Found || !(x.A > 0) {
				return
			}
			out = append(out, level{device: i, ground: isGround, max: isMax, deviceA: x.A, a: x.A * f,
				label: fmt.Sprintf("%s %s %s", d.Name, what, fmtA(x.A*f))})
		}
		if phase {
			add(sum.PhaseMax, false, true, "max")
			add(sum.PhaseMin, false, false, "min")
		}
		if ground {
			add(sum.ResidualMax, true, true, "3I0 max")
			add(sum.ResidualMin, true, false, "3I0 min")
		}
	}
	return out
}

// loadLines gives the maximum load current through each device, one line
// for devices that carry the same current.
func (c *Chart) loadLines() []vline {
	in := c.atlas.in
	type group struct {
		a     float64
		names []string
		label string
	}
	var gs []*group
	for _, i := range c.Devices {
		la, _ := coord.LoadThrough(in.Study, in.Topology, i)
		if !(la > 0) {
			continue
		}
		a := la * c.factor(i)
		var g *group
		for _, h := range gs {
			if math.Abs(h.a/a-1) < 0.005 {
				g = h
			}
		}
		if g == nil {
			g = &group{a: a, label: fmtA(a)}
			gs = append(gs, g)
		}
		g.names = append(g.names, in.Study.Devices[i].Name)
	}
	out := make([]vline, len(gs))
	for k, g := range gs {
		out[k] = vline{a: g.a, label: "load " + strings.Join(g.names, ", ") + " " + g.label}
	}
	return out
}

// inrushMarks gives the inrush point of the transformers each device
// energises, once per set of transformers.
func (c *Chart) inrushMarks() []inrushMark {
	in := c.atlas.in
	crit := in.Study.Criteria
	if !(crit.InrushTimeS > 0) {
		return nil
	}
	seen := map[string]bool{}
	var out []inrushMark
	for _, i := range c.Devices {
		ia, mva := coord.InrushA(in.Study, in.Topology, i)
		if mva == 0 || !(ia > 0) {
			continue
		}
		var names []string
		for _, b := range coord.TransformersEnergised(in.Study, in.Topology, i) {
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
		out = append(out, inrushMark{a: ia * c.factor(i), timeS: crit.InrushTimeS,
			label: fmt.Sprintf("inrush %s %s", what, fmtA(ia*c.factor(i)))})
	}
	return out
}

// damageCurves samples the withstand curves of the transformers and cables
// in the zones of the chart's devices: for a transformer, the curve in
// amperes of its upstream side, where its protection sits.
func (c *Chart) damageCurves() []damage {
	in := c.atlas.in
	n := in.Study.Network
	seen := map[int]bool{}
	var out []damage
	for _, i := range c.Devices {
		for _, b := range in.Topology.Zones[i].Branches {
			if seen[b] || b >= len(in.Study.Equipment) || in.Study.Equipment[b] == nil {
				continue
			}
			seen[b] = true
			eq := in.Study.Equipment[b]
			from, to := n.BranchEnds(b)
			var ch curves.Characteristic
			var bus int
			var label string
			if n.IsTransformer(b) {
				side, bus0 := 0, from
				if in.Topology.Downstream[b] == faults.From {
					side, bus0 = 1, to
				}
				ch, bus = eq.Damage[side], bus0
				label = fmt.Sprintf("%s C57.109 (cat. %s)", n.BranchName(b), eq.Category)
			} else {
				ch, bus = eq.Cable, from
				label = n.BranchName(b) + " I²t withstand"
			}
			if ch == nil {
				continue
			}
			f := n.Buses[bus].KV / c.refKV
			lo, hi := ch.Span()
			runs := c.sample(ch, f, []float64{lo, hi}, false)
			if len(runs) > 0 {
				out = append(out, damage{label: label, runs: runs})
			}
		}
	}
	return out
}

// marginMarks takes each pair's worst grading point from its finding.
func (c *Chart) marginMarks() []margin {
	in := c.atlas.in
	var out []margin
	for _, p := range c.Pairs {
		m := margin{pair: p, f: gradingFinding(in.Result, in.Study, p)}
		if m.f != nil && m.f.Valid && m.f.Fault != nil {
			r := m.f.Fault
			m.dA, m.uA = r.DeviceA*c.factor(p.Downstream), r.OtherA*c.factor(p.Upstream)
			m.dS, m.uS = r.DeviceS, r.OtherS
			m.drawable = m.dA > 0 && m.uA > 0 && m.dS >= 0 && m.uS >= 0 &&
				!math.IsNaN(m.dS) && !math.IsNaN(m.uS) && !math.IsInf(m.dS, 0) && !math.IsInf(m.uS, 0)
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
			return m + " s " + rel + " " + r + " s"
		}
	}
	return ""
}

// fmtS formats seconds with a true minus sign.
func fmtS(s float64, prec int) string {
	t := fmt.Sprintf("%.*f", prec, s)
	return strings.Replace(t, "-", "−", 1)
}
