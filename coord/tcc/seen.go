package tcc

import (
	"fmt"
	"math"
	"slices"

	"tripgrade/coord"
	"tripgrade/curves"
)

// seenCurve is an upstream device's curve as it responds to the kind of
// fault that set a pair's worst margin, drawn against the downstream
// device's current. Where the two devices see different currents for that
// fault (an LL fault behind a delta–star transformer gives the HV side
// 2/√3 of the referred LV current, an LG fault 1/√3; parallel incomers
// share a feeder's current), the upstream device's own curve does not pass
// through the margin bracket, and a reader comparing the two curves at
// one current would see another margin than the one the check found. This
// curve does pass through the bracket's upper end.
type seenCurve struct {
	pair   coord.Pair
	trace  Trace
	factor float64 // upstream current ÷ downstream current at the worst fault, both on the axis
	label  string
}

// seenTolerance is how far the two devices' currents may differ before the
// chart draws the upstream curve as seen: below 1 % the two curves are
// indistinguishable at the chart's scale.
const seenTolerance = 0.01

// seenCurves draws, for every pair whose margin is drawn, the upstream
// curve as it responds to the worst fault, when the upstream device sees
// another current than the downstream one or is not itself drawn on the
// chart with the curve that set its time. The ratio of the two currents
// comes from the grading finding; nothing is computed again.
func (c *Chart) seenCurves() []seenCurve {
	var out []seenCurve
	for _, m := range c.margins {
		if !m.drawable {
			continue
		}
		u := m.pair.Upstream
		k := m.uA / m.dA
		if c.drawsAsSet(u, m.f.Fault.OtherQty) && math.Abs(k-1) < seenTolerance {
			continue
		}
		ch, breaks, floored := c.upstreamCurve(u, m.f.Fault.OtherQty)
		if ch == nil {
			continue
		}
		lo, hi := c.seenRange(m)
		runs := c.sample(ch, c.factor(u, m.f.Fault.OtherQty)/k, breaks, floored, lo, hi)
		if len(runs) == 0 {
			continue
		}
		out = append(out, seenCurve{pair: m.pair, factor: k, label: c.seenLabel(m, k),
			trace: Trace{Device: u, Kind: SeenCurve, Runs: runs}})
	}
	return out
}

// drawsAsSet reports whether device u is drawn on the chart with the curve
// of the current that set its time.
func (c *Chart) drawsAsSet(u int, q coord.Quantity) bool {
	d := &c.atlas.in.Study.Devices[u]
	if !slices.Contains(c.Devices, u) {
		return false
	}
	return d.Kind == coord.Fuse || q == c.Kind
}

// upstreamCurve returns the characteristic the grading check timed the
// upstream device by: a fuse's minimum melting curve, a relay's phase or
// ground stages in the band the criteria grade on; with its break currents
// and whether its times below the axis are drawn on the floor.
func (c *Chart) upstreamCurve(u int, q coord.Quantity) (curves.Characteristic, []float64, bool) {
	d := &c.atlas.in.Study.Devices[u]
	if d.Kind == coord.Fuse {
		if d.Melt == nil {
			return nil, nil, false
		}
		lo, hi := d.Melt.Span()
		return d.Melt, []float64{lo, hi}, false
	}
	band := coord.Nominal
	if crit := c.atlas.in.Study.Criteria; crit.WorstCaseTimes && crit.Components == nil {
		band = coord.Early // the upstream edge the grading check takes
	}
	phase, ground := c.atlas.stagesFor(u)
	ch := phase[band]
	if q == coord.Residual {
		ch = ground[band]
	}
	var breaks []float64
	for _, s := range d.Stages {
		if s.Measures == q {
			breaks = append(breaks, s.PickupA)
		}
	}
	return ch, breaks, true
}

// seenRange returns the currents over which a seen curve is drawn: the
// downstream device's fault levels of the current that set its time (the
// faults the pair is graded over), with some room, but no further than a
// factor of three either side of the worst fault, and within the axis. A
// short stretch through the bracket is what the curve is for; drawn
// across the whole chart it would be one more long line to tell apart.
func (c *Chart) seenRange(m margin) (lo, hi float64) {
	d := m.pair.Downstream
	lo, hi = m.dA/2, m.dA*2
	for _, x := range c.atlas.levelsOf(d, m.f.Fault.DeviceQty) {
		a := x.a * c.factor(d, m.f.Fault.DeviceQty)
		lo, hi = math.Min(lo, a/1.5), math.Max(hi, a*1.5)
	}
	lo, hi = math.Max(lo, m.dA/3), math.Min(hi, m.dA*3)
	return math.Max(lo, c.xMin), math.Min(hi, c.xMax)
}

// seenLabel names a seen curve: the upstream device, the fault kind and the
// ratio of its current to the downstream device's, "T1-HV at LL faults:
// I × 2/√3".
func (c *Chart) seenLabel(m margin, k float64) string {
	s := c.atlas.in.Study
	u := m.pair.Upstream
	who := s.Devices[u].Name
	if s.Devices[u].Kind == coord.Relay && m.f.Fault.OtherQty != c.Kind {
		who += " " + qtyWord(m.f.Fault.OtherQty)
	}
	sd := c.atlas.starDeltaBetween(u, m.pair.Downstream) >= 0
	return fmt.Sprintf("%s at %s faults: I × %s", who, m.f.Fault.Kind, factorText(k, sd))
}

// qtyWord names what a stage measures, as labels write it.
func qtyWord(q coord.Quantity) string {
	if q == coord.Residual {
		return "3I0"
	}
	return "phase"
}

// factorText writes the ratio of the upstream to the downstream current:
// as 2/√3, 1/√3 or √3 when a star–delta transformer lies between them and
// the ratio is that within 1 %, else as a figure.
func factorText(k float64, starDelta bool) string {
	if starDelta {
		for _, f := range []struct {
			v    float64
			text string
		}{{2 / math.Sqrt(3), "2/√3"}, {1 / math.Sqrt(3), "1/√3"}, {math.Sqrt(3), "√3"}} {
			if math.Abs(k/f.v-1) < 0.01 {
				return f.text
			}
		}
	}
	return fmt.Sprintf("%.3g", k)
}
