package tcc

import (
	"cmp"
	"math"
	"slices"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"tripgrade/coord"
)

// The candidate places of each kind of label, nearest first, for placer.

// placeMargin writes a pair's margin beside its bracket: the figures, and
// which pair it is; further out, with a leader line, when the bracket's
// surroundings are taken.
func (p *placer) placeMargin(c *Chart, m margin, at func(Point) vg.Point) {
	fail := m.f.Verdict == coord.Fail
	col := passColour
	if fail {
		col = failColour
	}
	s := c.atlas.in.Study
	pair := s.Devices[m.pair.Upstream].Name + " over " + s.Devices[m.pair.Downstream].Name
	head := marginText(m.f)
	if fail {
		head = "FAIL " + head
	}
	l := label{lines: []string{head, pair},
		styles: []draw.TextStyle{textStyle(textSize+1, col, true), textStyle(textSize, col, false)}}
	g := c.bracketGeometry(m, at)
	gap, left := vg.Points(6), vg.Points(2)
	if g.ringR > 0 {
		gap, left = g.ringR+vg.Points(3), g.ringR+vg.Points(3)
	}
	w, h := l.size()
	var boxes []vg.Rectangle
	for i := 0; i <= 24; i++ {
		dx := vg.Length(i) * w / 6
		for j := -12; j <= 12; j++ {
			dy := vg.Length(j) * h / 2
			boxes = append(boxes,
				l.box(vg.Point{X: g.mid.X + gap + dx, Y: g.mid.Y + dy}, 0, 0.5),
				l.box(vg.Point{X: g.bar.Min.X - left - dx, Y: g.mid.Y + dy}, 1, 0.5))
		}
	}
	// Nearest first; among equals, the order above (right before left,
	// nearer the bracket's height first).
	slices.SortStableFunc(boxes, func(a, b vg.Rectangle) int {
		return cmp.Compare(dist(nearestOn(a, g.mid), g.mid), dist(nearestOn(b, g.mid), g.mid))
	})
	mid := g.mid
	p.place(l, boxes, placeOpts{owner: anyOwner, near: &mid, within: 1.2 * h, leader: true})
}

// placeSeen writes the label of a curve drawn as seen at a pair's worst
// fault beside the curve, as near the pair's bracket as it finds room.
func (p *placer) placeSeen(c *Chart, s seenCurve, at func(Point) vg.Point) {
	l := oneLine(s.label, c.looks[s.trace.Device].colour(), false)
	var top vg.Point
	for _, m := range c.margins {
		if m.pair == s.pair {
			top = c.bracketGeometry(m, at).e
		}
	}
	gap := vg.Points(3)
	var boxes []vg.Rectangle
	for _, run := range s.trace.Runs {
		for _, pt := range run {
			q := at(pt)
			boxes = append(boxes, l.box(vg.Point{X: q.X + gap, Y: q.Y + gap}, 0, 0),
				l.box(vg.Point{X: q.X - gap, Y: q.Y - gap}, 1, 1))
		}
	}
	slices.SortStableFunc(boxes, func(a, b vg.Rectangle) int {
		return cmp.Compare(dist(nearestOn(a, top), top), dist(nearestOn(b, top), top))
	})
	p.place(l, boxes, placeOpts{owner: s.trace.Device, near: &top, within: 45})
}

// placeName writes a device's name beside its curve, trying points of the
// curve from long times to short.
func (p *placer) placeName(c *Chart, i int, at func(Point) vg.Point) {
	var main *Trace
	for k := range c.traces {
		t := &c.traces[k]
		if t.Device == i && (main == nil || t.Kind == ClearCurve) {
			main = t
		}
	}
	if main == nil {
		return
	}
	l := oneLine(c.atlas.in.Study.Devices[i].Name, c.looks[i].colour(), true)
	gap := vg.Points(2.5)
	var boxes []vg.Rectangle
	for _, ts := range []float64{300, 100, 30, 10, 3, 1, 0.3, 0.1, 0.03} {
		a, ok := main.currentFor(ts)
		if !ok {
			continue
		}
		pt := at(Point{a, ts})
		boxes = append(boxes, l.box(vg.Point{X: pt.X + gap, Y: pt.Y + gap}, 0, 0),
			l.box(vg.Point{X: pt.X - gap, Y: pt.Y - gap}, 1, 1),
			l.box(vg.Point{X: pt.X + gap, Y: pt.Y - gap}, 0, 1),
			l.box(vg.Point{X: pt.X - gap, Y: pt.Y + gap}, 1, 0))
	}
	p.place(l, boxes, placeOpts{owner: i})
}

// verticalLanes is how many rows below the top of the plot the labels of
// vertical lines may take: past them a label would sit among the curves.
const verticalLanes = 7

// placeVertical writes the label of a vertical line at x in the first free
// lane from the top of the plot, to the right of the line or else to its
// left.
func (p *placer) placeVertical(x vg.Length, l label) {
	_, h := l.size()
	gap := vg.Points(1.5)
	var boxes []vg.Rectangle
	for lane := 0; lane < verticalLanes; lane++ {
		y := p.lay.area.Max.Y - vg.Points(1) - vg.Length(lane)*(h+vg.Points(0.5))
		boxes = append(boxes, l.box(vg.Point{X: x + gap, Y: y}, 0, 1), l.box(vg.Point{X: x - gap, Y: y}, 1, 1))
	}
	p.place(l, boxes, placeOpts{owner: anyOwner})
}

// placeAlong writes a label beside a curve of owner, trying points along
// it.
func (p *placer) placeAlong(l label, runs [][]Point, at func(Point) vg.Point, owner int) {
	var boxes []vg.Rectangle
	gap := vg.Points(3)
	for _, run := range runs {
		for k := 0; k < len(run); k += max(1, len(run)/16) {
			pt := at(run[k])
			boxes = append(boxes, l.box(vg.Point{X: pt.X + gap, Y: pt.Y + gap}, 0, 0),
				l.box(vg.Point{X: pt.X - gap, Y: pt.Y - gap}, 1, 1))
		}
	}
	p.place(l, boxes, placeOpts{owner: owner})
}

// currentFor returns the lowest current at which the trace reaches timeS.
func (t Trace) currentFor(timeS float64) (float64, bool) {
	for _, run := range t.Runs {
		for k := 0; k+1 < len(run); k++ {
			a, b := run[k], run[k+1]
			if a.TimeS >= timeS && b.TimeS <= timeS && a.TimeS > b.TimeS {
				u := math.Log(a.TimeS/timeS) / math.Log(a.TimeS/b.TimeS)
				return math.Exp(math.Log(a.CurrentA) + u*math.Log(b.CurrentA/a.CurrentA)), true
			}
		}
	}
	return 0, false
}
