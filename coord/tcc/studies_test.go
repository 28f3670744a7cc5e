package tcc

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"sync"
	"testing"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"tripgrade/coord"
)

// The studies every chart of which the tests below look at: both bundled
// examples and an invented 132/33/11/0.4 kV study that is not radial
// (parallel grid transformers, an 11 kV ring, an embedded generator).
const (
	kestrelPark = "../../examples/kestrel-park.toml"
	fenwickQuay = "../../examples/fenwick-quay.toml"
	saltmarsh   = "../../testdata/charts/saltmarsh.toml"
)

var allStudies = []string{kestrelPark, fenwickQuay, saltmarsh}

// atlasOnce loads each study's charts once for all the tests.
var atlasOnce = struct {
	sync.Mutex
	m map[string]*Atlas
}{m: map[string]*Atlas{}}

func studyAtlas(t *testing.T, path string) *Atlas {
	t.Helper()
	atlasOnce.Lock()
	defer atlasOnce.Unlock()
	if a, ok := atlasOnce.m[path]; ok {
		return a
	}
	a := loadAtlas(t, path, nil)
	atlasOnce.m[path] = a
	return a
}

func chartNamed(t *testing.T, a *Atlas, name string) *Chart {
	t.Helper()
	for _, c := range a.Charts() {
		if c.Name == name {
			return c
		}
	}
	t.Fatalf("no chart %s among %v", name, chartNames(a.Charts()))
	return nil
}

func (a *Atlas) deviceNames(devs []int) string { return strings.Join(a.names(devs), ",") }

func TestPhaseAndEarthApart(t *testing.T) {
	for _, path := range allStudies {
		a := studyAtlas(t, path)
		for _, c := range a.Charts() {
			for _, tr := range c.Traces() {
				ground := tr.Kind == GroundCurve
				if tr.Kind == SeenCurve {
					continue // the upstream curve as the worst fault sees it may be of either
				}
				if ground != (c.Kind == coord.Residual) {
					t.Errorf("%s: %s: a %s curve of %s", path, c.Name, tr.Kind, a.in.Study.Devices[tr.Device].Name)
				}
			}
			if c.Kind != coord.Residual {
				continue
			}
			// An earth chart holds only ground stages that residual current
			// reaches, and no transformer between two of them stops
			// zero-sequence current.
			for k, i := range c.Devices {
				if !a.seesResidual(i) {
					t.Errorf("%s: %s: %s sees no residual current", path, c.Name, a.in.Study.Devices[i].Name)
				}
				if k > 0 && a.zeroBlocked(i, c.Devices[k-1]) {
					t.Errorf("%s: %s: a delta winding lies between %s and %s", path, c.Name,
						a.in.Study.Devices[c.Devices[k-1]].Name, a.in.Study.Devices[i].Name)
				}
			}
		}
	}
}

// TestEarthChartsStopAtDeltaWindings: in the 132/33/11 kV study the
// YNd1 grid transformers and the Dyn11 primary transformer cut every path
// into earth-fault parts per voltage, and the 33 kV incomers, whose delta
// windings give no residual current (the 33 kV earth is a zig-zag on the
// busbar), are left off with a word in the key.
func TestEarthChartsStopAtDeltaWindings(t *testing.T) {
	a := studyAtlas(t, saltmarsh)
	var got []string
	for _, c := range a.Charts() {
		if c.Kind == coord.Residual && c.pair == nil {
			got = append(got, a.deviceNames(c.Devices))
		}
	}
	want := []string{"RA,PT-LV", "PT-HV,L33-R", "GT1-HV", "GT2-HV", "RB,PT-LV", "GF,PT-LV"}
	if !equalSets(got, want) {
		t.Errorf("earth charts %v, want %v", got, want)
	}
	c := chartNamed(t, a, "path-PT-HV--L33-R-earth")
	if len(c.spec.absent) != 1 || a.in.Study.Devices[c.spec.absent[0]].Name != "GT1-LV" {
		t.Errorf("absent from %s: %v, want GT1-LV", c.Name, a.names(c.spec.absent))
	}
}

func equalSets(a, b []string) bool {
	a, b = slices.Clone(a), slices.Clone(b)
	slices.Sort(a)
	slices.Sort(b)
	return slices.Equal(a, b)
}

// TestPathsSplitAtTransformers: a path that would need more than four
// decades on one axis is split at a transformer, each part referred to its
// own voltage (by winding ratios: 0.433 kV behind an 11/0.433 kV unit),
// and no phase chart holding a transformer between two of its devices
// spans more.
func TestPathsSplitAtTransformers(t *testing.T) {
	cases := []struct {
		study, chart string
		refKV        float64
	}{
		{kestrelPark, "path-ML-LV-FUSE--ML-TX-FUSE", 0.433},
		{kestrelPark, "path-ML-TX-FUSE--ML-R--F1--T1-LV--T1-HV", 11},
		{saltmarsh, "path-LV-FUSE--SS-FUSE--RA--PT-LV--PT-HV", 0.433},
		{saltmarsh, "path-PT-HV--L33-R--GT1-LV--GT1-HV", 33},
	}
	for _, tc := range cases {
		c := chartNamed(t, studyAtlas(t, tc.study), tc.chart)
		if got := c.RefKV(); math.Abs(got/tc.refKV-1) > 1e-12 {
			t.Errorf("%s: RefKV %g, want %g", tc.chart, got, tc.refKV)
		}
	}
	for _, path := range allStudies {
		a := studyAtlas(t, path)
		for _, c := range a.Charts() {
			lo, hi := c.CurrentRange()
			if c.Kind != coord.Phase || c.pair != nil || math.Log10(hi/lo) <= maxDecades+1e-9 {
				continue
			}
			for k := 1; k < len(c.Devices); k++ {
				if len(a.transformersBetween(c.Devices[k], c.Devices[k-1])) > 0 {
					t.Errorf("%s: %s spans %.0f decades with a transformer inside", path, c.Name, math.Log10(hi/lo))
				}
			}
		}
	}
}

// TestReferredByWindingRatios: ML-TX-FUSE (11 kV) on the 0.433 kV chart is
// drawn at its current × 11/0.433, the transformer's rated winding ratio,
// not × 11/0.4, the ratio of the buses' nominal voltages; the axis says so.
func TestReferredByWindingRatios(t *testing.T) {
	a := studyAtlas(t, kestrelPark)
	c := chartNamed(t, a, "path-ML-LV-FUSE--ML-TX-FUSE")
	if got, want := c.axisLabel(), "current (A at 0.433 kV, referred by winding ratios)"; got != want {
		t.Errorf("axis %q, want %q", got, want)
	}
	fuse := a.Device("ML-TX-FUSE")
	// The fuse's clearing curve is a straight line in log–log between its
	// table points (250 A, 1.3 s) and (400 A, 0.28 s): at 300 A,
	t300 := math.Exp(math.Log(1.3) + math.Log(300.0/250)/math.Log(400.0/250)*math.Log(0.28/1.3))
	if tb, _ := a.in.Study.Devices[fuse].Clear.Time(300); math.Abs(tb/t300-1) > 1e-12 {
		t.Fatalf("the fuse table gives %g s at 300 A, the test expects %g s", tb, t300)
	}
	tr := traceOf(t, c, fuse, ClearCurve)
	if got, _ := tr.TimeAt(300 * 11 / 0.433); math.Abs(got/t300-1) > 1e-9 {
		t.Errorf("clearing time at 300 A × 11/0.433 on the axis: %g s, want %g s", got, t300)
	}
	if got, _ := tr.TimeAt(300 * 11 / 0.4); math.Abs(got/t300-1) < 0.05 {
		t.Errorf("clearing time at 300 A × 11/0.4 on the axis: %g s, as if referred by nominal voltages", got)
	}
}

// TestDistinctLooks: no two devices with a curve on one chart share both
// colour and line pattern, and each device keeps its colour on every
// chart (these studies draw few enough devices together for that).
func TestDistinctLooks(t *testing.T) {
	for _, path := range allStudies {
		a := studyAtlas(t, path)
		colour := map[int]int{}
		for _, c := range a.Charts() {
			seen := map[Style]int{}
			members := c.spec.members(a)
			for _, i := range members {
				st, ok := c.Looks()[i]
				if !ok {
					t.Errorf("%s: %s: device %s has no look", path, c.Name, a.in.Study.Devices[i].Name)
					continue
				}
				if j, dup := seen[st]; dup {
					t.Errorf("%s: %s: %s and %s both look %+v", path, c.Name, a.in.Study.Devices[j].Name, a.in.Study.Devices[i].Name, st)
				}
				seen[st] = i
				if k, ok := colour[i]; ok && k != st.Colour {
					t.Errorf("%s: %s: %s changes colour from chart to chart", path, c.Name, a.in.Study.Devices[i].Name)
				}
				colour[i] = st.Colour
			}
			if len(members) <= len(deviceColours) {
				cols := map[int]bool{}
				for _, i := range members {
					cols[c.Looks()[i].Colour] = true
				}
				if len(cols) != len(members) {
					t.Errorf("%s: %s: %d devices share %d colours though the palette has %d", path, c.Name, len(members), len(cols), len(deviceColours))
				}
			}
		}
	}
}

// TestChartLooksSettleConflicts: when the study-wide looks repeat within
// a chart (more devices drawn together than the study-wide assignment
// could keep apart), the chart gives the later device another.
func TestChartLooksSettleConflicts(t *testing.T) {
	a := loadAtlas(t, twoVoltage, nil)
	for i := range a.slots {
		a.slots[i] = 0
	}
	c := a.Charts()[0]
	l := c.Looks()
	if l[a.Device("R11")] == l[a.Device("R33")] {
		t.Errorf("R11 and R33 both look %+v", l[a.Device("R11")])
	}
}

// TestBracketsSitWhereTheCheckFoundThem: on every chart, each margin's
// bracket runs from the downstream device's drawn curve to an upstream
// curve drawn through its top: the upstream device's own, or, where it
// sees another current at that fault, its curve as that fault sees it.
func TestBracketsSitWhereTheCheckFoundThem(t *testing.T) {
	// Curves are joined samples, 160 per decade; the grading check's times
	// are the curves' own. Smooth curves agree to far better than this;
	// a point next to a stage's step may not, and is left out.
	const tol = 2e-3
	for _, path := range allStudies {
		a := studyAtlas(t, path)
		checked := 0
		for _, c := range a.Charts() {
			c.build()
			for _, m := range c.margins {
				if !m.drawable || m.dS < floorS || m.uS < floorS || !c.within(m.dA) {
					continue
				}
				name := fmt.Sprintf("%s: %s: %s over %s", path, c.Name,
					a.in.Study.Devices[m.pair.Upstream].Name, a.in.Study.Devices[m.pair.Downstream].Name)
				down := c.drawnCurve(m.pair.Downstream, m.f.Fault.DeviceQty)
				if got, ok := down.TimeAt(m.dA); ok && !nearStep(down, m.dA) && math.Abs(got/m.dS-1) > tol {
					t.Errorf("%s: the downstream curve is at %g s at the bracket, the finding says %g s", name, got, m.dS)
				}
				up, seen := c.upperCurve(m)
				got, ok := up.TimeAt(m.dA)
				if !ok {
					t.Errorf("%s: no upstream curve through the bracket's top (seen curve %v)", name, seen)
					continue
				}
				if !nearStep(up, m.dA) && math.Abs(got/m.uS-1) > tol {
					t.Errorf("%s: the upstream curve is at %g s at the bracket, the finding says %g s (seen curve %v)", name, got, m.uS, seen)
				}
				checked++
			}
		}
		t.Logf("%s: %d brackets checked", path, checked)
		if checked == 0 {
			t.Errorf("%s: no bracket checked", path)
		}
	}
}

// drawnCurve returns the trace that times device i at a current of kind q
// on chart c: a fuse's clearing curve, a relay's curve of the chart's kind.
func (c *Chart) drawnCurve(i int, q coord.Quantity) Trace {
	kind := PhaseCurve
	switch {
	case c.atlas.in.Study.Devices[i].Kind == coord.Fuse:
		kind = ClearCurve
	case q == coord.Residual:
		kind = GroundCurve
	}
	for _, tr := range c.traces {
		if tr.Device == i && tr.Kind == kind {
			return tr
		}
	}
	return Trace{}
}

// upperCurve returns the curve a margin's bracket top should lie on.
func (c *Chart) upperCurve(m margin) (Trace, bool) {
	for _, s := range c.seen {
		if s.pair == m.pair {
			return s.trace, true
		}
	}
	u := m.pair.Upstream
	if c.atlas.in.Study.Devices[u].Kind == coord.Fuse {
		for _, tr := range c.traces {
			if tr.Device == u && tr.Kind == MeltCurve {
				return tr, false
			}
		}
	}
	return c.drawnCurve(u, m.f.Fault.OtherQty), false
}

// nearStep reports whether a trace changes by more than a factor 1.5
// within 2 % of current around a: a definite-time step or a pickup.
func nearStep(tr Trace, a float64) bool {
	lo, ok1 := tr.TimeAt(a / 1.02)
	hi, ok2 := tr.TimeAt(a * 1.02)
	return !ok1 || !ok2 || lo/hi > 1.5
}

// TestDeltaStarFactorVisible: at Fenwick Quay the incomer and the
// transformer's HV relay fail their margin at an 11 kV phase-to-phase
// fault, where the HV relay sees 2/√3 of the incomer's current referred by
// the winding ratio (a delta–star fact: IEEE Std 242 ch. 15, the IEEE
// C37.91 current-distribution tables; faults/transformer_test.go checks
// the engine against it). The pair's chart draws the HV relay's curve for
// that fault, labelled with the factor, through the bracket's top.
func TestDeltaStarFactorVisible(t *testing.T) {
	a := studyAtlas(t, fenwickQuay)
	c := chartNamed(t, a, "pair-INC-under-T1-HV")
	c.build()
	if len(c.seen) != 1 {
		t.Fatalf("%d curves as seen at the worst fault, want 1 (T1-HV)", len(c.seen))
	}
	s := c.seen[0]
	if math.Abs(s.factor/(2/math.Sqrt(3))-1) > 0.01 {
		t.Errorf("factor %g, want 2/√3 = %g within 1 %%", s.factor, 2/math.Sqrt(3))
	}
	if want := "T1-HV at LL faults: I × 2/√3"; s.label != want {
		t.Errorf("label %q, want %q", s.label, want)
	}
	m := c.margins[0]
	if got, _ := s.trace.TimeAt(m.dA); math.Abs(got/m.f.Fault.OtherS-1) > 1e-3 {
		t.Errorf("the seen curve is at %g s at the bracket, the finding says T1-HV operates in %g s", got, m.f.Fault.OtherS)
	}
}

// TestOnlyThePathsOwnEquipment: a path's charts show the inrush and damage
// curves of the transformers and cables on it, never those of another
// feeder.
func TestOnlyThePathsOwnEquipment(t *testing.T) {
	a := studyAtlas(t, kestrelPark)
	cases := []struct {
		chart     string
		want, not []string
	}{
		{"path-QR-R--F2--T1-LV--T1-HV", []string{"inrush T1 ", "T1 C57.109"}, []string{"ML-TX", "WK-TX", "F1-CABLE", "F3-", "F4-"}},
		{"path-ML-TX-FUSE--ML-R--F1--T1-LV--T1-HV", []string{"inrush ML-TX ", "inrush T1 ", "ML-TX C57.109", "F1-CABLE"}, []string{"WK-TX", "F2-", "F3-", "F4-", "T2"}},
		{"path-WK-HV--F4--T1-LV--T1-HV", []string{"inrush WK-TX ", "WK-TX C57.109", "F4-CABLE"}, []string{"ML-TX", "F1-", "F2-", "F3-"}},
	}
	for _, tc := range cases {
		c := chartNamed(t, a, tc.chart)
		c.build()
		var texts []string
		for _, m := range c.inrush {
			texts = append(texts, m.label)
		}
		for _, d := range c.damages {
			texts = append(texts, d.label)
		}
		all := strings.Join(texts, "; ")
		for _, w := range tc.want {
			if !strings.Contains(all, w) {
				t.Errorf("%s: %q lacks %q", tc.chart, all, w)
			}
		}
		for _, n := range tc.not {
			if strings.Contains(all, n) {
				t.Errorf("%s: %q shows %q, not on the path", tc.chart, all, n)
			}
		}
	}
}

// TestNoneIsNotALevel: a current of 0, or a residue far below the largest,
// is "none": no level line, no label, no stretch of the axis.
func TestNoneIsNotALevel(t *testing.T) {
	clean := loadAtlas(t, twoVoltage, nil)
	r11 := clean.Device("R11")
	for _, residue := range []float64{0, 4.81e-12} {
		a := loadAtlas(t, twoVoltage, nil)
		a.in.Levels[r11].ResidualMin.A = residue
		c := a.Charts()[1]
		if c.Kind != coord.Residual {
			t.Fatalf("chart %s is not the earth chart", c.Name)
		}
		lo, _ := c.CurrentRange()
		cleanLo, _ := clean.Charts()[1].CurrentRange()
		if lo != cleanLo || lo < 1 {
			t.Errorf("residue %g A: the axis starts at %g A, want %g A as without it", residue, lo, cleanLo)
		}
		if got := c.ownLevels(r11); strings.Contains(got, "min") || strings.Contains(got, "e-") {
			t.Errorf("residue %g A: the key says %q", residue, got)
		}
		for _, l := range c.levels {
			if !l.max {
				t.Errorf("residue %g A: a minimum level at %g A is drawn", residue, l.a)
			}
		}
	}
	if got := fmtA(0); got != "none" {
		t.Errorf("fmtA(0) = %q, want none", got)
	}
	if got := fmtA(math.NaN()); got != "none" {
		t.Errorf("fmtA(NaN) = %q, want none", got)
	}
}

// TestSettingsNeverRunTogether: a setting's figure and unit are joined by
// a no-break space that the font draws as a space, so "200 A TMS 0.1"
// neither wraps inside a setting nor closes up to "200ATMS".
func TestSettingsNeverRunTogether(t *testing.T) {
	a := loadAtlas(t, twoVoltage, nil)
	d := &a.in.Study.Devices[a.Device("R11")]
	lines := settingsLines(d, coord.Phase, coord.Forward)
	if want := nb("51 iec-si") + " " + nb("200 A") + " " + nb("TMS 0.1"); !strings.Contains(lines[0], nb("200 A")) || !strings.Contains(lines[0], nb("TMS 0.1")) {
		t.Errorf("settings %q, want figures and units joined as in %q", lines[0], want)
	}
	sty := textStyle(panelTextSize, inkColour, false)
	// Widths from a narrow key column to a wide one; every setting fits
	// in each.
	for _, width := range []vg.Length{60, 75, 90, 120, 150} {
		for _, l := range wrap(lines[0]+" · "+lines[1], sty, width) {
			if strings.HasSuffix(l, "200") || strings.HasPrefix(l, "A ") || strings.HasSuffix(l, "TMS") {
				t.Errorf("width %g: line %q breaks inside a setting", width, l)
			}
		}
	}
	if with, without := sty.Width("200\u00a0A"), sty.Width("200A"); !(with > without+sty.Width("0")/4) {
		t.Errorf("a no-break space is %g pt wide, want a space's width", with-without)
	}
}

// renderInk draws chart c at size s and returns the box of every text
// drawn on the page, the page and the plot's data area.
func renderInk(c *Chart, s Settings) (ink []inkBox, page, data vg.Rectangle) {
	s = s.norm()
	w, h := s.size()
	cv := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(s.DPI))
	rec := &inkRecorder{}
	c.build()
	c.drawAll(draw.New(outlined{CanvasSizer: cv, ink: rec}))
	_, plotArea, _, _ := regions(pageAt(s))
	return rec.boxes, vg.Rectangle{Max: vg.Point{X: w, Y: h}}, c.frame(plotArea).data.Rectangle
}

// inside reports whether r lies within area, to a hundredth of a point.
func inside(r, area vg.Rectangle) bool {
	const eps = 0.01
	return r.Min.X >= area.Min.X-eps && r.Max.X <= area.Max.X+eps && r.Min.Y >= area.Min.Y-eps && r.Max.Y <= area.Max.Y+eps
}

// strictlyOverlap reports whether two boxes share more than a hundredth
// of a point each way.
func strictlyOverlap(a, b vg.Rectangle) bool {
	const eps = 0.01
	return a.Min.X < b.Max.X-eps && b.Min.X < a.Max.X-eps && a.Min.Y < b.Max.Y-eps && b.Min.Y < a.Max.Y-eps
}

// TestLabelsNeverOverlap draws every chart of the three studies and
// checks the text actually drawn: no text covers another anywhere on the
// page, none leaves the page, and every text on the plot lies inside the
// plot's data area. It checks the layout too: no label box covers another
// or a margin's bracket, its ring, an inrush mark or a level's ring.
func TestLabelsNeverOverlap(t *testing.T) {
	if testing.Short() {
		t.Skip("draws every chart")
	}
	for _, path := range allStudies {
		a := studyAtlas(t, path)
		for _, c := range a.Charts() {
			ink, page, data := renderInk(c, Settings{})
			for k, b := range ink {
				if !inside(b.box, page) {
					t.Errorf("%s: %s: %q leaves the page (%v)", path, c.Name, b.text, b.box)
				}
				ctr := vg.Point{X: (b.box.Min.X + b.box.Max.X) / 2, Y: (b.box.Min.Y + b.box.Max.Y) / 2}
				if ctr.X > data.Min.X && ctr.X < data.Max.X && ctr.Y > data.Min.Y && ctr.Y < data.Max.Y && !inside(b.box, data) {
					t.Errorf("%s: %s: %q crosses the edge of the plot", path, c.Name, b.text)
				}
				for _, o := range ink[:k] {
					if strictlyOverlap(b.box, o.box) {
						t.Errorf("%s: %s: %q covers %q", path, c.Name, b.text, o.text)
					}
				}
			}
			lay := c.labelLayout(Settings{})
			for k, p := range lay.placed {
				if !inside(p.box, lay.area) {
					t.Errorf("%s: %s: label %q leaves the data area", path, c.Name, p.lines)
				}
				for _, o := range lay.placed[:k] {
					if strictlyOverlap(p.box, o.box) {
						t.Errorf("%s: %s: label %q covers %q", path, c.Name, p.lines, o.lines)
					}
				}
				for _, m := range lay.obstacles {
					if strictlyOverlap(p.box, m) {
						t.Errorf("%s: %s: label %q covers a mark at %v", path, c.Name, p.lines, m)
					}
				}
			}
		}
	}
}

// TestLongTitlesFit: a study name too long for the header is set smaller
// and cut short rather than run into the verdict or off the page.
func TestLongTitlesFit(t *testing.T) {
	long := strings.Repeat("Very long substation name ", 8)
	a := loadAtlas(t, twoVoltage, func(s string) string {
		return strings.Replace(strings.Replace(s, `name = "Two-voltage test"`, `name = "`+long+`"`, 1), "tms = 0.5", "tms = 0.05", 1)
	})
	for _, c := range a.Charts() {
		ink, page, _ := renderInk(c, Settings{WidthPx: 800, HeightPx: 600, DPI: 100})
		var title, verdict *inkBox
		for k := range ink {
			b := &ink[k]
			if !inside(b.box, page) {
				t.Errorf("%s: %q leaves the page", c.Name, b.text)
			}
			if strings.HasPrefix(b.text, "Very long") {
				title = b
			}
			if strings.HasPrefix(b.text, "grading:") {
				verdict = b
			}
		}
		if title == nil || !strings.HasSuffix(title.text, "…") {
			t.Errorf("%s: title %v, want it cut short with …", c.Name, title)
		}
		if title != nil && verdict != nil && strictlyOverlap(title.box, verdict.box) {
			t.Errorf("%s: the title runs into %q", c.Name, verdict.text)
		}
	}
}

// TestGlyphsOfEveryLabel: the font has a glyph for every character the
// charts write (a missing one would be drawn as an empty box).
func TestGlyphsOfEveryLabel(t *testing.T) {
	for _, bold := range []bool{false, true} {
		sty := textStyle(textSize, inkColour, bold)
		face := sty.Handler.Cache().Lookup(sty.Font, sty.Font.Size)
		for _, r := range "→–·≥<−√×²…\u00a0\u2009Ω°" {
			if idx, err := face.Face.GlyphIndex(nil, r); err != nil || idx == 0 {
				t.Errorf("bold %v: no glyph for %q (U+%04X)", bold, r, r)
			}
		}
	}
}

// TestNeutralCTOnItsWindingsEarthChart: a standby earth-fault stage on a
// transformer's neutral CT (Kestrel Park's T1-HV, 51NS) measures the
// neutral current of the 11 kV winding, so it is drawn on the 11 kV
// earth-fault charts with the relays it backs up, unreferred, and its
// fault levels are neutral currents: for an earth fault on the 11 kV
// busbar the two identical units in parallel each carry half of the fault
// current a feeder sees close in (the current divider), and its curve
// there gives the IEC 60255-151 standard inverse time, 0.6 × 0.14 /
// ((I/60)^0.02 − 1).
func TestNeutralCTOnItsWindingsEarthChart(t *testing.T) {
	a := studyAtlas(t, kestrelPark)
	hv, lv, f1 := a.Device("T1-HV"), a.Device("T1-LV"), a.Device("F1")
	charts := 0
	for _, c := range a.Charts() {
		if c.Kind != coord.Residual || !slices.Contains(c.Devices, hv) {
			continue
		}
		charts++
		if got := c.axisLabel(); got != "current (A at 11 kV)" {
			t.Errorf("%s: axis %q, want the 11 kV winding's unreferred", c.Name, got)
		}
		if !slices.Contains(c.Devices, lv) {
			t.Errorf("%s: T1-HV's standby earth fault drawn without the LV incomer it backs up: %s", c.Name, a.deviceNames(c.Devices))
		}
	}
	if charts == 0 {
		t.Fatal("T1-HV's neutral-CT stage is on no earth-fault chart")
	}
	c := chartNamed(t, a, "path-ML-R--F1--T1-LV--T1-HV-earth")
	c.build()
	maxOf := func(dev int) float64 {
		for _, l := range c.levels {
			if l.device == dev && l.max {
				return l.a
			}
		}
		t.Fatalf("%s: no maximum level of %s", c.Name, a.in.Study.Devices[dev].Name)
		return 0
	}
	neutral, bus := maxOf(hv), maxOf(f1)
	if math.Abs(neutral/(bus/2)-1) > 1e-9 {
		t.Errorf("T1-HV's largest neutral current %.6g A, want half of F1's close-in earth fault, %.6g A", neutral, bus/2)
	}
	want := 0.6 * 0.14 / (math.Pow(neutral/60, 0.02) - 1)
	// The trace is sampled and interpolated between its samples.
	if got, _ := traceOf(t, c, hv, GroundCurve).TimeAt(neutral); math.Abs(got/want-1) > 1e-3 {
		t.Errorf("T1-HV's 51NS at %.1f A on the axis: %.6g s, want %.6g s", neutral, got, want)
	}
}
