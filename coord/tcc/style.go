package tcc

import (
	"image/color"

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
	{0x56, 0xB4, 0xE9, 0xFF}, // sky blue
	{0x00, 0x00, 0x00, 0xFF}, // black
}

// Colours of what is not a device.
var (
	failColour      = color.NRGBA{0xD5, 0x5E, 0x00, 0xFF} // Okabe & Ito vermillion
	passColour      = color.NRGBA{0x4D, 0x4D, 0x4D, 0xFF} // neutral dark grey
	equipmentColour = color.NRGBA{0x6E, 0x6E, 0x6E, 0xFF} // damage curves
	gridMajor       = color.NRGBA{0xC8, 0xC8, 0xC8, 0xFF}
	gridMinor       = color.NRGBA{0xEB, 0xEB, 0xEB, 0xFF}
	inkColour       = color.NRGBA{0x1A, 0x1A, 0x1A, 0xFF}
	paperColour     = color.NRGBA{0xFF, 0xFF, 0xFF, 0xFF}
	labelBacking    = color.NRGBA{0xFF, 0xFF, 0xFF, 0xD8}
)

// Line widths and sizes in points (1/72 in); at the default 160 dpi a
// point is 2.2 pixels.
const (
	curveWidth     = 1.7 // a relay's phase and ground curves, a fuse's clearing curve
	meltWidth      = 0.9 // a fuse's minimum-melting curve
	markWidth      = 0.7 // fault-level and load lines
	damageWidth    = 1.3
	bracketWidth   = 1.6
	failBracketW   = 2.8
	textSize       = 7.5 // labels on the plot
	panelTextSize  = 7.5
	axisTextSize   = 9
	titleTextSize  = 13
	subtitleSize   = 9
	dotRadius      = 2.2
	bandAlpha      = 0x30 // tolerance band shading
	fuseBandAlpha  = 0x22 // shading between a fuse's melting and clearing curves
	levelLineAlpha = 0x90
)

// Dash patterns.
var (
	groundDashes = []vg.Length{vg.Points(6), vg.Points(3)}
	minDashes    = []vg.Length{vg.Points(1), vg.Points(2)}
	loadDashes   = []vg.Length{vg.Points(7), vg.Points(2), vg.Points(1.5), vg.Points(2)}
	linkDashes   = []vg.Length{vg.Points(1.5), vg.Points(1.5)}
)

// sans is the typeface of every text: Liberation Sans, which gonum/plot
// embeds, so a plot looks the same on every machine.
var sans = font.Font{Typeface: "Liberation", Variant: "Sans"}

// textStyle returns a text style of the given size and colour.
func textStyle(size vg.Length, c color.Color, bold bool) draw.TextStyle {
	f := font.From(sans, size)
	if bold {
		f.Weight = stdfont.WeightBold
	}
	return draw.TextStyle{Color: c, Font: f, Handler: plot.DefaultTextHandler}
}

// withAlpha returns c with the given opacity.
func withAlpha(c color.NRGBA, a uint8) color.NRGBA {
	c.A = a
	return c
}

// colourFor returns the colour of palette slot k.
func colourFor(k int) color.NRGBA { return deviceColours[k%len(deviceColours)] }

// assignColours gives every device of a study a palette slot, the same in
// every chart of the study. Devices are taken in study order and each gets
// the first slot not already held by a device it is drawn with (they share
// a path or a failing pair); when all are held it gets the slot held by
// the fewest of them. So devices drawn together differ in colour whenever
// the palette allows, and a device keeps its colour from chart to chart.
func assignColours(nDevices int, groups [][]int) []int {
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
	slot := make([]int, nDevices)
	for i := range slot {
		var held [len(deviceColours)]int
		for j := range together[i] {
			if j < i {
				held[slot[j]]++
			}
		}
		best := 0
		for k := range held {
			if held[k] < held[best] {
				best = k
			}
			if held[k] == 0 {
				best = k
				break
			}
		}
		slot[i] = best
	}
	return slot
}
