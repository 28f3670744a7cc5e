package tcc

import (
	"math"

	"tripgrade/coord"
)

// The time axis, in seconds: from the fastest a breaker-and-relay pair can
// act to the longest anyone grades a curve.
const (
	TimeMinS = 0.01
	TimeMaxS = 1000
)

// Chart is one time–current plot: the curves of a path's devices (or of
// one failing pair's two devices) with what a protection engineer judges
// them against. Every current on it is referred to RefKV.
type Chart struct {
	// Name is the chart's file stem, safe to use as a file name.
	Name string
	// Subtitle names the path or the pair.
	Subtitle string
	// Devices are the devices drawn, the most downstream first.
	Devices []int
	// Pairs are the backup pairs whose margins are drawn.
	Pairs []coord.Pair

	atlas *Atlas
	pair  *coord.Pair // set for a failing pair's chart
	built bool

	refKV      float64
	xMin, xMax float64
	traces     []Trace
	bands      []band
	levels     []level
	loads      []vline
	inrush     []inrushMark
	damages    []damage
	margins    []margin
}

func newChart(a *Atlas, devs []int, pairs []coord.Pair) *Chart {
	return &Chart{Devices: devs, Pairs: pairs, atlas: a}
}

// RefKV returns the voltage every current of the chart is referred to:
// that of the bus of its most downstream device.
func (c *Chart) RefKV() float64 {
	c.build()
	return c.refKV
}

// CurrentRange returns the current axis's extent in amperes at RefKV.
func (c *Chart) CurrentRange() (minA, maxA float64) {
	c.build()
	return c.xMin, c.xMax
}

// Traces returns the device curves as drawn, in axis units.
func (c *Chart) Traces() []Trace {
	c.build()
	return c.traces
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

// factor returns the ratio that refers device i's currents to the chart's
// voltage: the ratio of the two buses' nominal voltages.
func (c *Chart) factor(i int) float64 { return c.atlas.kvOf(i) / c.refKV }

// build computes everything drawn, once.
func (c *Chart) build() {
	if c.built {
		return
	}
	c.built = true
	c.refKV = c.atlas.kvOf(c.Devices[0])
	c.levels = c.faultLevels()
	c.loads = c.loadLines()
	c.inrush = c.inrushMarks()
	c.margins = c.marginMarks()
	c.xMin, c.xMax = c.currentAxis()
	for _, i := range c.Devices {
		tr, bs := c.deviceTraces(i)
		c.traces = append(c.traces, tr...)
		c.bands = append(c.bands, bs...)
	}
	c.damages = c.damageCurves()
	for k := range c.levels {
		c.levels[k].timeS = c.levelTime(c.levels[k])
	}
}

// currentAxis chooses whole decades that hold every pickup, load, fault
// level, inrush point and margin of the chart, with some room.
func (c *Chart) currentAxis() (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	see := func(a float64) {
		if a > 0 && !math.IsInf(a, 0) {
			lo, hi = math.Min(lo, a), math.Max(hi, a)
		}
	}
	s := c.atlas.in.Study
	for _, i := range c.Devices {
		d := &s.Devices[i]
		f := c.factor(i)
		see(d.Pickup(coord.Phase) * f)
		see(d.Pickup(coord.Residual) * f)
		for _, st := range d.Stages {
			see(st.PickupA * f)
		}
		if d.Kind == coord.Fuse && d.Clear != nil {
			l, h := d.Clear.Span()
			see(l * f)
			see(h * f)
		}
	}
	for _, l := range c.levels {
		see(l.a)
	}
	for _, l := range c.loads {
		see(l.a)
	}
	for _, m := range c.inrush {
		see(m.a)
	}
	for _, m := range c.margins {
		see(m.dA)
		see(m.uA)
	}
	if math.IsInf(lo, 1) {
		return 1, 1e4
	}
	lo = math.Pow(10, math.Floor(math.Log10(lo/1.5)))
	hi = math.Pow(10, math.Ceil(math.Log10(hi*1.5)))
	if hi/lo < 100 {
		hi = lo * 100
	}
	return lo, hi
}
