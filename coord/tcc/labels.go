package tcc

import (
	"image/color"
	"math"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"tripgrade/coord"
)

// placer puts labels on the data area greedily, most important first, each
// at the first of its candidate places that neither leaves the area nor
// covers a label already placed. A label with no free place goes to its
// first candidate. Every label has a pale backing so a curve under it
// does not make it unreadable.
type placer struct {
	dc    draw.Canvas
	at    func(Point) vg.Point
	c     *Chart
	taken []vg.Rectangle
}

func newPlacer(dc draw.Canvas, at func(Point) vg.Point, c *Chart) *placer {
	return &placer{dc: dc, at: at, c: c}
}

// label is one text to place: its lines, drawn from the top down.
type label struct {
	lines  []string
	styles []draw.TextStyle
}

func (l label) size() (w, h vg.Length) {
	for k, s := range l.lines {
		r := l.styles[k].Rectangle(s)
		w = max(w, r.Size().X)
		h += r.Size().Y
	}
	return w + 2*labelPad, h + 2*labelPad
}

const labelPad = 1.2 // points around a label's text

// box returns the rectangle of a label whose anchor corner is at pt; ax
// and ay (0 or 1) choose the anchor: the left or right edge, the bottom or
// top edge; 0.5 centres.
func (l label) box(pt vg.Point, ax, ay float64) vg.Rectangle {
	w, h := l.size()
	min := vg.Point{X: pt.X - vg.Length(ax)*w, Y: pt.Y - vg.Length(ay)*h}
	return vg.Rectangle{Min: min, Max: vg.Point{X: min.X + w, Y: min.Y + h}}
}

func overlaps(a, b vg.Rectangle) bool {
	return a.Min.X < b.Max.X && b.Min.X < a.Max.X && a.Min.Y < b.Max.Y && b.Min.Y < a.Max.Y
}

func (p *placer) inside(r vg.Rectangle) bool {
	return r.Min.X >= p.dc.Min.X && r.Max.X <= p.dc.Max.X && r.Min.Y >= p.dc.Min.Y && r.Max.Y <= p.dc.Max.Y
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
	return true
}

// place draws l in the first free candidate box (or the first one).
func (p *placer) place(l label, boxes []vg.Rectangle) {
	if len(boxes) == 0 {
		return
	}
	pick, found := boxes[0], false
	for _, b := range boxes {
		if p.inside(b) {
			pick = b // the fallback: inside the area, if overlapping
			break
		}
	}
	for _, b := range boxes {
		if p.free(b) {
			pick, found = b, true
			break
		}
	}
	// Failing that, the candidates moved up or down by half a label's
	// height at a time.
	h := boxes[0].Size().Y / 2
	for k := 1; k <= 12 && !found; k++ {
		for _, b := range boxes {
			for _, sgn := range []vg.Length{1, -1} {
				dy := sgn * vg.Length(k) * h
				m := vg.Rectangle{Min: vg.Point{X: b.Min.X, Y: b.Min.Y + dy}, Max: vg.Point{X: b.Max.X, Y: b.Max.Y + dy}}
				if !found && p.free(m) {
					pick, found = m, true
				}
			}
		}
	}
	p.taken = append(p.taken, pick)
	p.dc.FillPolygon(labelBacking, []vg.Point{pick.Min, {X: pick.Max.X, Y: pick.Min.Y}, pick.Max, {X: pick.Min.X, Y: pick.Max.Y}})
	y := pick.Max.Y - labelPad
	for k, s := range l.lines {
		sty := l.styles[k]
		sty.XAlign, sty.YAlign = draw.XLeft, draw.YTop
		p.dc.FillText(sty, vg.Point{X: pick.Min.X + labelPad, Y: y}, s)
		y -= sty.Rectangle(s).Size().Y
	}
}

// placeAll places the chart's labels: margins first, then device names,
// then fault levels and loads, inrush points and damage curves.
func (p *placer) placeAll() {
	c := p.c
	for _, m := range c.margins {
		if m.drawable {
			p.placeMargin(m)
		}
	}
	for _, i := range c.Devices {
		p.placeName(i)
	}
	for _, l := range c.levels {
		p.placeVertical(l.a, l.label, c.colour(l.device))
	}
	for _, v := range c.loads {
		p.placeVertical(v.a, v.label, passColour)
	}
	for _, m := range c.inrush {
		pt := p.at(Point{m.a, m.timeS})
		l := oneLine(m.label, inkColour, false)
		gap := vg.Points(4)
		p.place(l, []vg.Rectangle{
			l.box(vg.Point{X: pt.X + gap, Y: pt.Y}, 0, 0.5),
			l.box(vg.Point{X: pt.X - gap, Y: pt.Y}, 1, 0.5),
			l.box(vg.Point{X: pt.X, Y: pt.Y + gap}, 0.5, 0),
			l.box(vg.Point{X: pt.X, Y: pt.Y - gap}, 0.5, 1),
		})
	}
	for _, d := range c.damages {
		p.placeAlong(oneLine(d.label, equipmentColour, false), d.runs)
	}
}

func oneLine(s string, col color.Color, bold bool) label {
	return label{lines: []string{s}, styles: []draw.TextStyle{textStyle(textSize, col, bold)}}
}

// placeMargin writes a pair's margin beside its bracket: the figures, and
// which pair it is.
func (p *placer) placeMargin(m margin) {
	c := p.c
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
	clampS := func(t float64) float64 { return math.Min(math.Max(t, floorS), TimeMaxS) }
	d := p.at(Point{m.dA, clampS(m.dS)})
	e := p.at(Point{m.dA, clampS(m.uS)})
	top := e.Y
	if r := m.f.Required; m.f.Unit == "s" && r > 0 {
		top = max(top, p.at(Point{m.dA, clampS(m.dS + r)}).Y)
	}
	// The bracket and the required interval left of it stay uncovered.
	bar := vg.Rectangle{Min: vg.Point{X: d.X - vg.Points(10), Y: min(d.Y, e.Y, top)}, Max: vg.Point{X: d.X + vg.Points(4), Y: max(d.Y, e.Y, top)}}
	p.taken = append(p.taken, bar)
	mid := vg.Point{X: d.X, Y: (d.Y + e.Y) / 2}
	gap := vg.Points(6)
	left := vg.Points(11) // clear of the required interval
	if fail && ringed(d, e) {
		// Clear of the ring drawBracket puts round a failing margin.
		r := ringRadius(d, e)
		gap, left = r+vg.Points(2), r+vg.Points(2)
	}
	_, h := l.size()
	var boxes []vg.Rectangle
	for k := 0; k <= 6; k++ {
		dy := vg.Length(k) * h / 2
		for _, sgn := range []vg.Length{1, -1} {
			boxes = append(boxes,
				l.box(vg.Point{X: mid.X + gap, Y: mid.Y + sgn*dy}, 0, 0.5),
				l.box(vg.Point{X: mid.X - left, Y: mid.Y + sgn*dy}, 1, 0.5))
			if k == 0 {
				break
			}
		}
	}
	p.place(l, boxes)
}

// placeName writes a device's name beside its main curve, trying points of
// the curve from long times to short.
func (p *placer) placeName(i int) {
	c := p.c
	var main *Trace
	for k := range c.traces {
		t := &c.traces[k]
		if t.Device == i && (main == nil || t.Kind == PhaseCurve || t.Kind == ClearCurve && main.Kind == MeltCurve) {
			main = t
		}
	}
	if main == nil {
		return
	}
	l := oneLine(c.atlas.in.Study.Devices[i].Name, c.colour(i), true)
	gap := vg.Points(2.5)
	var boxes []vg.Rectangle
	for _, ts := range []float64{300, 100, 30, 10, 3, 1, 0.3, 0.1, 0.03} {
		a, ok := main.currentFor(ts)
		if !ok {
			continue
		}
		pt := p.at(Point{a, ts})
		boxes = append(boxes, l.box(vg.Point{X: pt.X + gap, Y: pt.Y + gap}, 0, 0),
			l.box(vg.Point{X: pt.X - gap, Y: pt.Y - gap}, 1, 1))
	}
	p.place(l, boxes)
}

// placeVertical writes the label of a vertical line in the first free
// lane from the top of the plot, to the right of the line or else to its
// left.
func (p *placer) placeVertical(a float64, text string, col color.Color) {
	l := oneLine(text, col, false)
	x := p.at(Point{a, 1}).X
	_, h := l.size()
	gap := vg.Points(1.5)
	var boxes []vg.Rectangle
	for lane := 0; lane < 40; lane++ {
		y := p.dc.Max.Y - vg.Points(1) - vg.Length(lane)*(h+vg.Points(0.5))
		boxes = append(boxes, l.box(vg.Point{X: x + gap, Y: y}, 0, 1), l.box(vg.Point{X: x - gap, Y: y}, 1, 1))
	}
	p.place(l, boxes)
}

// placeAlong writes a label beside a curve, trying points from its start.
func (p *placer) placeAlong(l label, runs [][]Point) {
	var boxes []vg.Rectangle
	gap := vg.Points(3)
	for _, run := range runs {
		for k := 0; k < len(run); k += max(1, len(run)/12) {
			pt := p.at(run[k])
			if p.dc.Contains(pt) {
				boxes = append(boxes, l.box(vg.Point{X: pt.X + gap, Y: pt.Y + gap}, 0, 0),
					l.box(vg.Point{X: pt.X - gap, Y: pt.Y - gap}, 1, 1))
			}
		}
	}
	p.place(l, boxes)
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
