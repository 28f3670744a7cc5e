package tcc

import (
	"math"
	"slices"

	"tripgrade/coord"
	"tripgrade/curves"
)

// Point is a point of a chart: a current in amperes at the chart's
// voltage and a time in seconds.
type Point struct {
	CurrentA, TimeS float64
}

// TraceKind says which curve of a device a trace is.
type TraceKind uint8

// Trace kinds.
const (
	PhaseCurve  TraceKind = iota // a relay's phase stages combined
	GroundCurve                  // a relay's ground (residual) stages combined
	MeltCurve                    // a fuse's minimum-melting curve (thin)
	ClearCurve                   // a fuse's total-clearing curve (thick)
	// SeenCurve is an upstream device's curve as it responds to the kind
	// of fault that set a pair's worst margin, drawn against the
	// downstream device's current (thin): it passes through the upper end
	// of the pair's margin bracket.
	SeenCurve
)

// String names the kind as the chart's key does.
func (k TraceKind) String() string {
	return [...]string{"phase", "ground", "minimum melting", "total clearing", "as seen at the worst fault"}[k]
}

// Trace is one curve of one device as drawn: runs of points where the
// device operates, broken where it does not (below pickup) or where its
// curve is not defined. A relay's times below the axis are drawn on its
// floor.
type Trace struct {
	Device int
	Kind   TraceKind
	Runs   [][]Point
}

// TimeAt reads the trace at a current by log–log interpolation between its
// points, as the line is drawn. ok is false where the trace has no line.
func (t Trace) TimeAt(currentA float64) (timeS float64, ok bool) {
	for _, run := range t.Runs {
		for k := 0; k+1 < len(run); k++ {
			a, b := run[k], run[k+1]
			if currentA < a.CurrentA || currentA > b.CurrentA {
				continue
			}
			if b.CurrentA == a.CurrentA {
				return a.TimeS, true
			}
			u := math.Log(currentA/a.CurrentA) / math.Log(b.CurrentA/a.CurrentA)
			return math.Exp(math.Log(a.TimeS) + u*math.Log(b.TimeS/a.TimeS)), true
		}
	}
	return math.NaN(), false
}

// band is a shaded region between two curves of a device: its tolerance
// band, or a fuse's melting-to-clearing spread.
type band struct {
	device       int
	fuse         bool
	lower, upper [][]Point
}

// Sampling of curves: points per decade of current, the highest time kept
// (far above the axis, so a curve leaves the plot near vertical at its
// pickup rather than bending along the top), and the time a zero-time
// stage is drawn at, just above the axis floor.
const (
	samplesPerDecade = 160
	ceilingS         = 1e7
	floorS           = TimeMinS * 1.03
)

// stagesFor returns the characteristics of relay i's stages that operate
// for the faults its charts are about, those beyond it away from the grid
// sources: current into its branch where its branch leads away from
// them, into its bus where it leads towards them (an LV incomer). A stage
// directional the other way is left off the chart, as the checks leave it
// out for those faults.
func (a *Atlas) stagesFor(i int) (phase, ground [3]curves.Characteristic) {
	return a.timers[i].Toward(a.facing(i))
}

// facing is the direction of the current that the faults ahead of device
// i drive through it.
func (a *Atlas) facing(i int) coord.Direction {
	if a.in.Topology.IntoBranch(a.in.Study.Devices[i].Point) {
		return coord.Forward
	}
	return coord.Reverse
}

// deviceTraces samples device i's curves of the chart's kind across the
// current axis: a relay's phase (or ground) stages combined, a fuse's
// melting and clearing curves, and the shaded band between the edges of a
// declared tolerance or between a fuse's two curves.
func (c *Chart) deviceTraces(i int) ([]Trace, []band) {
	d := &c.atlas.in.Study.Devices[i]
	f := c.factor(i, c.Kind)
	var pickups []float64
	for _, s := range d.Stages {
		if s.Measures == c.Kind {
			pickups = append(pickups, s.PickupA)
		}
	}
	if d.Kind == coord.Fuse {
		if d.Melt == nil || d.Clear == nil || c.Kind != coord.Phase {
			return nil, nil
		}
		for _, tb := range []*curves.Table{d.Melt, d.Clear} {
			lo, hi := tb.Span()
			pickups = append(pickups, lo, hi)
		}
		melt := c.sample(d.Melt, f, pickups, false, c.xMin, c.xMax)
		clear := c.sample(d.Clear, f, pickups, false, c.xMin, c.xMax)
		return []Trace{{Device: i, Kind: MeltCurve, Runs: melt}, {Device: i, Kind: ClearCurve, Runs: clear}},
			[]band{{device: i, fuse: true, lower: melt, upper: clear}}
	}
	phase, ground := c.atlas.stagesFor(i)
	ch, kind := phase, PhaseCurve
	if c.Kind == coord.Residual {
		ch, kind = ground, GroundCurve
	}
	if ch[coord.Nominal] == nil {
		return nil, nil
	}
	out := []Trace{{Device: i, Kind: kind, Runs: c.sample(ch[coord.Nominal], f, pickups, true, c.xMin, c.xMax)}}
	var bands []band
	if d.Accuracy.ClassPct > 0 {
		bands = append(bands, band{device: i,
			lower: c.sample(ch[coord.Early], f, pickups, true, c.xMin, c.xMax),
			upper: c.sample(ch[coord.Late], f, pickups, true, c.xMin, c.xMax)})
	}
	return out, bands
}

// sample evaluates ch (in the device's own amperes) at log-spaced currents
// from fromA to toA on the axis and just either side of every break
// current (a stage's pickup, a table's ends), where the curve steps; f
// refers the device's currents to the axis. With floored, times below the
// axis are drawn on its floor (a relay's instantaneous stage, modelled as
// 0 s, stays in sight); otherwise the curve leaves the plot there (a fuse
// clearing in a few milliseconds, a damage curve).
func (c *Chart) sample(ch curves.Characteristic, f float64, breaks []float64, floored bool, fromA, toA float64) [][]Point {
	lo, hi := fromA/f, toA/f
	if !(hi > lo) || !(lo > 0) || math.IsInf(hi, 0) {
		return nil
	}
	n := int(math.Ceil(math.Log10(hi/lo) * samplesPerDecade))
	xs := make([]float64, 0, n+1+8*len(breaks))
	for k := 0; k <= n; k++ {
		xs = append(xs, lo*math.Pow(hi/lo, float64(k)/float64(n)))
	}
	for _, b := range breaks {
		if !(b > 0) {
			continue
		}
		// The pickup itself (where a stage does not yet operate) and
		// points ever closer above it, so the steep start of an inverse
		// curve and the step of a definite-time stage are drawn true.
		xs = append(xs, b, b*(1+1e-9))
		for e := 1; e <= 6; e++ {
			xs = append(xs, b*(1+math.Pow(10, -float64(e))))
		}
	}
	slices.Sort(xs)
	xs = slices.Compact(xs)
	var runs [][]Point
	var run []Point
	prevNoTrip := false
	flush := func() {
		if len(run) > 1 {
			runs = append(runs, run)
		}
		run = nil
	}
	for _, x := range xs {
		if x < lo || x > hi {
			continue
		}
		t, st := ch.Time(x)
		if st != curves.Operates || math.IsNaN(t) {
			flush()
			prevNoTrip = st == curves.NoTrip
			continue
		}
		t = math.Min(t, ceilingS)
		switch {
		case floored:
			t = math.Max(t, floorS)
		case t < TimeMinS*1e-3:
			t = TimeMinS * 1e-3 // far below the axis, clipped: keeps the log finite
		}
		if len(run) == 0 && prevNoTrip {
			// Below pickup the device does not operate at any time: the
			// characteristic's boundary is vertical there.
			run = append(run, Point{x * f, ceilingS})
		}
		run = append(run, Point{x * f, t})
		prevNoTrip = false
	}
	flush()
	return runs
}

// levelTime returns the device's own time at a fault level (NaN when it
// does not operate there).
func (c *Chart) levelTime(l level) float64 {
	d := &c.atlas.in.Study.Devices[l.device]
	phase, ground := c.atlas.stagesFor(l.device)
	var ch curves.Characteristic
	switch {
	case d.Kind == coord.Fuse:
		ch = d.Clear
	case c.Kind == coord.Residual:
		ch = ground[coord.Nominal]
	default:
		ch = phase[coord.Nominal]
	}
	if ch == nil {
		return math.NaN()
	}
	s, st := ch.Time(l.deviceA)
	if st != curves.Operates {
		return math.NaN()
	}
	return math.Max(s, floorS)
}
