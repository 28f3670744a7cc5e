package tcc

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Format is an image format a chart is written in.
type Format uint8

// Formats.
const (
	PNG Format = iota
	SVG
)

// ParseFormat reads "png" or "svg".
func ParseFormat(s string) (Format, error) {
	switch strings.ToLower(s) {
	case "png":
		return PNG, nil
	case "svg":
		return SVG, nil
	}
	return 0, fmt.Errorf("format %q: want png or svg", s)
}

// Ext returns the format's file extension without the dot.
func (f Format) Ext() string {
	if f == SVG {
		return "svg"
	}
	return "png"
}

// Settings size a chart. The zero value is the default: 1600 × 1200
// pixels at 160 dots per inch (10 × 7.5 in), which keeps every text
// readable on a screen and on an A4 page. Text sizes are in points, so a
// chart drawn larger at the same DPI has more room, not larger text.
type Settings struct {
	WidthPx, HeightPx int
	DPI               int
}

// The default size.
const (
	DefaultWidthPx  = 1600
	DefaultHeightPx = 1200
	DefaultDPI      = 160
)

func (s Settings) norm() Settings {
	if s.WidthPx <= 0 {
		s.WidthPx = DefaultWidthPx
	}
	if s.HeightPx <= 0 {
		s.HeightPx = DefaultHeightPx
	}
	if s.DPI <= 0 {
		s.DPI = DefaultDPI
	}
	return s
}

// size returns the canvas size in points.
func (s Settings) size() (w, h vg.Length) {
	return vg.Length(s.WidthPx) * vg.Inch / vg.Length(s.DPI), vg.Length(s.HeightPx) * vg.Inch / vg.Length(s.DPI)
}

// WriterTo draws the chart and returns it ready to be written in the
// given format, as gonum/plot's Plot.WriterTo does. The caller opens the
// file (or any io.Writer).
func (c *Chart) WriterTo(f Format, s Settings) (io.WriterTo, error) {
	s = s.norm()
	w, h := s.size()
	if w < 4*vg.Inch || h < 3*vg.Inch {
		return nil, fmt.Errorf("tcc: a chart needs at least 4 × 3 in (got %d × %d px at %d dpi)", s.WidthPx, s.HeightPx, s.DPI)
	}
	c.build()
	switch f {
	case PNG:
		cv := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(s.DPI), vgimg.UseBackgroundColor(paperColour))
		c.drawAll(draw.New(cv))
		return vgimg.PngCanvas{Canvas: cv}, nil
	case SVG:
		cv := vgsvg.New(w, h)
		c.drawAll(draw.New(cv))
		return cv, nil
	}
	return nil, fmt.Errorf("tcc: unknown format %d", f)
}

// Render writes the chart to w.
func (c *Chart) Render(w io.Writer, f Format, s Settings) error {
	wt, err := c.WriterTo(f, s)
	if err != nil {
		return err
	}
	_, err = wt.WriteTo(w)
	return err
}

// Layout of the page, in points.
const (
	headerH   = 44 // title lines above everything
	panelW    = 212
	pageInset = 8
)

// regions splits the page into the header, the plot and the key panel.
func regions(full draw.Canvas) (header, plotArea, panel draw.Canvas) {
	header = draw.Crop(full, pageInset, -pageInset, full.Max.Y-full.Min.Y-headerH, -pageInset/2)
	body := draw.Crop(full, pageInset, -pageInset, pageInset, -headerH)
	plotArea = draw.Crop(body, 0, -(panelW + pageInset), 0, 0)
	panel = draw.Crop(body, body.Max.X-body.Min.X-panelW, 0, 0, 0)
	return header, plotArea, panel
}

func (c *Chart) drawAll(full draw.Canvas) {
	full.SetColor(paperColour)
	full.Fill(full.Rectangle.Path())
	header, plotArea, panel := regions(full)
	c.newPlot().Draw(plotArea)
	c.drawHeader(header)
	c.drawPanel(panel)
}

// newPlot sets up the axes and adds the chart's layers.
func (c *Chart) newPlot() *plot.Plot {
	p := plot.New()
	p.BackgroundColor = nil
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Min, p.X.Max = c.xMin, c.xMax
	p.Y.Min, p.Y.Max = TimeMinS, TimeMaxS
	p.X.Tick.Marker, p.Y.Tick.Marker = decadeTicks{}, decadeTicks{}
	p.X.Label.Text = fmt.Sprintf("current (A at %g kV)", c.refKV)
	p.Y.Label.Text = "time (s)"
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = font.From(sans, axisTextSize)
		ax.Label.TextStyle.Color = inkColour
		ax.Tick.Label.Font = font.From(sans, axisTextSize-1)
		ax.Tick.Label.Color = inkColour
		ax.Color, ax.Tick.Color = inkColour, inkColour
		ax.Padding = 0
	}
	p.Add(layers{c})
	return p
}

// Locate returns the pixel (x right, y down from the top-left corner of
// the image) where a point of the chart, a current at RefKV and a time, is
// drawn at the given size: the plot's own coordinate transform.
func (c *Chart) Locate(s Settings, currentA, timeS float64) (x, y float64) {
	s = s.norm()
	w, h := s.size()
	c.build()
	full := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: w, Y: h}}}
	_, plotArea, _ := regions(full)
	p := c.newPlot()
	dc := p.DataCanvas(plotArea)
	trX, trY := p.Transforms(&dc)
	k := float64(s.DPI) / float64(vg.Inch)
	return float64(trX(currentA)) * k, float64(s.HeightPx) - float64(trY(timeS))*k
}

// decadeTicks marks every decade with a label and 2…9 times it without.
type decadeTicks struct{}

var _ plot.Ticker = decadeTicks{}

// Ticks returns the ticks between min and max.
func (decadeTicks) Ticks(min, max float64) []plot.Tick {
	var out []plot.Tick
	for e := math.Floor(math.Log10(min)); e <= math.Ceil(math.Log10(max)); e++ {
		v := math.Pow(10, e)
		out = append(out, plot.Tick{Value: v, Label: tickLabel(v)})
		for m := 2.0; m < 10; m++ {
			out = append(out, plot.Tick{Value: m * v})
		}
	}
	return out
}

// tickLabel writes a decade the SI way: "0.01", "1", "10 000".
func tickLabel(v float64) string {
	if v < 1 {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	s := strconv.FormatFloat(v, 'f', 0, 64)
	if len(s) <= 4 {
		return s
	}
	var b strings.Builder
	for k, r := range s {
		if k > 0 && (len(s)-k)%3 == 0 {
			b.WriteRune('\u2009')
		}
		b.WriteRune(r)
	}
	return b.String()
}
