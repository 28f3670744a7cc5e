package tcc

import (
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"tripgrade/coord"
)

// layout is where the labels of a chart's data area go: each placed label
// with its box, the marks no label may cover, and the texts that found no
// free place (the key lists them instead). A label is never drawn over
// another, over a mark, or across the edge of the data area.
type layout struct {
	area      vg.Rectangle
	placed    []placedLabel
	obstacles []vg.Rectangle
	dropped   []string
}

// placedLabel is a label in its box, with a leader line to what it names
// when it had to sit away from it.
type placedLabel struct {
	label
	box    vg.Rectangle
	leader *[2]vg.Point
}

// label is one text to place: its lines, drawn from the top down.
type label struct {
	lines  []string
	styles []draw.TextStyle
}

func (l label) size() (w, h vg.Length) {
	for k, s := range l.lines {
		lw, lh := measure(l.styles[k], s)
		w = max(w, lw)
		h += lh
	}
	return w + 2*labelPad, h + 2*labelPad
}

const labelPad = 1.2 // points around a label's text

// box returns the rectangle of a label whose anchor is at pt; ax and ay
// (0 or 1) choose the anchor: the left or right edge, the bottom or top
// edge; 0.5 centres.
func (l label) box(pt vg.Point, ax, ay float64) vg.Rectangle {
	w, h := l.size()
	lo := vg.Point{X: pt.X - vg.Length(ax)*w, Y: pt.Y - vg.Length(ay)*h}
	return vg.Rectangle{Min: lo, Max: vg.Point{X: lo.X + w, Y: lo.Y + h}}
}

func oneLine(s string, col color.Color, bold bool) label {
	return label{lines: []string{s}, styles: []draw.TextStyle{textStyle(textSize, col, bold)}}
}

func overlaps(a, b vg.Rectangle) bool {
	return a.Min.X < b.Max.X && b.Min.X < a.Max.X && a.Min.Y < b.Max.Y && b.Min.Y < a.Max.Y
}

func shifted(r vg.Rectangle, dx, dy vg.Length) vg.Rectangle {
	return vg.Rectangle{Min: vg.Point{X: r.Min.X + dx, Y: r.Min.Y + dy}, Max: vg.Point{X: r.Max.X + dx, Y: r.Max.Y + dy}}
}

// around returns a square of half-side r about pt.
func around(pt vg.Point, r vg.Length) vg.Rectangle {
	return vg.Rectangle{Min: vg.Point{X: pt.X - r, Y: pt.Y - r}, Max: vg.Point{X: pt.X + r, Y: pt.Y + r}}
}

// placer puts labels greedily, most important first, each in the first of
// its candidate boxes that lies inside the area and covers neither a
// label already placed nor a mark.
type placer struct {
	lay   *layout
	taken []vg.Rectangle
	occ   *occupancy
}

func (p *placer) inside(r vg.Rectangle) bool {
	a := p.lay.area
	return r.Min.X >= a.Min.X && r.Max.X <= a.Max.X && r.Min.Y >= a.Min.Y && r.Max.Y <= a.Max.Y
}

func (p *placer) free(r vg.Rectangle) bool {
	if !p.inside(r) {
		return false
	}
	for _, t := range p.taken {
		if overlaps(r, t) {
			return false
		}
	}
	for _, t := range p.lay.obstacles {
		if overlaps(r, t) {
			return false
		}
	}
	return true
}

// placeOpts say how a label prefers its place: it should hide no curve
// of another owner than owner (anyOwner: of any owner), preferably within
// within of near when near is given; with leader, a label placed further
// than leaderAfter from near gets a line to it.
type placeOpts struct {
	owner  int
	near   *vg.Point
	within vg.Length
	leader bool
}

// place puts l in a free candidate box and reports whether it found one;
// a label without a free box is listed as dropped. It takes the first
// free box that hides no curve (see placeOpts) near enough, failing that
// the first free box.
func (p *placer) place(l label, boxes []vg.Rectangle, o placeOpts) bool {
	pick := -1
	for k, b := range boxes {
		if o.near != nil && o.within > 0 && dist(nearestOn(b, *o.near), *o.near) > o.within {
			continue
		}
		if p.free(b) && p.occ.count(b, o.owner) == 0 {
			pick = k
			break
		}
	}
	for k := 0; pick < 0 && k < len(boxes); k++ {
		if p.free(boxes[k]) {
			pick = k
		}
	}
	if pick < 0 {
		p.lay.dropped = append(p.lay.dropped, strings.Join(l.lines, " "))
		return false
	}
	b := boxes[pick]
	p.taken = append(p.taken, b)
	pl := placedLabel{label: l, box: b}
	if o.leader && o.near != nil {
		if q := nearestOn(b, *o.near); dist(q, *o.near) > leaderAfter {
			pl.leader = &[2]vg.Point{q, *o.near}
		}
	}
	p.lay.placed = append(p.lay.placed, pl)
	return true
}

// anyOwner counts the curves of every owner as hidden.
const anyOwner = -2

// leaderAfter is how far a label may sit from what it names before a line
// joins them.
const leaderAfter = vg.Length(14)

func nearestOn(r vg.Rectangle, pt vg.Point) vg.Point {
	return vg.Point{X: min(max(pt.X, r.Min.X), r.Max.X), Y: min(max(pt.Y, r.Min.Y), r.Max.Y)}
}

func dist(a, b vg.Point) vg.Length {
	return vg.Length(math.Hypot(float64(a.X-b.X), float64(a.Y-b.Y)))
}

// layoutLabels places the chart's labels in the data area dc whose
// transform is at: margins first (failing ones first of all), then the
// curves drawn as seen at a worst fault, device names, loads, fault levels,
// inrush points and damage curves.
func (c *Chart) layoutLabels(area vg.Rectangle, at func(Point) vg.Point) *layout {
	lay := &layout{area: area, obstacles: c.marks(at)}
	p := &placer{lay: lay, occ: c.curveCells(area, at)}
	for _, fail := range []bool{true, false} {
		for _, m := range c.margins {
			if m.drawable && (m.f.Verdict == coord.Fail) == fail {
				p.placeMargin(c, m, at)
			}
		}
	}
	for _, s := range c.seen {
		p.placeSeen(c, s, at)
	}
	for _, i := range c.Devices {
		p.placeName(c, i, at)
	}
	for _, v := range c.loads {
		p.placeVertical(at(Point{v.a, 1}).X, oneLine(v.label, passColour, false))
	}
	for _, l := range c.levels {
		if l.label != "" {
			col := c.looks[l.device].colour()
			if strings.Contains(l.label, ",") {
				col = inkColour
			}
			p.placeVertical(at(Point{l.a, 1}).X, oneLine(l.label, col, false))
		}
	}
	for _, m := range c.inrush {
		pt := at(Point{m.a, m.timeS})
		l := oneLine(m.label, inkColour, false)
		var boxes []vg.Rectangle
		for _, gap := range []vg.Length{5, 12, 24, 40} {
			boxes = append(boxes,
				l.box(vg.Point{X: pt.X + gap, Y: pt.Y}, 0, 0.5),
				l.box(vg.Point{X: pt.X - gap, Y: pt.Y}, 1, 0.5),
				l.box(vg.Point{X: pt.X, Y: pt.Y + gap}, 0.5, 0),
				l.box(vg.Point{X: pt.X, Y: pt.Y - gap}, 0.5, 1),
				l.box(vg.Point{X: pt.X + gap, Y: pt.Y + gap}, 0, 0),
				l.box(vg.Point{X: pt.X - gap, Y: pt.Y - gap}, 1, 1),
				l.box(vg.Point{X: pt.X + gap, Y: pt.Y - gap}, 0, 1),
				l.box(vg.Point{X: pt.X - gap, Y: pt.Y + gap}, 1, 0))
		}
		p.place(l, boxes, placeOpts{owner: anyOwner, near: &pt, leader: true})
	}
	for _, d := range c.damages {
		p.placeAlong(oneLine(d.label, equipmentColour, false), d.runs, at, damageOwner)
	}
	return lay
}

// damageOwner owns the damage curves in the occupancy grid.
const damageOwner = -1

// curveCells records where the chart's curves run.
func (c *Chart) curveCells(area vg.Rectangle, at func(Point) vg.Point) *occupancy {
	o := newOccupancy(area)
	for _, t := range c.traces {
		for _, run := range t.Runs {
			o.add(t.Device, project(run, at))
		}
	}
	for _, s := range c.seen {
		for _, run := range s.trace.Runs {
			o.add(s.trace.Device, project(run, at))
		}
	}
	for _, d := range c.damages {
		for _, run := range d.runs {
			o.add(damageOwner, project(run, at))
		}
	}
	o.seal()
	return o
}

// marks returns the boxes of the marks no label may cover: every margin's
// bracket, required interval and dots, the ring round a failing margin,
// inrush crosses and the rings where a curve meets its fault level.
func (c *Chart) marks(at func(Point) vg.Point) []vg.Rectangle {
	var out []vg.Rectangle
	for _, m := range c.margins {
		if !m.drawable {
			continue
		}
		g := c.bracketGeometry(m, at)
		out = append(out, g.bar, around(g.u, vg.Points(dotRadius+1.5)))
		if g.ringR > 0 {
			out = append(out, around(g.mid, g.ringR+vg.Points(1)))
		}
	}
	for _, m := range c.inrush {
		out = append(out, around(at(Point{m.a, m.timeS}), vg.Points(4)))
	}
	for _, l := range c.levels {
		if !math.IsNaN(l.timeS) {
			out = append(out, around(at(Point{l.a, l.timeS}), vg.Points(dotRadius+0.5)))
		}
	}
	return out
}

// drawLabels draws placed labels on their pale backing, so a curve under
// one does not make it unreadable, with their leader lines.
func drawLabels(dc draw.Canvas, lay *layout) {
	for _, pl := range lay.placed {
		if pl.leader != nil {
			dc.StrokeLine2(draw.LineStyle{Color: passColour, Width: vg.Points(0.5)},
				pl.leader[0].X, pl.leader[0].Y, pl.leader[1].X, pl.leader[1].Y)
		}
	}
	for _, pl := range lay.placed {
		b := pl.box
		dc.FillPolygon(labelBacking, []vg.Point{b.Min, {X: b.Max.X, Y: b.Min.Y}, b.Max, {X: b.Min.X, Y: b.Max.Y}})
		y := b.Max.Y - labelPad
		for k, s := range pl.lines {
			r := putText(dc, pl.styles[k], vg.Point{X: b.Min.X + labelPad, Y: y}, 0, 1, s)
			y = r.Min.Y
		}
	}
}
