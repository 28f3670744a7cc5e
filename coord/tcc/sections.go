package tcc

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"tripgrade/coord"
)

// maxDecades is the widest current axis one chart may take, in decades.
// A path whose curves and fault levels, referred to one voltage, need
// more is split at a transformer into charts referred each to its own
// voltage: beyond about four decades the curves of the low-current end
// are crushed together and labels of remote fault levels run to mega-
// amperes. (Common practice; the figure is ours.)
const maxDecades = 4

// chartSpec is what one chart shows, before it is drawn.
type chartSpec struct {
	kind    coord.Quantity // coord.Phase: phase-fault chart; coord.Residual: earth-fault chart
	devices []int          // devices drawn, the most downstream first
	pairs   []coord.Pair   // pairs whose margins are drawn
	// overlapTop is set when the last device continues on the chart of
	// the next part of the path: its own fault levels, which belong to
	// the next part, do not set this chart's axis.
	overlapTop bool
	// below and above are the transformers where the path was split under
	// the first device and over the last (−1: not split there).
	below, above int
	path         Path        // the path the chart was cut from (nil: a failing pair)
	pair         *coord.Pair // set for a failing pair's chart
	absent       []int       // earth charts: devices whose ground stages no residual current reaches
}

// members returns every device with a curve on the chart: those drawn,
// and the upstream devices of its pairs (drawn as they respond to the
// worst fault when not drawn themselves).
func (sp chartSpec) members(a *Atlas) []int {
	out := slices.Clone(sp.devices)
	for _, p := range sp.pairs {
		if !slices.Contains(out, p.Upstream) {
			out = append(out, p.Upstream)
		}
	}
	return out
}

// key identifies what a spec draws, to draw it once.
func (sp chartSpec) key() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d|%v|%v|%t", sp.kind, sp.devices, sp.pairs, sp.pair != nil)
	return b.String()
}

// chartSpecs lists the study's charts: each path's, then each failing
// pair's, without repeats.
func (a *Atlas) chartSpecs() []chartSpec {
	var out []chartSpec
	seen := map[string]bool{}
	add := func(sp chartSpec) {
		if k := sp.key(); !seen[k] {
			seen[k] = true
			out = append(out, sp)
		}
	}
	for _, p := range a.paths {
		for _, sp := range a.pathSpecs(p) {
			add(sp)
		}
	}
	for _, p := range a.failing {
		add(a.pairSpec(p))
	}
	return out
}

// pathSpecs cuts a path into its charts: the phase-fault parts, then the
// earth-fault parts, and puts each of the path's pairs on the chart of the
// kind of fault that set its worst margin.
func (a *Atlas) pathSpecs(p Path) []chartSpec {
	var out []chartSpec
	var phase []int
	for _, i := range p {
		if a.hasPhase(i) {
			phase = append(phase, i)
		}
	}
	if len(phase) > 0 {
		for _, s := range a.splitPhase(phase, false, -1, -1) {
			out = append(out, chartSpec{kind: coord.Phase, devices: s.devs, overlapTop: s.overlapTop,
				below: s.below, above: s.above, path: p})
		}
	}
	segs, absent := a.earthSegments(p)
	for k, seg := range segs {
		for _, s := range chunk(section{devs: seg, below: -1, above: -1}) {
			sp := chartSpec{kind: coord.Residual, devices: s.devs, overlapTop: s.overlapTop, below: -1, above: -1, path: p}
			sp.absent = slices.Clone(absent[k])
			out = append(out, sp)
		}
	}
	for k := 0; k+1 < len(p); k++ {
		pr, ok := a.pairOf(p[k], p[k+1])
		if !ok {
			continue
		}
		if c := a.chartFor(out, pr); c >= 0 {
			out[c].pairs = append(out[c].pairs, pr)
		}
	}
	return out
}

// pairOf returns the backup pair of d under u.
func (a *Atlas) pairOf(d, u int) (coord.Pair, bool) {
	for _, q := range a.in.Result.Pairs {
		if q.Downstream == d && q.Upstream == u {
			return q, true
		}
	}
	return coord.Pair{}, false
}

// marginKind returns the kind of fault chart a pair's margin belongs on:
// that of the current that set the downstream device's time at the worst
// fault (phase when the finding gives none).
func (a *Atlas) marginKind(p coord.Pair) coord.Quantity {
	f := gradingFinding(a.in.Result, a.in.Study, p)
	if f != nil && f.Valid && f.Fault != nil {
		return f.Fault.DeviceQty
	}
	return coord.Phase
}

// chartFor returns the index of the chart among specs that draws pair p's
// margin: of the pair's kind, holding both devices (or, on an earth
// chart, the downstream one); failing that any chart holding the
// downstream device; −1 when none does.
func (a *Atlas) chartFor(specs []chartSpec, p coord.Pair) int {
	kind := a.marginKind(p)
	for k, sp := range specs {
		if sp.kind == kind && slices.Contains(sp.devices, p.Downstream) &&
			(kind == coord.Residual || slices.Contains(sp.devices, p.Upstream)) {
			return k
		}
	}
	for k, sp := range specs {
		if slices.Contains(sp.devices, p.Downstream) {
			return k
		}
	}
	return -1
}

// pairSpec is a failing pair's chart, of the kind of fault that set its
// worst margin.
func (a *Atlas) pairSpec(p coord.Pair) chartSpec {
	kind := a.marginKind(p)
	devs := []int{p.Downstream}
	switch {
	case kind == coord.Phase && a.hasPhase(p.Upstream):
		devs = append(devs, p.Upstream)
	case kind == coord.Residual && a.seesResidual(p.Upstream) && !a.zeroBlocked(p.Upstream, p.Downstream):
		devs = append(devs, p.Upstream)
	}
	pp := p
	return chartSpec{kind: kind, devices: devs, pairs: []coord.Pair{p}, below: -1, above: -1, pair: &pp}
}

// earthSegments returns the parts of a path that zero-sequence current can
// cross: runs of its devices with ground stages that residual current
// reaches, cut where a transformer between two of them stops zero-sequence
// current (a delta winding). absent[k] lists the devices with ground
// stages that no residual current reaches, beside part k.
func (a *Atlas) earthSegments(p Path) (segs [][]int, absent [][]int) {
	var cur, missing []int
	for _, i := range p {
		if !a.hasGround(i) {
			continue
		}
		if !a.seesResidual(i) {
			missing = append(missing, i)
			continue
		}
		if len(cur) > 0 && a.zeroBlocked(i, cur[len(cur)-1]) {
			segs, absent = append(segs, cur), append(absent, missing)
			cur, missing = nil, nil
		}
		cur = append(cur, i)
	}
	if len(cur) > 0 {
		segs, absent = append(segs, cur), append(absent, missing)
	} else if len(segs) > 0 {
		absent[len(absent)-1] = append(absent[len(absent)-1], missing...)
	}
	return segs, absent
}

// section is a run of a path's devices drawn on one chart.
type section struct {
	devs         []int
	overlapTop   bool
	below, above int
}

// splitPhase splits a run of devices whose axis would span more than
// maxDecades at a transformer between two of them, into a part below,
// referred to its own voltage and ending with the first device above the
// transformer (so the pair across it is drawn with both curves), and a
// part above starting with that device. Of the transformers it can split
// at, it takes the one that leaves the narrower widest part, then the one
// that leaves no part of a single device, then the lowest; then it splits
// each part again as needed.
func (a *Atlas) splitPhase(devs []int, overlapTop bool, below, above int) []section {
	whole := section{devs: devs, overlapTop: overlapTop, below: below, above: above}
	if len(devs) < 2 || a.sectionDecades(devs, overlapTop) <= maxDecades {
		return chunk(whole)
	}
	best, bestScore, bestSingles, bestTx := -1, 0, 0, -1
	for m := 1; m < len(devs); m++ {
		tx := a.transformersBetween(devs[m], devs[m-1])
		if len(tx) == 0 {
			continue
		}
		score := max(a.sectionDecades(devs[:m+1], true), a.sectionDecades(devs[m:], overlapTop))
		singles := 0
		if m == len(devs)-1 {
			singles = 1
		}
		if best < 0 || score < bestScore || score == bestScore && singles < bestSingles {
			best, bestScore, bestSingles, bestTx = m, score, singles, tx[len(tx)-1]
		}
	}
	if best < 0 {
		return chunk(whole)
	}
	lower := a.splitPhase(devs[:best+1], true, below, bestTx)
	upper := a.splitPhase(devs[best:], overlapTop, bestTx, above)
	return append(lower, upper...)
}

// maxChartDevices is the most devices one chart draws: fewer than the
// looks there are, leaving room for the upstream devices of its pairs.
const maxChartDevices = styleCount - 2

// chunk cuts a section longer than maxChartDevices into runs that overlap
// by one device, so that no two devices on one chart look alike.
func chunk(s section) []section {
	if len(s.devs) <= maxChartDevices {
		return []section{s}
	}
	var out []section
	for lo := 0; lo < len(s.devs)-1; lo += maxChartDevices - 1 {
		hi := min(lo+maxChartDevices, len(s.devs))
		part := section{devs: s.devs[lo:hi], overlapTop: hi < len(s.devs) || s.overlapTop, below: -1, above: -1}
		if lo == 0 {
			part.below = s.below
		}
		if hi == len(s.devs) {
			part.above = s.above
		}
		out = append(out, part)
		if hi == len(s.devs) {
			break
		}
	}
	return out
}

// sectionDecades returns how many decades the phase-fault axis of a run
// of devices spans, referred to its first device's bus.
func (a *Atlas) sectionDecades(devs []int, overlapTop bool) int {
	lo, hi := a.axisSpan(coord.Phase, devs, overlapTop, a.bus(devs[0]), nil)
	return int(math.Round(math.Log10(hi / lo)))
}

// axisSpan returns the current axis of a chart, in whole decades of
// amperes referred to bus ref: it holds every drawn device's lowest pickup
// of the chart's kind and the fault levels of that kind it sees over its
// zone (but not those of a last device that continues on the next chart),
// and the extra currents given, with some room.
func (a *Atlas) axisSpan(kind coord.Quantity, devs []int, overlapTop bool, ref int, extra []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	see := func(x float64) {
		if x > 0 && !math.IsInf(x, 0) {
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
	}
	for k, i := range devs {
		f := a.refer(i, kind, ref)
		see(a.in.Study.Devices[i].Pickup(kind) * f)
		if overlapTop && k == len(devs)-1 && k > 0 {
			continue
		}
		for _, x := range a.levelsOf(i, kind) {
			see(x.a * f)
		}
	}
	for _, x := range extra {
		see(x)
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

// refer returns the factor that refers device i's currents of quantity q
// to bus ref by the transformers' rated winding ratios.
func (a *Atlas) refer(i int, q coord.Quantity, ref int) float64 {
	return a.in.Topology.ReferA(1, a.busFor(i, q), ref)
}
