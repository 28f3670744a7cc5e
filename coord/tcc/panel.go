package tcc

import (
	"fmt"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"tripgrade/coord"
	"tripgrade/curves"
)

// drawHeader writes the study name and the chart's kind, the path or
// pair under it, and on the right how many of the chart's pairs fail their
// grading margin. A title too long for the line beside the verdict is set
// smaller, and cut short with "…" only if it still does not fit.
func (c *Chart) drawHeader(h draw.Canvas) {
	width := h.Max.X - h.Min.X
	n, fail := 0, c.Failing()
	for _, m := range c.margins {
		if m.f != nil {
			n++
		}
	}
	var verdictW vg.Length
	if n > 0 {
		verdict, col := fmt.Sprintf("grading: all %d pairs pass", n), passColour
		switch {
		case n == 1 && fail == 1:
			verdict, col = "grading: the pair FAILS", failColour
		case n == 1:
			verdict = "grading: the pair passes"
		case fail > 0:
			verdict, col = fmt.Sprintf("grading: %d of %d pairs FAIL", fail, n), failColour
		}
		v := textStyle(titleTextSize-1, col, true)
		verdictW = v.Width(verdict) + vg.Points(12)
		putText(h, v, vg.Point{X: h.Max.X, Y: h.Max.Y}, 1, 1, verdict)
	}
	title := textStyle(titleTextSize, inkColour, true)
	putText(h, title, vg.Point{X: h.Min.X, Y: h.Max.Y}, 0, 1,
		fitText(c.atlas.in.Study.Name+" · "+chartTitle(c.Kind), &title, width-verdictW, 9))
	sub := textStyle(subtitleSize, inkColour, false)
	putText(h, sub, vg.Point{X: h.Min.X, Y: h.Min.Y + 4}, 0, 0, fitText(c.Subtitle, &sub, width, 6.5))
}

// fitText returns text as it fits in width: in sty's size, else in a
// smaller one down to minSize points (sty is set to it), else cut short
// with "…".
func fitText(text string, sty *draw.TextStyle, width vg.Length, minSize vg.Length) string {
	for sty.Width(text) > width && sty.Font.Size > minSize {
		sty.Font.Size -= 0.5
	}
	if sty.Width(text) <= width {
		return text
	}
	r := []rune(text)
	for len(r) > 1 && sty.Width(string(r)+"…") > width {
		r = r[:len(r)-1]
	}
	return string(r) + "…"
}

// drawFooter writes the caution every report carries.
func drawFooter(f draw.Canvas) {
	sty := textStyle(footerSize, passColour, false)
	putText(f, sty, vg.Point{X: f.Min.X, Y: f.Min.Y}, 0, 0, fitText(caution, &sty, f.Max.X-f.Min.X, 5))
}

// caution is the warning every report of tripgrade carries (coord/report
// prints the same words).
const caution = "Caution: these results support, and never replace, review by a qualified protection engineer under local codes and licensed practice. Wrong settings can fail to clear faults."

// row is one line of the key panel.
type row struct {
	text   string
	sty    draw.TextStyle
	indent vg.Length
	swatch func(dc draw.Canvas, x0, x1, y vg.Length)
	gap    vg.Length // extra space above
}

// drawPanel draws the key beside the plot: every device with its
// settings, every pair's margin at its worst fault, what the marks mean
// and the labels that found no room on the plot. The text shrinks until
// the key fits; a key that still does not fit ends with "…".
func (c *Chart) drawPanel(dc draw.Canvas, lay *layout) {
	avail := dc.Max.Y - dc.Min.Y
	var rows []row
	for _, scale := range []float64{1, 0.93, 0.86, 0.8, 0.74, 0.68, 0.62, 0.56} {
		rows = c.panelRows(vg.Length(scale), dc.Max.X-dc.Min.X, lay)
		if panelHeight(rows) <= avail {
			break
		}
	}
	y := dc.Max.Y
	for k, r := range rows {
		h := rowHeight(r.sty)
		if y-r.gap-h < dc.Min.Y || k < len(rows)-1 && y-r.gap-2*h < dc.Min.Y {
			putText(dc, r.sty, vg.Point{X: dc.Min.X, Y: y - r.gap}, 0, 1, "… (the findings table has every figure)")
			return
		}
		y -= r.gap
		putText(dc, r.sty, vg.Point{X: dc.Min.X + r.indent, Y: y}, 0, 1, r.text)
		if r.swatch != nil {
			r.swatch(dc, dc.Min.X, dc.Min.X+r.indent-vg.Points(3), y-h/2)
		}
		y -= h
	}
}

// rowHeight is the height of a line of the key: the font's ascent and
// descent and a little leading.
func rowHeight(sty draw.TextStyle) vg.Length {
	_, h := measure(sty, "")
	return h + sty.Font.Size*0.08
}

func panelHeight(rows []row) vg.Length {
	var h vg.Length
	for _, r := range rows {
		h += r.gap + rowHeight(r.sty)
	}
	return h
}

// panelRows lays out the key at a text scale, wrapping to width.
func (c *Chart) panelRows(scale, width vg.Length, lay *layout) []row {
	size := panelTextSize * scale
	head := textStyle(size+1, inkColour, true)
	plain := textStyle(size, inkColour, false)
	swatchW := vg.Points(22)
	var rows []row
	add := func(text string, sty draw.TextStyle, indent, gap vg.Length, sw func(draw.Canvas, vg.Length, vg.Length, vg.Length)) {
		for k, line := range wrap(text, sty, width-indent) {
			r := row{text: line, sty: sty, indent: indent}
			if k == 0 {
				r.gap, r.swatch = gap, sw
			}
			rows = append(rows, r)
		}
	}
	s := c.atlas.in.Study
	add("Devices (operating times, breaker not included)", head, 0, 0, nil)
	for _, i := range c.Devices {
		d := &s.Devices[i]
		name := textStyle(size, c.colour(i), true)
		kind := "relay"
		if d.Kind == coord.Fuse {
			kind = fmt.Sprintf("fuse %g A", d.RatingA)
		}
		add(fmt.Sprintf("%s  %s at %g kV", d.Name, kind, c.atlas.kvOf(i, coord.Phase)), name, swatchW, 3*scale, c.deviceSwatch(i))
		for _, line := range settingsLines(d, c.Kind, c.atlas.facing(i)) {
			add(line, plain, swatchW, 0, nil)
		}
		add(c.ownLevels(i), plain, swatchW, 0, nil)
	}
	for _, i := range c.spec.absent {
		add(fmt.Sprintf("%s: its ground stage sees no residual current from any fault of its zone (a delta winding or an unearthed system stands between); not drawn", s.Devices[i].Name),
			plain, 0, 3*scale, nil)
	}
	if len(c.margins) > 0 || len(c.elsewhere) > 0 {
		add("Grading margin at the worst fault", head, 0, 7*scale, nil)
	}
	for _, m := range c.margins {
		c.marginRows(m, size, swatchW, scale, plain, add)
	}
	for _, e := range c.elsewhere {
		add(e, plain, 0, 3*scale, nil)
	}
	add("Marks", head, 0, 7*scale, nil)
	for _, k := range c.markKey() {
		add(k.text, plain, swatchW, 2*scale, k.swatch)
	}
	if len(c.offAxis) > 0 || len(lay.dropped) > 0 {
		add("Not on the plot", head, 0, 7*scale, nil)
	}
	for _, t := range c.offAxis {
		add("off the current axis: "+t, plain, 0, 2*scale, nil)
	}
	for _, t := range lay.dropped {
		add("no room for its label: "+t, plain, 0, 2*scale, nil)
	}
	return rows
}

// marginRows describes one pair's margin in the key.
func (c *Chart) marginRows(m margin, size, swatchW, scale vg.Length, plain draw.TextStyle,
	add func(string, draw.TextStyle, vg.Length, vg.Length, func(draw.Canvas, vg.Length, vg.Length, vg.Length))) {
	s := c.atlas.in.Study
	u, d := s.Devices[m.pair.Upstream].Name, s.Devices[m.pair.Downstream].Name
	col := passColour
	if m.f != nil && m.f.Verdict == coord.Fail {
		col = failColour
	}
	add(u+" over "+d, textStyle(size, col, true), 0, 3*scale, nil)
	switch {
	case m.f == nil:
		add("no grading finding", plain, swatchW/2, 0, nil)
	case !m.f.Valid:
		add(m.f.Verdict.String()+": "+m.f.Note, textStyle(size, col, false), swatchW/2, 0, nil)
	default:
		add(m.f.Verdict.String()+"  "+marginText(m.f), textStyle(size, col, true), swatchW/2, 0, nil)
		r := m.f.Fault
		where := fmt.Sprintf("%s %s @ %s", r.Kind, r.Case, r.Place)
		if r.Interpolated {
			where += " (swept)"
		}
		add(where, plain, swatchW/2, 0, nil)
		add(fmt.Sprintf("%s %s in %s; %s %s in %s", d, qtyA(r.DeviceA, r.DeviceQty), nb(fmtS(r.DeviceS, 3)+" s"),
			u, qtyA(r.OtherA, r.OtherQty), nb(fmtS(r.OtherS, 3)+" s")), plain, swatchW/2, 0, nil)
		for _, sc := range c.seen {
			if sc.pair == m.pair {
				add(fmt.Sprintf("%s sees %s × %s's current here (referred): thin curve through the bracket's top",
					u, factorText(sc.factor, c.atlas.starDeltaBetween(m.pair.Upstream, m.pair.Downstream) >= 0), d),
					plain, swatchW/2, 0, nil)
			}
		}
	}
}

// deviceSwatch draws device i's line as the chart draws it: its colour
// and pattern; for a fuse, its thin melting and thick clearing lines.
func (c *Chart) deviceSwatch(i int) func(draw.Canvas, vg.Length, vg.Length, vg.Length) {
	d := &c.atlas.in.Study.Devices[i]
	col, dash := c.colour(i), c.looks[i].dashes()
	return func(dc draw.Canvas, x0, x1, y vg.Length) {
		if d.Kind == coord.Fuse {
			dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(meltWidth), Dashes: dash}, x0, y+3, x1, y+3)
			dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(curveWidth), Dashes: dash}, x0, y-3, x1, y-3)
			return
		}
		dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(curveWidth), Dashes: dash}, x0, y, x1, y)
	}
}

// settingsLines describes a device's settings for a chart of kind q: its
// stages of that kind (IEEE C37.2 numbers, shape, pickup in primary
// amperes, TMS/TD or delay), its CT and breaker, its declared accuracy.
// Figures and their units are joined by no-break spaces, so a line wraps
// between settings and never inside one. A directional stage says its
// direction, and, when it looks the other way from facing (the direction
// of the faults the chart is about), that it is not drawn.
func settingsLines(d *coord.Device, q coord.Quantity, facing coord.Direction) []string {
	if d.Kind == coord.Fuse {
		return []string{"thin: minimum melting; thick: total clearing"}
	}
	var stages []string
	for _, s := range d.Stages {
		if s.Measures != q {
			continue
		}
		st := fmt.Sprintf("%s %s %s", s.Label, s.Shape, nb(fmt.Sprintf("%g A", s.PickupA)))
		switch {
		case s.Shape.Dependent():
			st += " " + nb(fmt.Sprintf("%s %g", s.Shape.MultiplierName(), s.Multiplier))
		case s.DelayS > 0 || s.Shape == curves.ShapeDefinite:
			st += " " + nb(fmt.Sprintf("%g s", s.DelayS))
		}
		if s.Direction != coord.NonDirectional {
			st += " " + s.Direction.String()
			if s.Direction != facing {
				st += " (not drawn: it looks away from these faults)"
			}
		}
		stages = append(stages, st)
	}
	out := []string{strings.Join(stages, " · ")}
	hw := nb(fmt.Sprintf("CT %g/%g A", d.CT.PrimaryA, d.CT.SecondaryA)) + " · " + nb(fmt.Sprintf("breaker %g s", d.BreakerS))
	if a := d.Accuracy; a.ClassPct > 0 {
		hw += " · " + nb(fmt.Sprintf("accuracy %g %%", a.ClassPct))
		if a.MinErrorS > 0 {
			hw += " " + nb(fmt.Sprintf("or %g ms", a.MinErrorS*1000))
		}
	}
	return append(out, hw)
}

// nb joins the words of one setting by no-break spaces.
func nb(s string) string { return strings.ReplaceAll(s, " ", "\u00a0") }

// wrap breaks text into lines no wider than width at its spaces (not at
// no-break spaces); a word wider than width is broken where it must be.
func wrap(text string, sty draw.TextStyle, width vg.Length) []string {
	var words []string
	for _, w := range strings.Split(text, " ") {
		if w == "" {
			continue
		}
		for sty.Width(w) > width && len([]rune(w)) > 1 {
			r := []rune(w)
			k := len(r) - 1
			for k > 1 && sty.Width(string(r[:k])) > width {
				k--
			}
			words = append(words, string(r[:k]))
			w = string(r[k:])
		}
		words = append(words, w)
	}
	if len(words) == 0 {
		return nil
	}
	var lines []string
	line := words[0]
	for _, w := range words[1:] {
		if sty.Width(line+" "+w) > width {
			lines = append(lines, line)
			line = w
			continue
		}
		line += " " + w
	}
	return append(lines, line)
}

// ownLevels lists a device's fault levels of the chart's kind in its own
// amperes, as the key gives them (the plot's labels give them on the
// chart's axis); "none" when no fault of its zone drives such current
// through it.
func (c *Chart) ownLevels(i int) string {
	var parts []string
	for _, x := range c.atlas.levelsOf(i, c.Kind) {
		parts = append(parts, c.levelWord(x.max)+" "+fmtA(x.a))
	}
	if len(parts) == 0 {
		parts = []string{"none"}
	}
	seen := "faults seen"
	if c.Kind == coord.Residual && c.atlas.in.Study.Devices[i].NeutralCT != nil {
		seen = "its neutral CT sees"
	}
	return fmt.Sprintf("%s (A at %g kV): %s", seen, c.atlas.kvOf(i, c.Kind), strings.Join(parts, ", "))
}

// qtyA formats a device's current at a fault, marking a residual one.
func qtyA(a float64, q coord.Quantity) string {
	if q == coord.Residual {
		return fmtA(a) + "\u00a03I0"
	}
	return fmtA(a)
}
