package tcc

import (
	"bytes"
	"encoding/xml"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
)

// loadAtlas prepares the charts of a study file, with edit applied to its
// text first.
func loadAtlas(t *testing.T, path string, edit func(string) string) *Atlas {
	t.Helper()
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	text := string(src)
	if edit != nil {
		text = edit(text)
	}
	s, err := study.Parse(path, []byte(text), os.DirFS(filepath.Dir(path)))
	if err != nil {
		t.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	res, err := coord.Check(s, eng, topo)
	if err != nil {
		t.Fatal(err)
	}
	levels, err := coord.FaultLevels(s, eng, topo)
	if err != nil {
		t.Fatal(err)
	}
	a, err := NewAtlas(Input{Study: s, Topology: topo, Result: res, Levels: levels})
	if err != nil {
		t.Fatal(err)
	}
	return a
}

const twoVoltage = "testdata/two-voltage.toml"

// IEC 60255-151:2009 standard inverse at 10× setting: t = TMS · 0.14 /
// (10^0.02 − 1) = 2.971 · TMS.
const iecSIAt10 = 2.971

// curveTol is the relative error allowed when reading a time off a drawn
// line: the line joins samples 160 per decade, and the standard inverse
// curve is so smooth in log–log that the chord error is far below it; the
// check value itself is rounded to four figures.
const curveTol = 1e-3

func traceOf(t *testing.T, c *Chart, dev int, kind TraceKind) Trace {
	t.Helper()
	for _, tr := range c.Traces() {
		if tr.Device == dev && tr.Kind == kind {
			return tr
		}
	}
	t.Fatalf("no %s trace for device %d", kind, dev)
	return Trace{}
}

func TestCurvesWhereTheFormulasPutThem(t *testing.T) {
	a := loadAtlas(t, twoVoltage, nil)
	charts := a.Charts()
	if got := chartNames(charts); !slices.Equal(got, []string{"path-R11--R33", "path-R11-earth"}) {
		t.Fatalf("charts %v, want the phase chart path-R11--R33 and the earth chart path-R11-earth", got)
	}
	phase, earth := charts[0], charts[1]
	r11, r33 := a.Device("R11"), a.Device("R33")
	if got := phase.RefKV(); got != 11 {
		t.Fatalf("RefKV %g, want 11 (the most downstream device's bus)", got)
	}
	cases := []struct {
		name     string
		chart    *Chart
		dev      int
		kind     TraceKind
		currentA float64 // on the 11 kV axis
		want     float64
	}{
		// R11: 200 A, TMS 0.1, on its own voltage.
		{"R11 phase at 10× pickup", phase, r11, PhaseCurve, 2000, iecSIAt10 * 0.1},
		// R11 51N: 40 A, TMS 0.2, on the earth chart.
		{"R11 ground at 10× pickup", earth, r11, GroundCurve, 400, iecSIAt10 * 0.2},
		// R33: 100 A at 33 kV, TMS 0.5: 10× pickup is 1000 A at 33 kV,
		// drawn at 3000 A on the 11 kV axis (winding ratio 33/11).
		{"R33 at 10× pickup, referred 33/11", phase, r33, PhaseCurve, 3000, iecSIAt10 * 0.5},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got, ok := traceOf(t, tc.chart, tc.dev, tc.kind).TimeAt(tc.currentA)
			if !ok || math.Abs(got/tc.want-1) > curveTol {
				t.Errorf("time at %g A: got %g s (drawn %v), want %g s", tc.currentA, got, ok, tc.want)
			}
		})
	}
	// Unreferred, R33's 10× point would sit at 1000 A; there the drawn
	// curve is far slower (1000 A is only 3.3× its referred pickup).
	if got, _ := traceOf(t, phase, r33, PhaseCurve).TimeAt(1000); math.Abs(got/(iecSIAt10*0.5)-1) < 0.5 {
		t.Errorf("R33 at 1000 A on the 11 kV axis: %g s, as if not referred", got)
	}
	// Below pickup the device does not operate: no line there.
	if _, ok := traceOf(t, phase, r33, PhaseCurve).TimeAt(250); ok {
		t.Errorf("R33 drawn at 250 A, below its 300 A referred pickup")
	}
	// Phase and earth apart: no ground curve on the phase chart, only
	// ground curves on the earth chart, and R33 (no ground stage) not on it.
	for _, tr := range phase.Traces() {
		if tr.Kind == GroundCurve {
			t.Errorf("a ground curve of device %d on the phase chart", tr.Device)
		}
	}
	for _, tr := range earth.Traces() {
		if tr.Kind != GroundCurve || tr.Device != r11 {
			t.Errorf("a %s curve of device %d on the earth chart", tr.Kind, tr.Device)
		}
	}
}

func TestToleranceBand(t *testing.T) {
	a := loadAtlas(t, twoVoltage, nil)
	r11, r33 := a.Device("R11"), a.Device("R33")
	var got []band
	for _, c := range a.Charts() {
		c.build()
		for _, b := range c.bands {
			if b.device == r33 {
				t.Errorf("R33 declares no accuracy but has a band")
			}
			if b.device == r11 {
				got = append(got, b)
			}
		}
	}
	if len(got) != 2 {
		t.Fatalf("R11 has %d bands, want 2 (phase on one chart, ground on the other)", len(got))
	}
	// IEC 60255-151 cl. 5.2 with "5 % or 40 ms": at 10× setting the class
	// counts once (5 % of 0.297 s = 15 ms), so the 40 ms floor governs; at
	// 2.5× it counts 2.5 times: 12.5 % of 0.760 s.
	at25 := 0.1 * 0.14 / (math.Pow(2.5, 0.02) - 1)
	for _, tc := range []struct {
		currentA, nominal, err float64
	}{
		{2000, iecSIAt10 * 0.1, 0.040},
		{500, at25, 0.125 * at25},
	} {
		lo, _ := Trace{Runs: got[0].lower}.TimeAt(tc.currentA)
		hi, _ := Trace{Runs: got[0].upper}.TimeAt(tc.currentA)
		if math.Abs(lo/(tc.nominal-tc.err)-1) > curveTol || math.Abs(hi/(tc.nominal+tc.err)-1) > curveTol {
			t.Errorf("band at %g A: %g … %g s, want %g … %g s", tc.currentA, lo, hi, tc.nominal-tc.err, tc.nominal+tc.err)
		}
	}
}

func decodePNG(t *testing.T, data []byte) image.Image {
	t.Helper()
	img, err := png.Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatalf("not a PNG: %v", err)
	}
	return img
}

// nearColour reports whether a pixel within r of (x, y) has colour want,
// within tol per channel (anti-aliasing blends a line's edge).
func nearColour(img image.Image, x, y float64, r int, want color.NRGBA, tol int) bool {
	cx, cy := int(math.Round(x)), int(math.Round(y))
	for dy := -r; dy <= r; dy++ {
		for dx := -r; dx <= r; dx++ {
			got := color.NRGBAModel.Convert(img.At(cx+dx, cy+dy)).(color.NRGBA)
			if abs(int(got.R)-int(want.R)) <= tol && abs(int(got.G)-int(want.G)) <= tol && abs(int(got.B)-int(want.B)) <= tol {
				return true
			}
		}
	}
	return false
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

func TestPixelsThroughThePlotTransform(t *testing.T) {
	a := loadAtlas(t, twoVoltage, nil)
	c := a.Charts()[0]
	var buf bytes.Buffer
	if err := c.Render(&buf, PNG, Settings{}); err != nil {
		t.Fatal(err)
	}
	img := decodePNG(t, buf.Bytes())
	if b := img.Bounds(); b.Dx() != DefaultWidthPx || b.Dy() != DefaultHeightPx {
		t.Fatalf("image %d × %d, want %d × %d", b.Dx(), b.Dy(), DefaultWidthPx, DefaultHeightPx)
	}
	r11, r33 := a.Device("R11"), a.Device("R33")
	// The curve's core is 1.7 pt ≈ 3.8 px wide at 160 dpi: a pixel of the
	// device's own colour lies within 3 px of the exact point.
	const radius, tol = 3, 12
	for _, tc := range []struct {
		name     string
		dev      int
		currentA float64
		timeS    float64
		want     bool
	}{
		{"R11 at 10× pickup", r11, 2000, iecSIAt10 * 0.1, true},
		{"R33 at 10× pickup, referred", r33, 3000, iecSIAt10 * 0.5, true},
		{"R33 where it would be unreferred", r33, 1000, iecSIAt10 * 0.5, false},
	} {
		x, y := c.Locate(Settings{}, tc.currentA, tc.timeS)
		if got := nearColour(img, x, y, radius, c.colour(tc.dev), tol); got != tc.want {
			t.Errorf("%s: device colour near pixel (%.0f, %.0f): %v, want %v", tc.name, x, y, got, tc.want)
		}
	}
}

func TestFailingPairGetsItsChart(t *testing.T) {
	// R33 at TMS 0.05 is faster than R11 at the worst fault: the pair fails.
	a := loadAtlas(t, twoVoltage, func(s string) string { return strings.Replace(s, "tms = 0.5", "tms = 0.05", 1) })
	charts := a.Charts()
	names := chartNames(charts)
	if len(charts) != 3 || names[2] != "pair-R11-under-R33" {
		t.Fatalf("charts %v, want the path's two and pair-R11-under-R33", names)
	}
	pc := charts[2]
	if pc.Failing() != 1 {
		t.Errorf("pair chart counts %d failing pairs, want 1", pc.Failing())
	}
	// The margin is the finding's, referred: R33's current at 3×.
	f := gradingFinding(a.in.Result, a.in.Study, pc.Pairs[0])
	if f == nil || f.Verdict != coord.Fail || f.Fault == nil {
		t.Fatalf("grading finding %+v, want a failing one with its fault", f)
	}
	pc.build()
	m := pc.margins[0]
	if !m.drawable || m.dA != f.Fault.DeviceA || math.Abs(m.uA/(3*f.Fault.OtherA)-1) > 1e-12 ||
		m.dS != f.Fault.DeviceS || m.uS != f.Fault.OtherS {
		t.Errorf("margin %+v, want the finding's point %+v with the upstream current ×3", m, *f.Fault)
	}
	if got := marginText(f); !strings.Contains(got, " < 0.30\u00a0s") {
		t.Errorf("margin text %q, want it to say it is below 0.30 s", got)
	}
	var buf bytes.Buffer
	if err := pc.Render(&buf, PNG, Settings{}); err != nil {
		t.Fatal(err)
	}
	img := decodePNG(t, buf.Bytes())
	// The failing bracket is drawn in the failing colour at the
	// downstream current, between the two times.
	x, y := pc.Locate(Settings{}, m.dA, math.Sqrt(math.Max(m.dS, floorS)*math.Max(m.uS, floorS)))
	if !nearColour(img, x, y, 3, failColour, 12) {
		t.Errorf("no failing colour at the bracket (%.0f, %.0f)", x, y)
	}
}

func TestSVGAndSizes(t *testing.T) {
	c := loadAtlas(t, twoVoltage, nil).Charts()[0]
	var buf bytes.Buffer
	if err := c.Render(&buf, SVG, Settings{}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), "<svg") || !strings.Contains(buf.String(), "<title>Two-voltage test · phase-fault curves · R11 → R33") {
		t.Errorf("SVG output lacks <svg> or a title naming the chart")
	}
	buf.Reset()
	if err := c.Render(&buf, PNG, Settings{WidthPx: 800, HeightPx: 600, DPI: 80}); err != nil {
		t.Fatal(err)
	}
	if b := decodePNG(t, buf.Bytes()).Bounds(); b.Dx() != 800 || b.Dy() != 600 {
		t.Errorf("image %d × %d, want 800 × 600", b.Dx(), b.Dy())
	}
	if err := c.Render(&buf, PNG, Settings{WidthPx: 100, HeightPx: 100}); err == nil {
		t.Errorf("a 100 × 100 px chart at 160 dpi was accepted")
	}
	if _, err := ParseFormat("gif"); err == nil {
		t.Errorf("ParseFormat accepted gif")
	}
}

func TestNewAtlasRejectsMismatchedInput(t *testing.T) {
	a := loadAtlas(t, twoVoltage, nil)
	in := a.in
	in.Levels = in.Levels[:1]
	if _, err := NewAtlas(in); err == nil {
		t.Errorf("one fault-level summary for two devices was accepted")
	}
	in = a.in
	in.Result = nil
	if _, err := NewAtlas(in); err == nil {
		t.Errorf("a missing check result was accepted")
	}
}

func chartNames(cs []*Chart) []string {
	out := make([]string, len(cs))
	for i, c := range cs {
		out[i] = c.Name
	}
	return out
}

// TestSVGEscapesUserText: a device name carrying markup appears escaped in
// the SVG's title (the picture's own text is outlines), and the SVG stays
// well-formed XML.
func TestSVGEscapesUserText(t *testing.T) {
	a := loadAtlas(t, twoVoltage, func(s string) string {
		return strings.Replace(s, `name = "R33"`, `name = "R33 <script>alert(1)</script> & co"`, 1)
	})
	var buf bytes.Buffer
	if err := a.Charts()[0].Render(&buf, SVG, Settings{}); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	if strings.Contains(out, "<script") || !strings.Contains(out, "&lt;script&gt;") {
		t.Errorf("device name not escaped in the SVG")
	}
	d := xml.NewDecoder(strings.NewReader(out))
	for {
		if _, err := d.Token(); err != nil {
			if err != io.EOF {
				t.Errorf("SVG is not well-formed XML: %v", err)
			}
			break
		}
	}
}
