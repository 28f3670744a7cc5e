package tcc

import (
	"fmt"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"tripgrade/coord"
)

// keyEntry explains one kind of mark, with a small sample of it.
type keyEntry struct {
	text   string
	swatch func(dc draw.Canvas, x0, x1, y vg.Length)
}

// markKey lists the marks the chart shows, each with its sample.
func (c *Chart) markKey() []keyEntry {
	var out []keyEntry
	line := func(sty draw.LineStyle) func(draw.Canvas, vg.Length, vg.Length, vg.Length) {
		return func(dc draw.Canvas, x0, x1, y vg.Length) { dc.StrokeLine2(sty, x0, y, x1, y) }
	}
	if len(c.levels) > 0 {
		what := "fault level seen by the device over its zone"
		if c.Kind == coord.Residual {
			what = "residual (3I0) fault level seen by the device over its zone"
		}
		out = append(out, keyEntry{what + ": solid max, dotted min; ring: its time there",
			func(dc draw.Canvas, x0, x1, y vg.Length) {
				sty := draw.LineStyle{Color: passColour, Width: vg.Points(markWidth)}
				m := (x0 + x1) / 2
				dc.StrokeLine2(sty, m-4, y-5, m-4, y+5)
				sty.Dashes = minDashes
				dc.StrokeLine2(sty, m+4, y-5, m+4, y+5)
			}})
	}
	if len(c.bands) > 0 {
		out = append(out, keyEntry{"shaded: declared timing tolerance (IEC 60255-151), or a fuse's melting-to-clearing spread",
			func(dc draw.Canvas, x0, x1, y vg.Length) {
				dc.FillPolygon(withAlpha(passColour, bandAlpha+0x10), []vg.Point{{X: x0, Y: y - 3}, {X: x1, Y: y - 3}, {X: x1, Y: y + 3}, {X: x0, Y: y + 3}})
			}})
	}
	if len(c.seen) > 0 {
		out = append(out, keyEntry{"thin line in a device's colour: an upstream device's curve as it responds to the kind of fault of a pair's worst margin, drawn against the downstream device's current (I × the ratio of the two currents at that fault)",
			line(draw.LineStyle{Color: passColour, Width: vg.Points(seenWidth)})})
	}
	if len(c.damages) > 0 {
		out = append(out, keyEntry{"damage curve (C57.109 through-fault, cable adiabatic I²t) of equipment on this part of the path; ticks on the damage side",
			func(dc draw.Canvas, x0, x1, y vg.Length) {
				hatched(dc, []vg.Point{{X: x0, Y: y - 2}, {X: x1, Y: y - 2}})
			}})
	}
	if len(c.inrush) > 0 {
		crit := c.atlas.in.Study.Criteria
		out = append(out, keyEntry{fmt.Sprintf("inrush: %g × full-load current of the path's transformers a device energises, %g s", crit.InrushMultiple, crit.InrushTimeS),
			func(dc draw.Canvas, x0, x1, y vg.Length) {
				(draw.CrossGlyph{}).DrawGlyph(&dc, draw.GlyphStyle{Color: inkColour, Radius: vg.Points(3.2)}, vg.Point{X: (x0 + x1) / 2, Y: y})
			}})
	}
	if len(c.loads) > 0 {
		out = append(out, keyEntry{"maximum load current through the device",
			line(draw.LineStyle{Color: passColour, Width: vg.Points(markWidth), Dashes: loadDashes})})
	}
	drawn, col := false, passColour
	for _, m := range c.margins {
		drawn = drawn || m.drawable
		if m.drawable && m.f.Verdict == coord.Fail {
			col = failColour
		}
	}
	if drawn {
		out = append(out, keyEntry{"margin at the worst fault: bracket at the downstream current between the two times, dashed to its left the interval required; dotted link to the upstream device's own current; ringed when it fails and is short",
			func(dc draw.Canvas, x0, x1, y vg.Length) {
				m := (x0 + x1) / 2
				sty := draw.LineStyle{Color: col, Width: vg.Points(failBracketW)}
				dc.StrokeLine2(sty, m, y-5, m, y+5)
				dc.StrokeLine2(sty, m-4, y-5, m+4, y-5)
				dc.StrokeLine2(sty, m-4, y+5, m+4, y+5)
			}})
	}
	if c.referred {
		out = append(out, keyEntry{fmt.Sprintf("every current on the plot, labels included, is referred to %s kV by the transformers' rated winding ratios; the key above gives each device's own", fmtKV(c.refKV)), nil})
	}
	return out
}
