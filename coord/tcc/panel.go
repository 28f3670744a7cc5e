package tcc

import (
	"fmt"
	"image/color"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"tripgrade/coord"
	"tripgrade/curves"
)

// drawHeader writes the study name and the path or pair, and on the right
// how many of the chart's pairs fail their grading margin.
func (c *Chart) drawHeader(h draw.Canvas) {
	title := textStyle(titleTextSize, inkColour, true)
	title.YAlign = draw.YTop
	h.FillText(title, vg.Point{X: h.Min.X, Y: h.Max.Y}, c.atlas.in.Study.Name+" · time–current curves")
	sub := textStyle(subtitleSize, inkColour, false)
	sub.YAlign = draw.YBottom
	h.FillText(sub, vg.Point{X: h.Min.X, Y: h.Min.Y + 4}, c.Subtitle)
	n, fail := 0, c.Failing()
	for _, m := range c.margins {
		if m.f != nil {
			n++
		}
	}
	if n == 0 {
		return
	}
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
	v.XAlign, v.YAlign = draw.XRight, draw.YTop
	h.FillText(v, vg.Point{X: h.Max.X, Y: h.Max.Y}, verdict)
}

// row is one line of the key panel.
type row struct {
	text   string
	sty    draw.TextStyle
	indent vg.Length
	swatch func(dc draw.Canvas, x0, x1, y vg.Length)
	gap    vg.Length // extra space above
}

// drawPanel draws the key beside the plot: every device with its
// settings, every pair's margin at its worst fault, and what the marks
// mean. The text shrinks until the key fits.
func (c *Chart) drawPanel(dc draw.Canvas) {
	avail := dc.Max.Y - dc.Min.Y
	var rows []row
	for _, scale := range []float64{1, 0.93, 0.86, 0.8, 0.74, 0.68, 0.62} {
		rows = c.panelRows(vg.Length(scale), dc.Max.X-dc.Min.X)
		if panelHeight(rows) <= avail {
			break
		}
	}
	y := dc.Max.Y
	for _, r := range rows {
		h := r.sty.Rectangle("Mg").Size().Y
		y -= r.gap
		sty := r.sty
		sty.YAlign = draw.YTop
		dc.FillText(sty, vg.Point{X: dc.Min.X + r.indent, Y: y}, r.text)
		if r.swatch != nil {
			r.swatch(dc, dc.Min.X, dc.Min.X+r.indent-vg.Points(3), y-h/2)
		}
		y -= h
	}
}

func panelHeight(rows []row) vg.Length {
	var h vg.Length
	for _, r := range rows {
		h += r.gap + r.sty.Rectangle("Mg").Size().Y
	}
	return h
}

// panelRows lays out the key at a text scale, wrapping to width.
func (c *Chart) panelRows(scale, width vg.Length) []row {
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
		col := c.colour(i)
		name := textStyle(size, col, true)
		kind := "relay"
		if d.Kind == coord.Fuse {
			kind = fmt.Sprintf("fuse %g A", d.RatingA)
		}
		add(fmt.Sprintf("%s  %s at %g kV", d.Name, kind, c.atlas.kvOf(i)), name, swatchW, 3*scale, deviceSwatch(d, col))
		for _, line := range settingsLines(d) {
			add(line, plain, swatchW, 0, nil)
		}
		if lv := c.ownLevels(i); lv != "" {
			add(lv, plain, swatchW, 0, nil)
		}
	}
	if len(c.margins) > 0 {
		add("Grading margin at the worst fault", head, 0, 7*scale, nil)
	}
	for _, m := range c.margins {
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
			add(fmt.Sprintf("%s %s in %s s; %s %s in %s s", d, qtyA(r.DeviceA, r.DeviceQty), fmtS(r.DeviceS, 3),
				u, qtyA(r.OtherA, r.OtherQty), fmtS(r.OtherS, 3)), plain, swatchW/2, 0, nil)
		}
	}
	add("Marks", head, 0, 7*scale, nil)
	for _, k := range c.markKey() {
		add(k.text, plain, swatchW, 2*scale, k.swatch)
	}
	return rows
}

// deviceSwatch draws a device's line styles: solid phase, dashed ground;
// for a fuse, its thin melting and thick clearing lines.
func deviceSwatch(d *coord.Device, col color.NRGBA) func(draw.Canvas, vg.Length, vg.Length, vg.Length) {
	return func(dc draw.Canvas, x0, x1, y vg.Length) {
		if d.Kind == coord.Fuse {
			dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(meltWidth)}, x0, y+3, x1, y+3)
			dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(curveWidth)}, x0, y-3, x1, y-3)
			return
		}
		ph, gr := d.Pickup(coord.Phase) > 0, d.Pickup(coord.Residual) > 0
		if ph {
			dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(curveWidth)}, x0, y+3, x1, y+3)
		}
		if gr {
			dc.StrokeLine2(draw.LineStyle{Color: col, Width: vg.Points(curveWidth), Dashes: groundDashes}, x0, y-3, x1, y-3)
		}
	}
}

// settingsLines describes a device's settings: its stages (IEEE C37.2
// numbers, shape, pickup in primary amperes, TMS/TD or delay), its CT and
// breaker, its declared accuracy.
func settingsLines(d *coord.Device) []string {
	if d.Kind == coord.Fuse {
		return []string{"thin: minimum melting; thick: total clearing"}
	}
	var stages []string
	for _, s := range d.Stages {
		st := fmt.Sprintf("%s %s %g A", s.Label, s.Shape, s.PickupA)
		switch {
		case s.Shape.Dependent():
			st += fmt.Sprintf(" %s %g", s.Shape.MultiplierName(), s.Multiplier)
		case s.DelayS > 0 || s.Shape == curves.ShapeDefinite:
			st += fmt.Sprintf(" %g s", s.DelayS)
		}
		stages = append(stages, st)
	}
	out := []string{strings.Join(stages, " · ")}
	hw := fmt.Sprintf("CT %g/%g A · breaker %g s", d.CT.PrimaryA, d.CT.SecondaryA, d.BreakerS)
	if a := d.Accuracy; a.ClassPct > 0 {
		hw += fmt.Sprintf(" · accuracy %g %%", a.ClassPct)
		if a.MinErrorS > 0 {
			hw += fmt.Sprintf(" or %g ms", a.MinErrorS*1000)
		}
	}
	return append(out, hw)
}

// wrap breaks text into lines no wider than width at word boundaries.
func wrap(text string, sty draw.TextStyle, width vg.Length) []string {
	words := strings.Fields(text)
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

// ownLevels lists a device's fault levels in its own amperes, as the key
// gives them (the plot's labels give them on the chart's axis).
func (c *Chart) ownLevels(i int) string {
	var parts []string
	for _, l := range c.levels {
		if l.device != i {
			continue
		}
		what := "min"
		if l.max {
			what = "max"
		}
		if l.ground {
			what = "3I0 " + what
		}
		parts = append(parts, what+" "+fmtA(l.deviceA))
	}
	if len(parts) == 0 {
		return ""
	}
	return fmt.Sprintf("faults seen (A at %g kV): %s", c.atlas.kvOf(i), strings.Join(parts, ", "))
}

// qtyA formats a device's current at a fault, marking a residual one.
func qtyA(a float64, q coord.Quantity) string {
	if q == coord.Residual {
		return fmtA(a) + " 3I0"
	}
	return fmtA(a)
}
