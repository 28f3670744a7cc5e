package coord_test

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/curves"
	"tripgrade/faults"
)

// The discrimination tests run coord.Check on small invented studies
// under testdata/discrimination and compare the fault-by-fault findings
// with testdata/discrimination/handcheck.py, which solves each network by
// symmetrical components on its own, times each relay by the IEC
// 60255-151 standard-inverse formula t = TMS·0.14/((I/Is)^0.02 − 1) (or its
// definite time), and follows each fault's sequential clearing: the devices
// that must clear it (the nearest that operates on every side feeding it)
// open in time order, the network is solved again after each opening, and
// an inverse-time relay integrates dt/t(I) over the steps (from memory:
// the usual model of an inverse timer under a varying current; the
// checker states the same assumption). The margin asked between devices is
// the studies' 0.3 s (Blackburn & Domin §12.3.4: 0.3 s frequent).

const discriminationDir = "../testdata/discrimination/"

// margin0 is the agreement asked of two figures that the physics makes
// equal (two devices carrying the same current through a busbar with no
// other infeed): rounding only.
const margin0 = 1e-9

// checkWorst compares a device's discrimination finding with the script's
// worst margin under key (put_worst in handcheck.py): the margin, and the
// figures of the fault the checker names, which must be one of the
// faults that give the worst margin.
func checkWorst(t *testing.T, s *coord.Study, f coord.Finding, key string) {
	t.Helper()
	if !agrees(f.Measured, hand(t, key+".worst")) || f.Required != 0.3 {
		t.Errorf("%s: margin %.6g s ≥ %g s, script %.6g s ≥ 0.3 s", f.Device, f.Measured, f.Required, hand(t, key+".worst"))
	}
	if f.Fault == nil {
		t.Fatalf("%s: no fault behind the figure", f.Device)
	}
	at := fmt.Sprintf("%s|%s|%s|%s", key, f.Fault.Place, f.Fault.Case, f.Fault.Kind)
	if _, ok := handFigures[at+".margin"]; !ok {
		t.Fatalf("%s: worst at %s %s @ %s, which is not a fault of the script's worst margin", f.Device, f.Fault.Kind, f.Fault.Case, f.Fault.Place)
	}
	if want := s.Devices[int(hand(t, at+".other"))].Name; f.Other != want {
		t.Errorf("%s: must clear %s, script %s", f.Device, f.Other, want)
	}
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"its current (A)", f.Fault.DeviceA, hand(t, at+".A")},
		{"its time (s)", f.Fault.DeviceS, hand(t, at+".s")},
		{"the must-clear device's current (A)", f.Fault.OtherA, hand(t, at+".otherA")},
		{"the must-clear device's time (s)", f.Fault.OtherS, hand(t, at+".otherS")},
	} {
		if !agrees(c.got, c.want) {
			t.Errorf("%s at %s %s @ %s: %s %.6g, script %.6g", f.Device, f.Fault.Kind, f.Fault.Case, f.Fault.Place, c.what, c.got, c.want)
		}
	}
}

// noFailures fails the test for every failing finding of a result.
func noFailures(t *testing.T, r *coord.Result) {
	t.Helper()
	for _, f := range r.Findings {
		if f.Verdict == coord.Fail {
			t.Errorf("unexpected failure: %s %s (%s): %g %s %g; %s", f.Check, f.Device, f.Other, f.Measured, f.Relation, f.Required, f.Note)
		}
	}
}

// TestGeneratorSympatheticTrip: at Bracken Fold (generator-feeder.toml) the
// 4 MVA generator at the end of the Gorse Nook line feeds a fault on the
// Ash Vale cable through the Gorse Nook relay RG, from its branch into its
// bus. RG is non-directional, set at 250 A TMS 0.05: for the close-in
// three-phase fault on the cable at BF-11 (the worst, script) it carries
// 1129.7 A (the generator's share with IEC 60909-0's K_G) and operates in
// 0.05·0.14/((1129.7/250)^0.02 − 1) = 0.229 s, before Ash Vale's RA
// (15024 A, 400 A TMS 0.2: 0.372 s): a FAIL of the discrimination check
// naming RG, 0.144 s early against the 0.3 s it should wait. With its phase
// stage directional, looking forward into its own line, the generator's
// current is reverse for it (the script's element decides reverse) and the
// finding is gone.
func TestGeneratorSympatheticTrip(t *testing.T) {
	path := discriminationDir + "generator-feeder.toml"
	s := loadVariant(t, path)
	r := checkStudy(t, s)
	f := oneFinding(t, r, coord.Discrimination, "RG")
	if f.Verdict != coord.Fail || f.Other != "RA" {
		t.Fatalf("RG: %s, must clear %q; want FAIL naming RA", f.Verdict, f.Other)
	}
	if !agrees(f.Measured, hand(t, "gen.non.worst.margin")) || f.Required != 0.3 {
		t.Errorf("margin %.6g s ≥ %g s, script %.6g s ≥ 0.3 s", f.Measured, f.Required, hand(t, "gen.non.worst.margin"))
	}
	ref := f.Fault
	if ref == nil || ref.Kind != faults.Kind(hand(t, "gen.non.worst.kind")) || ref.Case != faults.Max ||
		ref.Place != "AV-CABLE, BF-11 end" || hand(t, "gen.non.worst.placeBF") != 1 || hand(t, "gen.non.worst.scale") != 1 || ref.Interpolated {
		t.Fatalf("worst fault %+v, script: LLL max close in on AV-CABLE at BF-11, a solved fault", ref)
	}
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"RG current (A)", ref.DeviceA, hand(t, "gen.non.worst.RG.A")},
		{"RG time (s)", ref.DeviceS, hand(t, "gen.non.worst.RG.s")},
		{"RA current (A)", ref.OtherA, hand(t, "gen.non.worst.RA.A")},
		{"RA time (s)", ref.OtherS, hand(t, "gen.non.worst.RA.s")},
		// The IEC 60255-151 formula on the script's current.
		{"RG time by the formula (s)", tSI(hand(t, "gen.non.worst.RG.A"), 250, 0.05), hand(t, "gen.non.worst.RG.s")},
	} {
		if !agrees(c.got, c.want) {
			t.Errorf("%s %.6g, want %.6g", c.what, c.got, c.want)
		}
	}
	if !strings.Contains(f.Note, "current from its branch into its bus") || hand(t, "gen.non.worst.RG.dira") != -1 {
		t.Errorf("note %q: want the current from RG's branch into its bus (the script's element decides reverse)", f.Note)
	}
	if want := fmt.Sprintf("%.0f faults where it operates", hand(t, "gen.non.operations")); !strings.Contains(f.Note, want) {
		t.Errorf("note %q, want %q (script)", f.Note, want)
	}

	// RG's phase stage looking forward, into Gorse Nook.
	s = loadVariant(t, path, "  pickup_a = 250\n", "  direction = \"forward\"\n  pickup_a = 250\n")
	rg := device(t, s, "RG")
	eng, _, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	seen := seenFor(t, eng, rg, faults.OnBranch(branchIndex(t, s.Network, "AV-CABLE"), 0), faults.LLL, faults.Max)
	for p, d := range rg.Dir.PhaseDirections(&seen) {
		if d != coord.Reverse {
			t.Errorf("directional RG: element %c decides %s for the Ash Vale fault, want reverse", "abc"[p], d)
		}
	}
	if _, st := coord.NewTimer(rg).OperateSeen(&seen, coord.Nominal); st != curves.NoTrip {
		t.Errorf("directional RG operates (%v) for the Ash Vale fault", st)
	}
	r = checkStudy(t, s)
	f = oneFinding(t, r, coord.Discrimination, "RG")
	if f.Verdict != coord.Pass || !strings.HasPrefix(f.Note, "does not operate for any fault") || hand(t, "gen.fwd.operations") != 0 {
		t.Errorf("directional RG: %s %q; want PASS, it does not operate for others' faults (script: %g faults)", f.Verdict, f.Note, hand(t, "gen.fwd.operations"))
	}
	noFailures(t, r)
	for _, p := range r.Pairs {
		if s.Devices[p.Upstream].Name == "RG" {
			t.Errorf("directional RG still backs up %s", s.Devices[p.Downstream].Name)
		}
	}
}

// TestParallelTransformersBusbar: at Hollin Cross (parallel-transformers.toml)
// two 10 MVA Dyn11 units share the 11 kV busbar. For a fault at T1's 11 kV
// terminals the busbar feeds it back through T1-LV, and T2 feeds the
// busbar: with nothing else on the busbar T1-LV and T2-LV carry the same
// current (Kirchhoff's law at the busbar; 4572 A for the bolted
// three-phase fault, script). Non-directional, both trip in
// 0.2·0.14/((4572/700)^0.02 − 1) = 0.732 s: T2-LV trips for a fault T1-LV
// must clear, a margin of 0 s, and the busbar is lost (FAIL). With a
// definite-time stage looking forward into its own transformer (300 A
// phase, 50 A ground, 0.2 s), T1-LV opens first and T2-LV, whose element
// sees the current leaving T2 as reverse, is relieved 0.532 s before its
// non-directional stage would trip (PASS).
func TestParallelTransformersBusbar(t *testing.T) {
	path := discriminationDir + "parallel-transformers.toml"
	s := loadVariant(t, path)
	r := checkStudy(t, s)
	for _, c := range []struct{ dev, other, faulted string }{{"T2-LV", "T1-LV", "T1"}, {"T1-LV", "T2-LV", "T2"}} {
		f := oneFinding(t, r, coord.Discrimination, c.dev)
		if f.Verdict != coord.Fail || f.Other != c.other || f.Fault == nil || !strings.HasPrefix(f.Fault.Place, c.faulted+", ") {
			t.Fatalf("%s: %s, must clear %q, fault %+v; want FAIL naming %s for a fault on %s", c.dev, f.Verdict, f.Other, f.Fault, c.other, c.faulted)
		}
		if math.Abs(f.Fault.DeviceA-f.Fault.OtherA) > margin0*f.Fault.OtherA || math.Abs(f.Fault.DeviceS-f.Fault.OtherS) > margin0 {
			t.Errorf("%s: %g A in %g s against %s's %g A in %g s: the two incomers carry one current", c.dev, f.Fault.DeviceA, f.Fault.DeviceS, c.other, f.Fault.OtherA, f.Fault.OtherS)
		}
		if c.dev == "T2-LV" {
			checkWorst(t, s, f, "twin.non.T2-LV")
		}
	}
	// The figures by hand for the bolted fault at T1's 11 kV terminals.
	eng, _, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	place := faults.OnBranch(branchIndex(t, s.Network, "T1"), 1)
	for _, name := range []string{"T1-HV", "T2-HV", "T1-LV", "T2-LV"} {
		d := device(t, s, name)
		seen := seenFor(t, eng, d, place, faults.LLL, faults.Max)
		key := "twin.non.T1@1.max.LLL." + name
		if !agrees(seen.PhaseA(), hand(t, key+".A")) {
			t.Errorf("%s: %.6g A, script %.6g A", name, seen.PhaseA(), hand(t, key+".A"))
		}
		if got, _ := coord.NewTimer(d).OperateSeen(&seen, coord.Nominal); !agrees(got, hand(t, key+".s")) {
			t.Errorf("%s: %.6g s, script %.6g s", name, got, hand(t, key+".s"))
		}
	}

	// Directional incomers.
	s = directionalIncomers(t, path)
	r = checkStudy(t, s)
	noFailures(t, r)
	for _, c := range []struct{ dev, other, faulted string }{{"T2-LV", "T1-LV", "T1"}, {"T1-LV", "T2-LV", "T2"}} {
		f := oneFinding(t, r, coord.Discrimination, c.dev)
		if f.Verdict != coord.Pass || f.Other != c.other {
			t.Errorf("directional %s: %s, must clear %q; want PASS over %s", c.dev, f.Verdict, f.Other, c.other)
		}
		if c.dev == "T2-LV" {
			checkWorst(t, s, f, "twin.dir.T2-LV")
		}
	}
	eng, _, err = coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"T1-LV", "T2-LV"} {
		d := device(t, s, name)
		seen := seenFor(t, eng, d, place, faults.LLL, faults.Max)
		want := scriptDirection(hand(t, "twin.dir.T1@1.max.LLL."+name+".dira"))
		if got := d.Dir.PhaseDirections(&seen); got[0] != want {
			t.Errorf("%s: element a decides %s for the fault at T1's 11 kV terminals, script %s", name, got[0], want)
		}
	}
}

// TestParallelTransformersTripNote: non-directional, T2-LV trips at
// 0.732 s for the fault at T1's 11 kV terminals, with T1-LV, while the fault
// is isolated only when T1-HV opens (script: 1.199 s). Its finding must say
// that it trips before the fault is isolated, as T1-LV's does for the
// mirror fault on T2.
func TestParallelTransformersTripNote(t *testing.T) {
	r := checkStudy(t, loadVariant(t, discriminationDir+"parallel-transformers.toml"))
	if iso := hand(t, "twin.non.T1@1.max.LLL.clear"); !(hand(t, "twin.non.T1@1.max.LLL.T2-LV.s") < iso) {
		t.Fatalf("script: T2-LV does not trip before isolation (%g s)", iso)
	}
	for _, dev := range []string{"T1-LV", "T2-LV"} {
		if f := oneFinding(t, r, coord.Discrimination, dev); !strings.Contains(f.Note, "it trips before the fault is isolated") {
			t.Errorf("%s: note %q does not say it trips before the fault is isolated", dev, f.Note)
		}
	}
}

// directionalIncomers returns the parallel-transformer study with forward
// definite-time stages added to both incomers.
func directionalIncomers(t *testing.T, path string) *coord.Study {
	t.Helper()
	add := "  [[relay.stage]]\n  measures = \"phase\"\n  direction = \"forward\"\n  curve = \"definite\"\n  pickup_a = 300\n  delay_s = 0.2\n" +
		"  [[relay.stage]]\n  measures = \"ground\"\n  direction = \"forward\"\n  curve = \"definite\"\n  pickup_a = 50\n  delay_s = 0.2\n"
	ground := "  measures = \"ground\"\n  curve = \"iec-si\"\n  pickup_a = 100\n  tms = 0.2\n"
	return loadVariant(t, path, ground, ground+add)
}

// TestParallelTransformersBackfeed: a fault at T1's 33 kV terminals, just
// beyond T1-HV's current transformer, is fed from the grid through T1-HV
// alone while everything is closed (no source on the 11 kV side). When
// T1-HV has opened, the fault is still fed, from the grid through T2, the
// 11 kV busbar and T1 backwards, until T1-LV opens (script: the minimum-
// case LL fault, T1-HV opens at 0.740 s carrying 5473 A, then T1-LV at
// 1.960 s on 2305 A of backfeed). The fault-clearing finding for T1 must
// report that slowest sequence (1.960 s), not the 1.413 s of the faults at
// T1's 11 kV end.
func TestParallelTransformersBackfeed(t *testing.T) {
	s := loadVariant(t, discriminationDir+"parallel-transformers.toml")
	r := checkStudy(t, s)
	checkSlowest(t, s, oneFinding(t, r, coord.Clearing, "T1"), "twin.non.slowest", "T1")
}

// checkSlowest compares an element's fault-clearing finding with the
// script's slowest-cleared fault of that element (put_slowest in
// handcheck.py): the clearing time, the fault, and the openings with their
// times and currents (the current in the intact network, and, when it
// changed, when the device opened).
func checkSlowest(t *testing.T, s *coord.Study, f coord.Finding, key, element string) {
	t.Helper()
	if f.Verdict != coord.Pass || !agrees(f.Measured, hand(t, key+".clear")) || f.Required != 3 {
		t.Errorf("%s cleared in %.6g s (%s, ≤ %g s), script %.6g s", element, f.Measured, f.Verdict, f.Required, hand(t, key+".clear"))
	}
	frac := hand(t, key+".frac")
	n := s.Network
	b := branchIndex(t, n, element)
	wantPlace := coord.PlaceName(n, faults.OnBranch(b, frac))
	kind := faults.Kind(hand(t, key+".kind"))
	cs := faults.Min
	if hand(t, key+".max") == 1 {
		cs = faults.Max
	}
	if f.Fault == nil || f.Fault.Place != wantPlace || f.Fault.Kind != kind || f.Fault.Case != cs {
		t.Errorf("%s: slowest fault %+v, script %s %s @ %s", element, f.Fault, kind, cs, wantPlace)
	}
	var parts []string
	for i := range int(hand(t, key+".events")) {
		k := fmt.Sprintf("%s.%d", key, i)
		intact, now := hand(t, k+".intactA"), hand(t, k+".A")
		if intact < 1e-9*now {
			intact = 0 // the script's rounding residue of a current the engine cuts to 0
		}
		cur := fmtA(intact) + " A"
		if math.Abs(now-intact) > 1e-3*math.Max(now, intact) {
			cur = fmtA(intact) + " A → " + fmtA(now) + " A"
		}
		parts = append(parts, fmt.Sprintf("%s at %.3f s (%s)", s.Devices[int(hand(t, k+".relay"))].Name, hand(t, k+".s"), cur))
	}
	if want := "isolated by " + strings.Join(parts, ", then "); f.Note != want {
		t.Errorf("%s: note\n%q\nscript\n%q", element, f.Note, want)
	}
}

// fmtA prints a current as the reports do.
func fmtA(a float64) string {
	if a >= 100 {
		return fmt.Sprintf("%.0f", a)
	}
	return fmt.Sprintf("%.3g", a)
}

// TestParallelLines: at Stoneycroft (parallel-lines.toml) L1 and L2 run
// in parallel from SC-S to SC-R, which has no source. For faults along L1
// (close in at both ends and at 10, 30, 50, 70 and 90 %), L2 carries
// current into SC-R and on into L1 from its far end, so L1-R and L2-R
// carry the same current in the intact network (script). Non-directional,
// L2-R trips with L1-R (margin 0 s: FAIL). Directional, looking into their
// lines, L2-R sees that current as reverse and never operates; L2-S,
// non-directional at the sending end, waits for L1-R by at least the
// script's worst margin, 0.529 s; and L1 is cleared within the script's
// slowest sequence.
func TestParallelLines(t *testing.T) {
	path := discriminationDir + "parallel-lines.toml"
	variants := []struct {
		name string
		s    *coord.Study
	}{
		{"non", loadVariant(t, path)},
		{"dir", loadVariant(t, path,
			"  pickup_a = 150\n", "  direction = \"forward\"\n  pickup_a = 150\n",
			"  pickup_a = 60\n", "  direction = \"forward\"\n  pickup_a = 60\n")},
	}
	for _, v := range variants {
		t.Run(v.name, func(t *testing.T) {
			s := v.s
			eng, _, err := coord.Prepare(s)
			if err != nil {
				t.Fatal(err)
			}
			l1 := branchIndex(t, s.Network, "L1")
			// Along the whole line, both cases, every kind: what the
			// receiving ends see and when they operate.
			for _, frac := range []float64{0, 0.1, 0.3, 0.5, 0.7, 0.9, 1} {
				for _, cs := range faults.Cases {
					for _, k := range faults.Kinds {
						prefix := fmt.Sprintf("lines.%s.L1@%g.%s.%s", v.name, frac, cs, k)
						for _, name := range []string{"L1-R", "L2-R"} {
							d := device(t, s, name)
							seen := seenFor(t, eng, d, faults.OnBranch(l1, frac), k, cs)
							if !agrees(seen.PhaseA(), hand(t, prefix+"."+name+".A")) || !agrees(seen.ResidualA(), hand(t, prefix+"."+name+".3I0")) {
								t.Errorf("%s %s: %.6g A, 3I0 %.6g A; script %.6g A, %.6g A", prefix, name, seen.PhaseA(), seen.ResidualA(),
									hand(t, prefix+"."+name+".A"), hand(t, prefix+"."+name+".3I0"))
							}
							got, st := coord.NewTimer(d).OperateSeen(&seen, coord.Nominal)
							switch want := hand(t, prefix+"."+name+".s"); {
							case want < 0 && st != curves.NoTrip:
								t.Errorf("%s %s operates in %.6g s, script: it does not", prefix, name, got)
							case want >= 0 && (st != curves.Operates || !agrees(got, want)):
								t.Errorf("%s %s: %.6g s (%v), script %.6g s", prefix, name, got, st, want)
							}
						}
					}
				}
			}
			r := checkStudy(t, s)
			checkSlowest(t, s, oneFinding(t, r, coord.Clearing, "L1"), "lines."+v.name+".slowest", "L1")
			f := oneFinding(t, r, coord.Discrimination, "L2-R")
			if v.name == "non" {
				if f.Verdict != coord.Fail || f.Fault == nil || !strings.HasPrefix(f.Fault.Place, "L1") {
					t.Fatalf("non-directional L2-R: %s, fault %+v; want FAIL for a fault on L1", f.Verdict, f.Fault)
				}
				checkWorst(t, s, f, "lines.non.L2-R")
				return
			}
			if f.Verdict != coord.Pass || !strings.HasPrefix(f.Note, "does not operate for any fault") || hand(t, "lines.dir.L2-R.operates") != 0 {
				t.Errorf("directional L2-R: %s %q; want PASS, never operating for L1's faults", f.Verdict, f.Note)
			}
			checkWorst(t, s, oneFinding(t, r, coord.Discrimination, "L2-S"), "lines.dir.L2-S")
			for _, f := range r.Findings {
				if f.Verdict == coord.Fail && (f.Check == coord.Discrimination || f.Check == coord.Clearing) {
					t.Errorf("directional: %s %s fails: %s", f.Check, f.Device, f.Note)
				}
			}
		})
	}
}

// TestRingSequentialClearing: the Wrenfield ring (ring.toml), graded both
// ways with directional relays at RF-B and RF-C. Every line fault is fed
// from both ends; the fault-clearing finding of each line is its slowest
// fault, with the openings in order: the first end on its current in the
// intact ring, the second on the current it carries once the first end has
// opened (the network solved again), its inverse timer having run on the
// intact current until then. The script follows the same sequence on its
// own network.
func TestRingSequentialClearing(t *testing.T) {
	path := discriminationDir + "ring.toml"
	s := loadVariant(t, path)
	r := checkStudy(t, s)
	noFailures(t, r)
	for _, line := range []string{"AB", "BC", "CA"} {
		checkSlowest(t, s, oneFinding(t, r, coord.Clearing, line), "ring."+line+".slowest", line)
	}

	// One fault step by step: the bolted three-phase fault a quarter of
	// the way along BC from RF-B, in the maximum case.
	eng, _, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	bc := branchIndex(t, s.Network, "BC")
	place := faults.OnBranch(bc, 0.25)
	nearEnd, farEnd := device(t, s, "BC-B"), device(t, s, "BC-C")
	sb := seenFor(t, eng, nearEnd, place, faults.LLL, faults.Max)
	sc := seenFor(t, eng, farEnd, place, faults.LLL, faults.Max)
	tb, _ := coord.NewTimer(nearEnd).OperateSeen(&sb, coord.Nominal)
	tc0, _ := coord.NewTimer(farEnd).OperateSeen(&sc, coord.Nominal)
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"BC-B current, intact (A)", sb.PhaseA(), hand(t, "ring.BC@0.25.BC-B.A0")},
		{"BC-B time, intact (s)", tb, hand(t, "ring.BC@0.25.BC-B.s0")},
		{"BC-C current, intact (A)", sc.PhaseA(), hand(t, "ring.BC@0.25.BC-C.A0")},
		{"BC-C time, intact (s)", tc0, hand(t, "ring.BC@0.25.BC-C.s0")},
		{"BC-B opens (s)", tb + nearEnd.BreakerS, hand(t, "ring.BC@0.25.first.open")},
	} {
		if !agrees(c.got, c.want) {
			t.Errorf("%s: %.6g, script %.6g", c.what, c.got, c.want)
		}
	}
	if tb >= tc0 {
		t.Fatalf("BC-B (%g s) must trip before BC-C (%g s) for this fault", tb, tc0)
	}
	// BC-B's end open: the network solved again.
	sol, err := eng.SolveOpen(eng.CaseFault(place, faults.LLL, faults.Max), faults.Opening{Ends: []faults.Point{nearEnd.Point}})
	if err != nil {
		t.Fatal(err)
	}
	resp := sol.Response(farEnd.Point)
	sc1 := coord.NewSeen(resp.Currents(sol), resp.Voltages(sol), resp.Prefault())
	tc1, _ := coord.NewTimer(farEnd).OperateSeen(&sc1, coord.Nominal)
	if pd := farEnd.Dir.PhaseDirections(&sc1); pd[0] != scriptDirection(hand(t, "ring.BC@0.25.BC-C.dira1")) {
		t.Errorf("BC-C decides %s after BC-B opened, script %v", pd[0], hand(t, "ring.BC@0.25.BC-C.dira1"))
	}
	open1 := tb + nearEnd.BreakerS
	second := open1 + (1-open1/tc0)*tc1 + farEnd.BreakerS
	for _, c := range []struct {
		what      string
		got, want float64
	}{
		{"BC-C current after BC-B opened (A)", sc1.PhaseA(), hand(t, "ring.BC@0.25.BC-C.A1")},
		{"BC-C time at that current (s)", tc1, hand(t, "ring.BC@0.25.BC-C.s1")},
		{"BC-C opens (s)", second, hand(t, "ring.BC@0.25.second.open")},
	} {
		if !agrees(c.got, c.want) {
			t.Errorf("%s: %.6g, script %.6g", c.what, c.got, c.want)
		}
	}
	if sc1.PhaseA() <= sc.PhaseA() {
		t.Errorf("BC-C carries %g A after BC-B opened, %g A before: the whole fault current should move to it", sc1.PhaseA(), sc.PhaseA())
	}
	if slices.ContainsFunc(r.Findings, func(f coord.Finding) bool {
		return f.Check == coord.Clearing && f.Device == "BC" && f.Measured < second-handAbs
	}) {
		t.Errorf("BC's slowest clearing is below this fault's %g s", second)
	}
}

// TestRingSequenceIntactCurrent: with the directional relays at RF-B and
// RF-C set at 400 A, AB's slowest fault (minimum case, LL, a quarter of the
// way from RF-A) is cleared by AB-A first; AB-B, which carries 365.4 A in
// the intact ring (script), below its pickup, operates only after AB-A has
// opened (1619 A). The sequence must print its intact current, 365 A, not
// 0 A.
func TestRingSequenceIntactCurrent(t *testing.T) {
	path := discriminationDir + "ring.toml"
	s := loadVariant(t, path, "pickup_a = 250", "pickup_a = 400")
	r := checkStudy(t, s)
	checkSlowest(t, s, oneFinding(t, r, coord.Clearing, "AB"), "ring400.AB.slowest", "AB")
}
