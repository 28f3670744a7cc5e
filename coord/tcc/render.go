package tcc

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"image"
	"image/png"
	"io"
	"math"
	"slices"
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
// file (or any io.Writer). Every text is drawn as glyph outlines, so an
// SVG needs no font on the machine that shows it.
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
		c.drawAll(draw.New(outlined{CanvasSizer: cv}))
		return fastPNG{cv.Image()}, nil
	case SVG:
		cv := vgsvg.New(w, h)
		c.drawAll(draw.New(outlined{CanvasSizer: cv}))
		return titled{cv, c.atlas.in.Study.Name + " · " + chartTitle(c.Kind) + " · " + c.Subtitle}, nil
	}
	return nil, fmt.Errorf("tcc: unknown format %d", f)
}

// fastPNG writes an image as PNG with the fastest compression: a chart's
// large flat areas compress almost as well as with the default level
// (about 3 % larger) in two thirds of the time, which counts when a study
// writes hundreds of charts.
type fastPNG struct{ img image.Image }

// WriteTo encodes the image.
func (p fastPNG) WriteTo(w io.Writer) (int64, error) {
	cw := &countingWriter{w: w}
	err := (&png.Encoder{CompressionLevel: png.BestSpeed}).Encode(cw, p.img)
	return cw.n, err
}

// countingWriter counts the bytes written through it.
type countingWriter struct {
	w io.Writer
	n int64
}

func (c *countingWriter) Write(b []byte) (int, error) {
	n, err := c.w.Write(b)
	c.n += int64(n)
	return n, err
}

// titled writes an SVG with a <title> after its opening tag: the chart's
// name for screen readers and file browsers, escaped, since the picture's
// own text is outlines.
type titled struct {
	svg   io.WriterTo
	title string
}

// WriteTo writes the SVG.
func (t titled) WriteTo(w io.Writer) (int64, error) {
	var buf bytes.Buffer
	if _, err := t.svg.WriteTo(&buf); err != nil {
		return 0, err
	}
	doc := buf.Bytes()
	at := bytes.Index(doc, []byte("<svg"))
	if at >= 0 {
		if end := bytes.IndexByte(doc[at:], '>'); end >= 0 {
			var esc bytes.Buffer
			xml.EscapeText(&esc, []byte(t.title))
			cut := at + end + 1
			doc = slices.Concat(doc[:cut], []byte("\n<title>"), esc.Bytes(), []byte("</title>"), doc[cut:])
		}
	}
	n, err := w.Write(doc)
	return int64(n), err
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
	footerH   = 12 // the caution below everything
	panelW    = 212
	pageInset = 8
)

// regions splits the page into the header, the plot, the key panel and
// the footer.
func regions(full draw.Canvas) (header, plotArea, panel, footer draw.Canvas) {
	header = draw.Crop(full, pageInset, -pageInset, full.Max.Y-full.Min.Y-headerH, -pageInset/2)
	footer = draw.Crop(full, pageInset, -pageInset, pageInset/2, -(full.Max.Y - full.Min.Y - pageInset/2 - footerH))
	body := draw.Crop(full, pageInset, -pageInset, pageInset/2+footerH, -headerH)
	plotArea = draw.Crop(body, 0, -(panelW + pageInset), 0, 0)
	panel = draw.Crop(body, body.Max.X-body.Min.X-panelW, 0, 0, 0)
	return header, plotArea, panel, footer
}

func (c *Chart) drawAll(full draw.Canvas) {
	full.SetColor(paperColour)
	full.Fill(full.Rectangle.Path())
	header, plotArea, panel, footer := regions(full)
	f := c.frame(plotArea)
	f.plot.Add(layers{c: c, lay: f.lay})
	f.plot.Draw(f.area)
	// The current axis's name, centred under the data area: gonum/plot
	// would centre it on the arithmetic middle of a log axis, near its
	// right end, and narrow the plot to make room for it there.
	putText(plotArea, textStyle(axisTextSize, inkColour, false),
		vg.Point{X: (f.data.Min.X + f.data.Max.X) / 2, Y: plotArea.Min.Y}, 0.5, 0, c.axisLabel())
	c.drawHeader(header)
	c.drawPanel(panel, f.lay)
	drawFooter(footer)
}

// xLabelH is the height below the plot kept for the current axis's name.
const xLabelH = axisTextSize + 4

// frame is the plot of a chart laid out in its plot area: the area the
// plot is drawn in, the data area inside its axes and where the labels
// of the data area go.
type frame struct {
	plot       *plot.Plot
	area, data draw.Canvas
	lay        *layout
}

// frame sets up the plot for the plot area and places the labels of its
// data area.
func (c *Chart) frame(plotArea draw.Canvas) frame {
	f := frame{plot: c.newPlot(), area: draw.Crop(plotArea, 0, 0, xLabelH, 0)}
	f.data = f.plot.DataCanvas(f.area)
	trX, trY := f.plot.Transforms(&f.data)
	at := func(pt Point) vg.Point { return vg.Point{X: trX(pt.CurrentA), Y: trY(pt.TimeS)} }
	f.lay = c.layoutLabels(f.data.Rectangle, at)
	return f
}

// newPlot sets up the axes.
func (c *Chart) newPlot() *plot.Plot {
	p := plot.New()
	p.BackgroundColor = nil
	p.X.Scale, p.Y.Scale = plot.LogScale{}, plot.LogScale{}
	p.X.Min, p.X.Max = c.xMin, c.xMax
	p.Y.Min, p.Y.Max = TimeMinS, TimeMaxS
	p.X.Tick.Marker, p.Y.Tick.Marker = decadeTicks{}, decadeTicks{}
	p.Y.Label.Text = "time (s)"
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = font.From(sans, axisTextSize)
		ax.Label.TextStyle.Color = inkColour
		ax.Tick.Label.Font = font.From(sans, axisTextSize-1)
		ax.Tick.Label.Color = inkColour
		ax.Color, ax.Tick.Color = inkColour, inkColour
		ax.Padding = 0
	}
	return p
}

// pageAt returns the page of a chart of the given size, in points.
func pageAt(s Settings) draw.Canvas {
	w, h := s.size()
	return draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: w, Y: h}}}
}

// Locate returns the pixel (x right, y down from the top-left corner of
// the image) where a point of the chart, a current at RefKV and a time, is
// drawn at the given size: the plot's own coordinate transform.
func (c *Chart) Locate(s Settings, currentA, timeS float64) (x, y float64) {
	s = s.norm()
	c.build()
	_, plotArea, _, _ := regions(pageAt(s))
	f := c.frame(plotArea)
	trX, trY := f.plot.Transforms(&f.data)
	k := float64(s.DPI) / float64(vg.Inch)
	return float64(trX(currentA)) * k, float64(s.HeightPx) - float64(trY(timeS))*k
}

// labelLayout returns where the labels of the data area go at the given
// size, in points from the page's bottom-left corner.
func (c *Chart) labelLayout(s Settings) *layout {
	s = s.norm()
	c.build()
	_, plotArea, _, _ := regions(pageAt(s))
	return c.frame(plotArea).lay
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
