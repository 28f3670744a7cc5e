package tcc

import (
	"slices"
	"strconv"
	"sync"

	"tripgrade/coord"
)

// The time axis, in seconds: from the fastest a breaker-and-relay pair can
// act to the longest anyone grades a curve.
const (
	TimeMinS = 0.01
	TimeMaxS = 1000
)

// Chart is one time–current plot: the curves of a part of a coordination
// path (or of one failing pair) for one kind of fault, with what a
// protection engineer judges them against. Every current on it is
// referred to one bus (RefKV) by the transformers' rated winding ratios.
type Chart struct {
	// Name is the chart's file stem, safe to use as a file name.
	Name string
	// Subtitle names the path or the pair.
	Subtitle string
	// Kind is coord.Phase for a phase-fault chart (phase stages, fuses,
	// phase fault levels) and coord.Residual for an earth-fault chart
	// (ground stages and residual fault levels).
	Kind coord.Quantity
	// Devices are the devices drawn, the most downstream first.
	Devices []int
	// Pairs are the backup pairs whose margins are drawn.
	Pairs []coord.Pair

	atlas     *Atlas
	spec      chartSpec
	pair      *coord.Pair // set for a failing pair's chart
	elsewhere []string    // pairs of its devices drawn on another chart
	once      sync.Once

	refBus     int
	refKV      float64
	referred   bool
	xMin, xMax float64
	looks      map[int]Style
	traces     []Trace
	bands      []band
	seen       []seenCurve
	levels     []level
	loads      []vline
	inrush     []inrushMark
	damages    []damage
	margins    []margin
	offAxis    []string // what lies beyond the current axis, for the key
}

func newChart(a *Atlas, sp chartSpec) *Chart {
	c := &Chart{Kind: sp.kind, Devices: sp.devices, Pairs: sp.pairs, atlas: a, spec: sp, pair: sp.pair}
	names := a.names(sp.devices)
	switch {
	case sp.pair != nil:
		s := a.in.Study
		d, u := s.Devices[sp.pair.Downstream].Name, s.Devices[sp.pair.Upstream].Name
		c.Name = pairStem(d, u)
		c.Subtitle = "pair " + u + " over " + d + " (failing grading margin, at " + kindWord(sp.kind) + " faults)"
	default:
		c.Name = pathStem(names)
		if sp.kind == coord.Residual {
			c.Name = truncateStem(c.Name + "-earth")
		}
		c.Subtitle = c.pathSubtitle(names)
	}
	return c
}

// pathSubtitle says which devices the chart draws and how it lies on its
// path.
func (c *Chart) pathSubtitle(names []string) string {
	a, sp := c.atlas, c.spec
	s := join(names) + " (downstream to source)"
	whole := a.names(sp.path)
	n := a.in.Study.Network
	switch {
	case sp.kind == coord.Residual && !slices.Equal(sp.devices, []int(sp.path)):
		s += ": the ground stages on this part of the path that residual current reaches"
	case sp.below >= 0 && sp.above >= 0:
		s += "; part of path " + whole[0] + " to " + whole[len(whole)-1] + ", split at " + n.BranchName(sp.below) + " and " + n.BranchName(sp.above)
	case sp.below >= 0 || sp.above >= 0:
		b := sp.below
		if b < 0 {
			b = sp.above
		}
		s += "; part of path " + whole[0] + " to " + whole[len(whole)-1] + ", split at " + n.BranchName(b)
	}
	return s
}

// RefKV returns the voltage every current of the chart is referred to:
// that of its most downstream device's bus by the rated winding ratios of
// the transformers from the highest-voltage bus (coord.Topology.RatioKV),
// so 0.433 for the LV side of an 11/0.433 kV transformer.
func (c *Chart) RefKV() float64 {
	c.build()
	return c.refKV
}

// CurrentRange returns the current axis's extent in amperes at RefKV.
func (c *Chart) CurrentRange() (minA, maxA float64) {
	c.build()
	return c.xMin, c.xMax
}

// Traces returns the curves as drawn, in axis units: every device's own,
// then the upstream curves drawn as they respond to a pair's worst fault
// (kind SeenCurve).
func (c *Chart) Traces() []Trace {
	c.build()
	out := slices.Clone(c.traces)
	for _, s := range c.seen {
		out = append(out, s.trace)
	}
	return out
}

// Looks returns the look of every device with a curve on the chart.
func (c *Chart) Looks() map[int]Style {
	c.build()
	return c.looks
}

// Failing reports how many of the chart's pairs fail their grading margin.
func (c *Chart) Failing() int {
	c.build()
	n := 0
	for _, m := range c.margins {
		if m.f != nil && m.f.Verdict == coord.Fail {
			n++
		}
	}
	return n
}

// factor returns the ratio that refers device i's currents of quantity q
// to the chart's bus, by the transformers' rated winding ratios.
func (c *Chart) factor(i int, q coord.Quantity) float64 { return c.atlas.refer(i, q, c.refBus) }

// axisLabel names the current axis: the voltage, and how currents of other
// voltages were brought to it.
func (c *Chart) axisLabel() string {
	c.build()
	s := "current (A at " + fmtKV(c.refKV) + " kV"
	if c.referred {
		s += ", referred by winding ratios"
	}
	return s + ")"
}

// fmtKV writes a voltage with at most four significant figures, so a ratio
// of winding voltages shows as 0.433 and not as its rounding residue.
func fmtKV(kv float64) string { return strconv.FormatFloat(kv, 'g', 4, 64) }

// build computes everything drawn, once.
func (c *Chart) build() {
	c.once.Do(func() {
		a := c.atlas
		c.refBus = a.busFor(c.Devices[0], c.Kind)
		c.refKV = a.in.Topology.RatioKV(c.refBus)
		for _, i := range c.spec.members(a) {
			if b := a.busFor(i, c.Kind); b != c.refBus && a.in.Topology.RatioKV(b) != c.refKV {
				c.referred = true
			}
		}
		c.looks = c.chartLooks()
		c.margins = c.marginMarks()
		var extra []float64
		for _, m := range c.margins {
			if m.drawable {
				extra = append(extra, m.dA, m.uA)
			}
		}
		c.xMin, c.xMax = a.axisSpan(c.Kind, c.Devices, c.spec.overlapTop, c.refBus, extra)
		c.levels = c.faultLevels()
		if c.Kind == coord.Phase {
			c.loads = c.loadLines()
			c.inrush = c.inrushMarks()
			c.damages = c.damageCurves()
		}
		for _, i := range c.Devices {
			tr, bs := c.deviceTraces(i)
			c.traces = append(c.traces, tr...)
			c.bands = append(c.bands, bs...)
		}
		c.seen = c.seenCurves()
		for k := range c.levels {
			c.levels[k].timeS = c.levelTime(c.levels[k])
		}
	})
}

// chartLooks gives each device with a curve on the chart its look from the
// study-wide assignment, and another where that would repeat a look
// already on the chart (more devices drawn together than the study-wide
// assignment could keep apart).
func (c *Chart) chartLooks() map[int]Style {
	looks := map[int]Style{}
	var heldLook [styleCount]bool
	var heldColour [len(deviceColours)]bool
	for _, i := range c.spec.members(c.atlas) {
		k := c.atlas.slots[i]
		if heldLook[k] {
			k = firstFree(heldLook[:], heldColour[:])
		}
		heldLook[k] = true
		heldColour[styleOf(k).Colour] = true
		looks[i] = styleOf(k)
	}
	return looks
}

// within reports whether a current lies on the axis.
func (c *Chart) within(a float64) bool { return a >= c.xMin && a <= c.xMax }
