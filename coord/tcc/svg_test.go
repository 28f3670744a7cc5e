package tcc

import (
	"bytes"
	"image"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

// rsvgConvert returns the path of rsvg-convert (Debian package
// librsvg2-bin), an SVG renderer independent of ours. Without it the SVG
// tests are skipped, unless TRIPGRADE_REQUIRE_RSVG is set (CI sets it).
func rsvgConvert(t *testing.T) string {
	t.Helper()
	bin, err := exec.LookPath("rsvg-convert")
	if err != nil {
		if os.Getenv("TRIPGRADE_REQUIRE_RSVG") != "" {
			t.Fatalf("rsvg-convert is required (TRIPGRADE_REQUIRE_RSVG is set): %v", err)
		}
		t.Skip("rsvg-convert not found (Debian: apt-get install librsvg2-bin)")
	}
	return bin
}

// fontless returns an environment in which fontconfig finds no font at
// all: a machine without our typeface, or any other.
func fontless(t *testing.T) []string {
	t.Helper()
	dir := t.TempDir()
	conf := filepath.Join(dir, "fonts.conf")
	const doc = `<?xml version="1.0"?>
<!DOCTYPE fontconfig SYSTEM "fonts.dtd">
<fontconfig><cachedir>` + "CACHE" + `</cachedir></fontconfig>
`
	text := bytes.ReplaceAll([]byte(doc), []byte("CACHE"), []byte(filepath.Join(dir, "cache")))
	if err := os.WriteFile(conf, text, 0o644); err != nil {
		t.Fatal(err)
	}
	return append(os.Environ(), "FONTCONFIG_FILE="+conf, "HOME="+dir, "XDG_CACHE_HOME="+filepath.Join(dir, "cache"))
}

// rasterise renders an SVG with rsvg-convert at the chart's default pixel
// size, on a machine without fonts.
func rasterise(t *testing.T, bin string, svg []byte) image.Image {
	t.Helper()
	dir := t.TempDir()
	in, out := filepath.Join(dir, "chart.svg"), filepath.Join(dir, "chart.png")
	if err := os.WriteFile(in, svg, 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(bin, "-w", "1600", "-h", "1200", "-f", "png", "-o", out, in)
	cmd.Env = fontless(t)
	if msg, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("rsvg-convert: %v: %s", err, msg)
	}
	data, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	return decodePNG(t, data)
}

// pixelDiff compares two images of one size: the mean absolute difference
// of the colour channels (0–255) and the share of pixels where a channel
// differs by more than a quarter of its range.
func pixelDiff(t *testing.T, a, b image.Image) (mean, far float64) {
	t.Helper()
	if a.Bounds() != b.Bounds() {
		t.Fatalf("sizes differ: %v and %v", a.Bounds(), b.Bounds())
	}
	r := a.Bounds()
	var sum float64
	var n, nFar int
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			r1, g1, b1, _ := a.At(x, y).RGBA()
			r2, g2, b2, _ := b.At(x, y).RGBA()
			d := max(absDiff(r1, r2), absDiff(g1, g2), absDiff(b1, b2)) >> 8
			sum += float64(d)
			if d > 64 {
				nFar++
			}
			n++
		}
	}
	return sum / float64(n), float64(nFar) / float64(n)
}

func absDiff(a, b uint32) uint32 {
	if a > b {
		return a - b
	}
	return b - a
}

// The tolerances of the comparison: two renderers anti-alias edges
// differently (gonum/plot's rasteriser for the PNG, librsvg and cairo for
// the SVG), which moves a pixel's value along every line and glyph edge
// by a little and a handful of pixels by more. Measured on these charts:
// a mean of about 0.26 and about 0.01 % of pixels beyond a quarter of the
// range. A missing or moved text, a clipped title or a curve drawn
// elsewhere exceeds both by far.
const (
	maxMeanDiff = 1.0
	maxFarShare = 0.001
)

// svgSamples are charts with every kind of mark: fuses across a
// transformer, a failing ringed bracket with a curve seen at its fault,
// an earth chart, a crowded four-level chart.
var svgSamples = []struct{ study, chart string }{
	{kestrelPark, "path-ML-LV-FUSE--ML-TX-FUSE"},
	{fenwickQuay, "pair-INC-under-T1-HV"},
	{fenwickQuay, "path-MA-R--FM--INC-earth"},
	{saltmarsh, "path-LV-FUSE--SS-FUSE--RA--PT-LV--PT-HV"},
}

// TestSVGRendersAnywhere: each sample chart's SVG, rendered by rsvg-convert
// on a machine with no fonts at all, matches our PNG of the same chart
// within the pixel tolerance: its text is outlines and needs no font.
func TestSVGRendersAnywhere(t *testing.T) {
	bin := rsvgConvert(t)
	for _, sm := range svgSamples {
		t.Run(sm.chart, func(t *testing.T) {
			c := chartNamed(t, studyAtlas(t, sm.study), sm.chart)
			var pngBuf, svgBuf bytes.Buffer
			if err := c.Render(&pngBuf, PNG, Settings{}); err != nil {
				t.Fatal(err)
			}
			if err := c.Render(&svgBuf, SVG, Settings{}); err != nil {
				t.Fatal(err)
			}
			if bytes.Contains(svgBuf.Bytes(), []byte("<text")) {
				t.Errorf("the SVG holds <text> elements, which need a font where it is shown")
			}
			mean, far := pixelDiff(t, decodePNG(t, pngBuf.Bytes()), rasterise(t, bin, svgBuf.Bytes()))
			t.Logf("mean difference %.3f, %.4f %% of pixels far off", mean, 100*far)
			if mean > maxMeanDiff || far > maxFarShare {
				t.Errorf("the SVG as rsvg-convert draws it differs from the PNG: mean %.3f (limit %g), %.4f %% far off (limit %g %%)",
					mean, maxMeanDiff, 100*far, 100*maxFarShare)
			}
		})
	}
}

// TestSVGComparisonSeesText: the same comparison fails for an SVG that
// leaves its text to the viewer's fonts (gonum/plot's own <text>
// elements), so the test above would notice text that does not travel.
func TestSVGComparisonSeesText(t *testing.T) {
	bin := rsvgConvert(t)
	sm := svgSamples[1]
	c := chartNamed(t, studyAtlas(t, sm.study), sm.chart)
	var pngBuf, svgBuf bytes.Buffer
	if err := c.Render(&pngBuf, PNG, Settings{}); err != nil {
		t.Fatal(err)
	}
	w, h := Settings{}.norm().size()
	cv := vgsvg.New(w, h)
	c.drawAll(draw.New(cv)) // text as <text>, in whatever font the viewer has
	if _, err := cv.WriteTo(&svgBuf); err != nil {
		t.Fatal(err)
	}
	mean, far := pixelDiff(t, decodePNG(t, pngBuf.Bytes()), rasterise(t, bin, svgBuf.Bytes()))
	t.Logf("with <text>: mean difference %.3f, %.4f %% of pixels far off", mean, 100*far)
	if mean <= maxMeanDiff && far <= maxFarShare {
		t.Errorf("an SVG with <text> on a machine without fonts passed the comparison (mean %.3f, %.4f %% far off)", mean, 100*far)
	}
}

// TestSVGIsDeterministic: the same chart gives the same bytes twice.
func TestSVGIsDeterministic(t *testing.T) {
	c := chartNamed(t, studyAtlas(t, fenwickQuay), "pair-INC-under-T1-HV")
	var a, b bytes.Buffer
	if err := c.Render(&a, SVG, Settings{}); err != nil {
		t.Fatal(err)
	}
	if err := c.Render(&b, SVG, Settings{}); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Errorf("two renderings of one chart differ")
	}
}
