package tcc

import (
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"tripgrade/coord"
)

// layers draws everything inside the plot's data area, in a fixed order:
// grid, shaded bands, damage curves, load and fault-level lines, device
// curves, the curves seen at a worst fault, marks, margins and last the
// labels, placed beforehand (layoutLabels) so that none covers another.
type layers struct {
	c   *Chart
	lay *layout
}

var _ plot.Plotter = layers{}

// Plot draws the chart's data.
func (l layers) Plot(dc draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&dc)
	at := func(pt Point) vg.Point { return vg.Point{X: trX(pt.CurrentA), Y: trY(pt.TimeS)} }
	c := l.c
	drawGrid(dc, p)
	for _, b := range c.bands {
		fillBand(dc, at, b, c.colour(b.device))
	}
	for _, d := range c.damages {
		for _, run := range d.runs {
			for _, piece := range dc.ClipLinesXY(project(run, at)) {
				hatched(dc, piece)
			}
		}
	}
	for _, v := range c.loads {
		x := trX(v.a)
		dc.StrokeLine2(draw.LineStyle{Color: passColour, Width: vg.Points(markWidth), Dashes: loadDashes},
			x, dc.Min.Y, x, dc.Max.Y)
	}
	for _, lv := range c.levels {
		x := trX(lv.a)
		sty := draw.LineStyle{Color: withAlpha(c.colour(lv.device), levelLineAlpha), Width: vg.Points(markWidth)}
		if !lv.max {
			sty.Dashes = minDashes
		}
		dc.StrokeLine2(sty, x, dc.Min.Y, x, dc.Max.Y)
	}
	for _, t := range c.traces {
		sty := draw.LineStyle{Color: c.colour(t.Device), Width: vg.Points(curveWidth), Dashes: c.looks[t.Device].dashes()}
		if t.Kind == MeltCurve {
			sty.Width = vg.Points(meltWidth)
		}
		for _, run := range t.Runs {
			dc.StrokeLines(sty, dc.ClipLinesXY(project(run, at))...)
		}
	}
	for _, s := range c.seen {
		sty := draw.LineStyle{Color: c.colour(s.trace.Device), Width: vg.Points(seenWidth), Dashes: c.looks[s.trace.Device].dashes()}
		for _, run := range s.trace.Runs {
			dc.StrokeLines(sty, dc.ClipLinesXY(project(run, at))...)
		}
	}
	for _, lv := range c.levels {
		if !math.IsNaN(lv.timeS) {
			dc.DrawGlyph(draw.GlyphStyle{Color: c.colour(lv.device), Radius: vg.Points(dotRadius), Shape: draw.RingGlyph{}},
				at(Point{lv.a, lv.timeS}))
		}
	}
	for _, m := range c.inrush {
		dc.DrawGlyph(draw.GlyphStyle{Color: inkColour, Radius: vg.Points(3.2), Shape: draw.CrossGlyph{}},
			at(Point{m.a, m.timeS}))
	}
	for _, m := range c.margins {
		if m.drawable {
			c.drawBracket(dc, at, m)
		}
	}
	drawLabels(dc, l.lay)
}

// colour returns the colour of device i.
func (c *Chart) colour(i int) color.NRGBA { return c.looks[i].colour() }

// project maps a run of chart points to the canvas.
func project(run []Point, at func(Point) vg.Point) []vg.Point {
	out := make([]vg.Point, len(run))
	for k, p := range run {
		out[k] = at(p)
	}
	return out
}

// drawGrid draws a light line at every tick, darker at the decades.
func drawGrid(dc draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&dc)
	for _, major := range []bool{false, true} {
		sty := draw.LineStyle{Color: gridMinor, Width: vg.Points(0.4)}
		if major {
			sty = draw.LineStyle{Color: gridMajor, Width: vg.Points(0.6)}
		}
		for _, t := range p.X.Tick.Marker.Ticks(p.X.Min, p.X.Max) {
			if t.IsMinor() != major && t.Value >= p.X.Min && t.Value <= p.X.Max {
				x := trX(t.Value)
				dc.StrokeLine2(sty, x, dc.Min.Y, x, dc.Max.Y)
			}
		}
		for _, t := range p.Y.Tick.Marker.Ticks(p.Y.Min, p.Y.Max) {
			if t.IsMinor() != major && t.Value >= p.Y.Min && t.Value <= p.Y.Max {
				y := trY(t.Value)
				dc.StrokeLine2(sty, dc.Min.X, y, dc.Max.X, y)
			}
		}
	}
}

// fillBand shades the region between a band's two curves, run by run.
func fillBand(dc draw.Canvas, at func(Point) vg.Point, b band, col color.NRGBA) {
	alpha := uint8(bandAlpha)
	if b.fuse {
		alpha = fuseBandAlpha
	}
	for _, lo := range b.lower {
		for _, hi := range b.upper {
			x0 := math.Max(lo[0].CurrentA, hi[0].CurrentA)
			x1 := math.Min(lo[len(lo)-1].CurrentA, hi[len(hi)-1].CurrentA)
			if !(x1 > x0) {
				continue
			}
			var poly []vg.Point
			for _, p := range lo {
				if p.CurrentA >= x0 && p.CurrentA <= x1 {
					poly = append(poly, at(p))
				}
			}
			for k := len(hi) - 1; k >= 0; k-- {
				if p := hi[k]; p.CurrentA >= x0 && p.CurrentA <= x1 {
					poly = append(poly, at(p))
				}
			}
			if len(poly) > 2 {
				dc.FillPolygon(withAlpha(col, alpha), dc.ClipPolygonXY(poly))
			}
		}
	}
}

// hatched strokes a damage curve with short ticks on its damage side
// (towards higher current and longer time): the side a protective device's
// curve must stay clear of.
func hatched(dc draw.Canvas, pts []vg.Point) {
	sty := draw.LineStyle{Color: equipmentColour, Width: vg.Points(damageWidth)}
	dc.StrokeLines(sty, pts)
	tick := draw.LineStyle{Color: equipmentColour, Width: vg.Points(0.6)}
	const every, length = 5.0, 3.5 // points
	carry := 0.0
	for k := 0; k+1 < len(pts); k++ {
		a, b := pts[k], pts[k+1]
		dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
		seg := math.Hypot(dx, dy)
		if seg == 0 {
			continue
		}
		nx, ny := -dy/seg, dx/seg
		for s := every - carry; s < seg; s += every {
			p := vg.Point{X: a.X + vg.Length(dx*s/seg), Y: a.Y + vg.Length(dy*s/seg)}
			q := vg.Point{X: p.X + vg.Length(nx*length), Y: p.Y + vg.Length(ny*length)}
			if dc.Contains(p) && dc.Contains(q) {
				dc.StrokeLine2(tick, p.X, p.Y, q.X, q.Y)
			}
		}
		carry = math.Mod(carry+seg, every)
	}
}

// bracket is where a pair's margin is drawn: the downstream device's
// operating point d, the bracket's upper end e at the upstream device's
// time, the upstream device's own operating point u, the bracket's middle,
// the box of the bracket with the required interval beside it, and the
// radius of the ring round a failing one (0: none).
type bracket struct {
	d, e, u, mid vg.Point
	req          vg.Length // top of the required interval, when drawn
	hasReq       bool
	bar          vg.Rectangle
	ringR        vg.Length
}

// bracketGeometry lays out a margin's bracket.
func (c *Chart) bracketGeometry(m margin, at func(Point) vg.Point) bracket {
	clampS := func(s float64) float64 { return math.Min(math.Max(s, floorS), TimeMaxS) }
	g := bracket{
		d: at(Point{m.dA, clampS(m.dS)}),
		e: at(Point{m.dA, clampS(m.uS)}),
		u: at(Point{m.uA, clampS(m.uS)}),
	}
	g.mid = vg.Point{X: g.d.X, Y: (g.d.Y + g.e.Y) / 2}
	lo, hi := min(g.d.Y, g.e.Y), max(g.d.Y, g.e.Y)
	if r := m.f.Required; m.f.Unit == "s" && r > 0 {
		g.req, g.hasReq = at(Point{m.dA, clampS(m.dS + r)}).Y, true
		lo, hi = min(lo, g.req), max(hi, g.req)
	}
	g.bar = vg.Rectangle{Min: vg.Point{X: g.d.X - vg.Points(10), Y: lo - vg.Points(dotRadius+1)},
		Max: vg.Point{X: g.d.X + vg.Points(5), Y: hi + vg.Points(dotRadius+1)}}
	if span := max(g.d.Y, g.e.Y) - min(g.d.Y, g.e.Y); m.f.Verdict == coord.Fail && span < vg.Points(30) {
		g.ringR = vg.Points(11) + span/2
	}
	return g
}

// drawBracket draws a pair's margin at its worst fault: a vertical bracket
// at the downstream device's current between the two devices' times, with
// a dot on each device's own operating point, and beside it, dashed, the
// interval the criteria require. When the upstream device sees another
// current (a share of the fault through parallel incomers, or the current
// on the other side of a transformer), a dotted link joins its own
// operating point to the bracket's end; the curve drawn as seen at that
// fault (seenCurves) passes through the end itself. A short failing
// bracket is ringed, so it is found at a glance.
func (c *Chart) drawBracket(dc draw.Canvas, at func(Point) vg.Point, m margin) {
	g := c.bracketGeometry(m, at)
	fail := m.f.Verdict == coord.Fail
	col, w := passColour, bracketWidth
	if fail {
		col, w = failColour, failBracketW
	}
	sty := draw.LineStyle{Color: col, Width: vg.Points(w)}
	if fail {
		halo := draw.LineStyle{Color: withAlpha(failColour, 0x40), Width: vg.Points(w + 5)}
		dc.StrokeLine2(halo, g.d.X, g.d.Y, g.e.X, g.e.Y)
	}
	dc.StrokeLine2(sty, g.d.X, g.d.Y, g.e.X, g.e.Y)
	capW := vg.Points(4)
	for _, y := range []vg.Length{g.d.Y, g.e.Y} {
		dc.StrokeLine2(sty, g.d.X-capW, y, g.d.X+capW, y)
	}
	if math.Abs(math.Log(m.uA/m.dA)) > 0.01 {
		dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(0.8), Dashes: linkDashes}, g.u.X, g.u.Y, g.e.X, g.e.Y)
	}
	if g.hasReq {
		x := g.d.X - vg.Points(7)
		req := draw.LineStyle{Color: col, Width: vg.Points(0.9), Dashes: linkDashes}
		dc.StrokeLine2(req, x, g.d.Y, x, g.req)
		dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(0.9)}, x-vg.Points(2.5), g.req, x+vg.Points(2.5), g.req)
	}
	if g.ringR > 0 {
		var ring vg.Path
		ring.Move(vg.Point{X: g.mid.X + g.ringR, Y: g.mid.Y})
		ring.Arc(g.mid, g.ringR, 0, 2*math.Pi)
		ring.Close()
		dc.SetLineStyle(draw.LineStyle{Color: failColour, Width: vg.Points(1.4)})
		dc.Stroke(ring)
	}
	dc.DrawGlyph(draw.GlyphStyle{Color: c.colour(m.pair.Downstream), Radius: vg.Points(dotRadius + 0.8), Shape: draw.CircleGlyph{}}, g.d)
	dc.DrawGlyph(draw.GlyphStyle{Color: c.colour(m.pair.Upstream), Radius: vg.Points(dotRadius + 0.8), Shape: draw.CircleGlyph{}}, g.u)
}
