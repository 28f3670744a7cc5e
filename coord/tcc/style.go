package tcc

import (
	"cmp"
	"image/color"
	"slices"

	stdfont "golang.org/x/image/font"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// The device colours are the Okabe & Ito (2008) colour-blind-safe set
// ("Color Universal Design", https://jfly.uni-koeln.de/color/), less two
// of its members: yellow, which is too pale on white, and vermillion,
// which is kept for failing grading margins alone so that a failure is
// never mistaken for a device.
var deviceColours = [...]color.NRGBA{
	{0x00, 0x72, 0xB2, 0xFF}, // blue
	{0xE6, 0x9F, 0x00, 0xFF}, // orange
	{0x00, 0x9E, 0x73, 0xFF}, // bluish green
	{0xCC, 0x79, 0xA7, 0xFF}, // reddish purple
	{0x00, 0x00, 0x00, 0xFF}, // black
	{0x56, 0xB4, 0xE9, 0xFF}, // sky blue
}

// akin pairs the palette's colours that are told apart least easily (blue
// and sky blue differ in lightness more than in hue): two devices drawn
// together get such a pair only when no other colour is free.
var akin = map[int]int{0: 5, 5: 0}

// deviceDashes are the line patterns that tell apart devices drawn in one
// colour: solid first, so that up to six devices differ by colour alone.
var deviceDashes = [...][]vg.Length{
	nil,
	{vg.Points(7), vg.Points(3)},
	{vg.Points(12), vg.Points(3), vg.Points(2), vg.Points(3)},
	{vg.Points(2), vg.Points(2.2)},
	{vg.Points(16), vg.Points(4)},
	{vg.Points(9), vg.Points(2.5), vg.Points(2), vg.Points(2.5), vg.Points(2), vg.Points(2.5)},
}

// dashNames describe deviceDashes in the key.
var dashNames = [...]string{"solid", "dashed", "dash-dot", "dotted", "long dashes", "dash-dot-dot"}

// Style is a device's look on a chart: one of the palette's colours and
// one of the line patterns. No two devices drawn on one chart share both.
type Style struct {
	Colour, Dash int
}

// styleCount is how many distinct device looks there are: the most
// devices one chart draws.
const styleCount = len(deviceColours) * len(deviceDashes)

// styleOf returns look k: the colours in order, solid, then each again
// with the next pattern.
func styleOf(k int) Style {
	return Style{Colour: k % len(deviceColours), Dash: k / len(deviceColours)}
}

// colour returns the style's colour.
func (s Style) colour() color.NRGBA { return deviceColours[s.Colour] }

// dashes returns the style's line pattern (nil: solid).
func (s Style) dashes() []vg.Length { return deviceDashes[s.Dash] }

// Colours of what is not a device.
var (
	failColour      = color.NRGBA{0xD5, 0x5E, 0x00, 0xFF} // Okabe & Ito vermillion
	passColour      = color.NRGBA{0x4D, 0x4D, 0x4D, 0xFF} // neutral dark grey
	equipmentColour = color.NRGBA{0x6E, 0x6E, 0x6E, 0xFF} // damage curves
	gridMajor       = color.NRGBA{0xC8, 0xC8, 0xC8, 0xFF}
	gridMinor       = color.NRGBA{0xEB, 0xEB, 0xEB, 0xFF}
	inkColour       = color.NRGBA{0x1A, 0x1A, 0x1A, 0xFF}
	paperColour     = color.NRGBA{0xFF, 0xFF, 0xFF, 0xFF}
	labelBacking    = color.NRGBA{0xFF, 0xFF, 0xFF, 0xC8}
)

// Line widths and sizes in points (1/72 in); at the default 160 dpi a
// point is 2.2 pixels.
const (
	curveWidth     = 1.7 // a relay's curve, a fuse's clearing curve
	meltWidth      = 0.9 // a fuse's minimum-melting curve
	seenWidth      = 1.0 // an upstream curve as it responds to the worst fault's kind
	markWidth      = 0.7 // fault-level and load lines
	damageWidth    = 1.3
	bracketWidth   = 1.6
	failBracketW   = 2.8
	textSize       = 7.5 // labels on the plot
	panelTextSize  = 7.5
	axisTextSize   = 9
	titleTextSize  = 13
	subtitleSize   = 9
	footerSize     = 6.5
	dotRadius      = 2.2
	bandAlpha      = 0x30 // tolerance band shading
	fuseBandAlpha  = 0x22 // shading between a fuse's melting and clearing curves
	levelLineAlpha = 0x90
)

// Dash patterns of what is not a device.
var (
	minDashes  = []vg.Length{vg.Points(1), vg.Points(2)}
	loadDashes = []vg.Length{vg.Points(7), vg.Points(2), vg.Points(1.5), vg.Points(2)}
	linkDashes = []vg.Length{vg.Points(1.5), vg.Points(1.5)}
)

// sans is the typeface of every text: Liberation Sans, which gonum/plot
// embeds. Text is drawn as glyph outlines (see outlined), so the picture
// does not depend on the fonts of the machine that shows it.
var sans = font.Font{Typeface: "Liberation", Variant: "Sans"}

// textStyle returns a text style of the given size and colour.
func textStyle(size vg.Length, c color.Color, bold bool) draw.TextStyle {
	f := font.From(sans, size)
	if bold {
		f.Weight = stdfont.WeightBold
	}
	return draw.TextStyle{Color: c, Font: f, Handler: plot.DefaultTextHandler}
}

// faceOf returns the font face of a text style.
func faceOf(sty draw.TextStyle) font.Face {
	return sty.Handler.Cache().Lookup(sty.Font, sty.Font.Size)
}

// measure returns the box of one line of text: its advance width and the
// font's ascent plus descent, the box the outlines are drawn in.
func measure(sty draw.TextStyle, s string) (w, h vg.Length) {
	f := faceOf(sty)
	ext := f.Extents()
	return f.Width(s), ext.Ascent + ext.Descent
}

// putText draws one line of text so that its box (see measure) has the
// point of it given by ax and ay (0: left or bottom edge, 1: right or top
// edge, 0.5: middle) at pt, and returns the box.
func putText(dc draw.Canvas, sty draw.TextStyle, pt vg.Point, ax, ay float64, s string) vg.Rectangle {
	f := faceOf(sty)
	ext := f.Extents()
	w, h := f.Width(s), ext.Ascent+ext.Descent
	lo := vg.Point{X: pt.X - vg.Length(ax)*w, Y: pt.Y - vg.Length(ay)*h}
	dc.SetColor(sty.Color)
	dc.FillString(f, vg.Point{X: lo.X, Y: lo.Y + ext.Descent}, s)
	return vg.Rectangle{Min: lo, Max: vg.Point{X: lo.X + w, Y: lo.Y + h}}
}

// withAlpha returns c with the given opacity.
func withAlpha(c color.NRGBA, a uint8) color.NRGBA {
	c.A = a
	return c
}

// assignStyles gives every device of a study a look, the same in every
// chart of the study where it can be. Devices are taken most-drawn-with
// first (the order of Welsh and Powell's colouring; study order among
// equals), and each gets the first look whose colour no device it is
// drawn with holds yet, preferring colours not akin to theirs; failing
// that the first look none of them holds; failing that (more than
// styleCount devices drawn together) look 0, and Chart.chartLooks settles what
// remains within one chart. So devices drawn together differ in colour
// wherever the palette allows, and a device keeps its colour from chart to
// chart.
func assignStyles(nDevices int, groups [][]int) []int {
	together := make([]map[int]bool, nDevices)
	for i := range together {
		together[i] = map[int]bool{}
	}
	for _, g := range groups {
		for _, a := range g {
			for _, b := range g {
				if a != b {
					together[a][b] = true
				}
			}
		}
	}
	order := make([]int, nDevices)
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(len(together[b]), len(together[a])) })
	slot := make([]int, nDevices)
	done := make([]bool, nDevices)
	for _, i := range order {
		var heldLook [styleCount]bool
		var heldColour [len(deviceColours)]bool
		for j := range together[i] {
			if done[j] {
				heldLook[slot[j]] = true
				heldColour[styleOf(slot[j]).Colour] = true
			}
		}
		slot[i] = firstFree(heldLook[:], heldColour[:])
		done[i] = true
	}
	return slot
}

// firstFree returns the first look with a colour not held and not akin to
// one held, else the first with a colour not held, else the first look
// not held, else 0.
func firstFree(heldLook, heldColour []bool) int {
	for k := range heldLook {
		c := styleOf(k).Colour
		if a, ok := akin[c]; !heldLook[k] && !heldColour[c] && !(ok && heldColour[a]) {
			return k
		}
	}
	for k := range heldLook {
		if !heldLook[k] && !heldColour[styleOf(k).Colour] {
			return k
		}
	}
	for k := range heldLook {
		if !heldLook[k] {
			return k
		}
	}
	return 0
}
