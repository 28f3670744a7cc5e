package propose

import (
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/study/gen"
)

// Hand figures of the pickup tests.
//
// Fault currents are those of IEC 60909-0 with its voltage factors
// (c_max 1.10, c_min 1.00 above 1 kV), the network feeder's impedance
// from its short-circuit power, |Z_Q| = c·Un²/S"k with its X/R, and the
// line-to-earth fault I"k1 = √3·c·Un/|Z1 + Z2 + Z0 + 3·R_F|; operating
// times are those of the IEC 60255-151:2009 standard inverse curve,
// t = TMS·0.14/((I/Is)^0.02 − 1). The limits are the criteria the study
// states: pickup ≥ load_factor × the load beyond the relay, and pickup ≤
// the minimum fault at the zone's far end ÷ sensitivity_primary (the
// checker's definitions, README "The checks"; the factors are common
// practice).

// handTol is the agreement asked of the least multipliers at the hand
// pickups: the check's currents agree with the closed forms to about
// 1e-12 (faults/closedform_test.go), so 1e-6 leaves nothing for a wrong
// binding fault, margin or pickup.
const handTol = 1e-6

// siG is the IEC 60255-151 standard inverse time at TMS 1.
func siG(i, pickup float64) float64 { return 0.14 / (math.Pow(i/pickup, 0.02) - 1) }

// feeder returns the network feeder's impedance at 11 kV from its
// short-circuit power, X/R 10, in case c.
func feeder(c, scMVA float64) complex128 {
	z := c * 11 * 11 / scMVA
	r := z / math.Sqrt(1+10*10)
	return complex(r, 10*r)
}

// threePhaseA is the three-phase fault current behind impedance z.
func threePhaseA(c float64, z complex128) float64 { return c * 11000 / math.Sqrt(3) / cmplx.Abs(z) }

// loadA is the current of a load of mva at 11 kV.
func loadA(mva float64) float64 { return mva * 1e6 / (math.Sqrt(3) * 11000) }

// ceilStep and floorStep put a figure on a grid of step from lo.
func ceilStep(x, lo, step float64) float64   { return lo + math.Ceil((x-lo)/step-1e-9)*step }
func floorStep5(x, lo, step float64) float64 { return lo + math.Floor((x-lo)/step+1e-9)*step }

func proposeFile(t *testing.T, path string, edit func(string) string) (*coord.Study, *Proposal) {
	t.Helper()
	return proposeFileWith(t, path, edit, Settings{Pickups: true})
}

// proposeFileWith proposes settings for the study file at path, edited,
// with the search's settings o.
func proposeFileWith(t *testing.T, path string, edit func(string) string, o Settings) (*coord.Study, *Proposal) {
	t.Helper()
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	text := string(src)
	if edit != nil {
		text = edit(text)
	}
	s, err := study.Parse(path, []byte(text), nil)
	if err != nil {
		t.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	pr, err := Propose(s, eng, topo, o)
	if err != nil {
		t.Fatal(err)
	}
	return s, pr
}

// chosen returns the chosen pickup of a relay's stage and what holds it.
func chosen(t *testing.T, s *coord.Study, pr *Proposal, relay, stage string) (PickupVar, float64, Limit) {
	t.Helper()
	for k, v := range pr.Pickups {
		d := s.Devices[v.Device]
		if d.Name == relay && d.Stages[v.Stage].Label == stage {
			return v, pr.P[k], pr.PickupBy[k]
		}
	}
	t.Fatalf("%s %s: not among the chosen pickups", relay, stage)
	return PickupVar{}, 0, Limit{}
}

// multiplierOf returns the proposed and least multipliers of a stage.
func multiplierOf(t *testing.T, s *coord.Study, pr *Proposal, relay, stage string) (x, least float64) {
	t.Helper()
	for i, v := range pr.Vars {
		d := s.Devices[v.Device]
		if d.Name == relay && d.Stages[v.Stage].Label == stage {
			return pr.X[i], pr.Continuous[i]
		}
	}
	t.Fatalf("%s %s: no multiplier", relay, stage)
	return 0, 0
}

// chainCurrents are the three-phase maximum faults close in beyond R2
// (at B) and beyond R3 (at C) of testdata/propose/pickups-chain.toml,
// where each relay and the one above it carry the same current.
func chainCurrents() (iB, iC float64) {
	src := feeder(1.1, 250)
	ab, bc := complex(0.32, 0.2), complex(0.24, 0.15)
	return threePhaseA(1.1, src+ab), threePhaseA(1.1, src+ab+bc)
}

// TestPickupsLowestAdmissibleHandDerived: on a radial chain whose
// multipliers can grade at any pickup, each relay takes the lowest pickup
// of its 10 A steps that the load-margin check admits, 1.25 × the loads
// beyond it, and the least multipliers at those pickups are the
// hand-derived ones of TestRadialChainHandDerived's form.
func TestPickupsLowestAdmissibleHandDerived(t *testing.T) {
	s, pr := proposeFile(t, "../../testdata/propose/pickups-chain.toml", nil)
	loads := map[string]float64{"R1": loadA(2 + 2 + 3), "R2": loadA(2 + 3), "R3": loadA(3)}
	want := map[string]float64{}
	for name, a := range loads {
		want[name] = ceilStep(1.25*a, 50, 10)
	}
	for _, name := range []string{"R1", "R2", "R3"} {
		v, p, by := chosen(t, s, pr, name, "51")
		if math.Abs(p-want[name]) > 1e-9 || math.Abs(v.Low-want[name]) > 1e-9 {
			t.Errorf("%s: pickup %g A (lowest admissible %g A), want 1.25 × %.2f A on 10 A steps = %g A", name, p, v.Low, loads[name], want[name])
		}
		if by.Kind != LimitLoad {
			t.Errorf("%s: bound by %v (%s), want load", name, by.Kind, by.Note)
		}
		// The CT's continuous thermal rating (600 A, factor 1) limits an
		// inverse phase pickup from above; the sensitivity limits, some
		// kA ÷ 1.5, lie beyond it.
		if v.High != 600 || v.HighBy.Kind != LimitCT {
			t.Errorf("%s: highest admissible %g A by %v, want 600 A by the CT", name, v.High, v.HighBy.Kind)
		}
	}
	iB, iC := chainCurrents()
	tms3 := 0.05
	tms2 := (0.3 + tms3*siG(iC, want["R3"])) / siG(iC, want["R2"])
	tms1 := (0.3 + tms2*siG(iB, want["R2"])) / siG(iB, want["R1"])
	for name, w := range map[string]float64{"R1": tms1, "R2": tms2, "R3": tms3} {
		if _, got := multiplierOf(t, s, pr, name, "51"); math.Abs(got-w) > handTol*w {
			t.Errorf("%s: least TMS %.8f at the chosen pickups, hand-derived %.8f", name, got, w)
		}
	}
	if !pr.Verified() || len(pr.Conflicts) > 0 {
		t.Errorf("verified %v, %d conflicts: want a verified proposal without conflicts", pr.Verified(), len(pr.Conflicts))
	}
}

// TestPickupRaisedToMeetMargin: when R1's multiplier range ends at 0.25,
// below what R1 needs at its lowest admissible pickup to wait 0.3 s over
// R2 at the three-phase fault beyond R2, the search raises R1's pickup to
// the lowest 10 A step at which the needed multiplier,
//
//	TMS_1(Is) = (0.3 + TMS_2·g(I_B/Is_2)) / g(I_B/Is),
//
// fits the range, and the proposal then meets every margin.
func TestPickupRaisedToMeetMargin(t *testing.T) {
	s, pr := proposeFile(t, "../../testdata/propose/pickups-chain.toml", func(text string) string {
		i := strings.Index(text, `name = "R1"`)
		r1 := strings.Replace(text[i:], "ct_primary_a = 600", "ct_primary_a = 800", 1)
		r1 = strings.Replace(r1, "multiplier_range = [0.05, 1.0]", "multiplier_range = [0.05, 0.25, 0.01]", 1)
		return text[:i] + r1
	})
	iB, iC := chainCurrents()
	is1, is2, is3 := ceilStep(1.25*loadA(7), 50, 10), ceilStep(1.25*loadA(5), 50, 10), ceilStep(1.25*loadA(3), 50, 10)
	tms2 := (0.3 + 0.05*siG(iC, is3)) / siG(iC, is2)
	need := func(is float64) float64 { return (0.3 + tms2*siG(iB, is2)) / siG(iB, is) }
	if need(is1) <= 0.25 {
		t.Fatalf("premise: at its lowest pickup %g A R1 needs TMS %.4f, within 0.25", is1, need(is1))
	}
	want := 0.0
	for is := is1; is <= 800; is += 10 {
		if need(is) <= 0.25 {
			want = is
			break
		}
	}
	if want == 0 {
		t.Fatal("premise: no pickup up to the CT's 800 A lets R1 grade")
	}
	_, p, by := chosen(t, s, pr, "R1", "51")
	if math.Abs(p-want) > 1e-9 {
		t.Errorf("R1: pickup %g A, want the lowest step at which it can grade, %g A (TMS %.4f; %.4f at %g A)", p, want, need(want), need(want-10), want-10)
	}
	if by.Kind != LimitGrading || !strings.Contains(by.Note, "raised from") {
		t.Errorf("R1: bound by %v (%s), want grading", by.Kind, by.Note)
	}
	x, least := multiplierOf(t, s, pr, "R1", "51")
	if math.Abs(least-need(want)) > handTol*least || x > 0.25 {
		t.Errorf("R1: TMS %g (least %.8f), want least %.8f, proposed within 0.25", x, least, need(want))
	}
	if !pr.Verified() || len(pr.Conflicts) > 0 {
		t.Errorf("verified %v, %d conflicts: want a verified proposal without conflicts", pr.Verified(), len(pr.Conflicts))
	}
}

// earthCurrents are, for testdata/propose/pickups-earth.toml, the
// smallest line-to-earth faults (minimum case, 20 Ω) at B and at C, and
// the largest (maximum case, bolted) close in beyond R2 at B.
func earthCurrents() (minB, minC, maxB float64) {
	ab1, ab0 := complex(0.8, 0.5), complex(3.2, 1.75)
	lg := func(c float64, zq complex128, n float64, rf float64) float64 {
		z1, z0 := zq+complex(n, 0)*ab1, zq+complex(n, 0)*ab0 // z0_z1 = 1: the feeder's Z0 is its Z1
		return math.Sqrt(3) * c * 11000 / cmplx.Abs(2*z1+z0+complex(3*rf, 0))
	}
	return lg(1.0, feeder(1.0, 150), 1, 20), lg(1.0, feeder(1.0, 150), 2, 20), lg(1.1, feeder(1.1, 250), 1, 0)
}

// TestPickupSensitivityLimitHandDerived: the ground stages may range
// from the CT's 5 % (20 A of 400 A) up to the smallest earth fault at the
// far end of their zones ÷ 1.5 (R1's zone ends at B, where R2 sits; R2's
// at C), on 5 A steps. R1's multiplier range, 0.05–0.152, is too short
// for it to grade over R2 below the top of that interval, so the search
// raises its pickup to the sensitivity limit: the hand figures show that
// it grades there and not one step lower.
func TestPickupSensitivityLimitHandDerived(t *testing.T) {
	s, pr := proposeFile(t, "../../testdata/propose/pickups-earth.toml", nil)
	minB, minC, maxB := earthCurrents()
	high1 := floorStep5(math.Min(minB/1.5, minC/1.2), 10, 5)
	high2 := floorStep5(minC/1.5, 10, 5)
	need := func(is float64) float64 { return (0.3 + 0.05*siG(maxB, 20)) / siG(maxB, is) }
	if !(need(high1) <= 0.152 && need(high1-5) > 0.152) {
		t.Fatalf("premise: R1 needs TMS %.5f at %g A and %.5f one step lower; want the range's top 0.152 between them", need(high1), high1, need(high1-5))
	}
	v1, p1, by1 := chosen(t, s, pr, "R1", "51N")
	v2, p2, by2 := chosen(t, s, pr, "R2", "51N")
	for _, c := range []struct {
		name                string
		v                   PickupVar
		high                float64
		p                   float64
		by                  Limit
		wantP               float64
		wantBy              LimitKind
		wantLowBy, wantHiBy LimitKind
	}{
		{"R1", v1, high1, p1, by1, high1, LimitPrimary, LimitCT, LimitPrimary},
		{"R2", v2, high2, p2, by2, 20, LimitCT, LimitCT, LimitPrimary},
	} {
		if c.v.Low != 20 || c.v.LowBy.Kind != c.wantLowBy {
			t.Errorf("%s 51N: lowest admissible %g A by %v, want 20 A by the CT", c.name, c.v.Low, c.v.LowBy.Kind)
		}
		if math.Abs(c.v.High-c.high) > 1e-9 || c.v.HighBy.Kind != c.wantHiBy {
			t.Errorf("%s 51N: highest admissible %g A by %v (%s), want %g A by primary sensitivity", c.name, c.v.High, c.v.HighBy.Kind, c.v.HighBy.Note, c.high)
		}
		if math.Abs(c.p-c.wantP) > 1e-9 || c.by.Kind != c.wantBy {
			t.Errorf("%s 51N: pickup %g A bound by %v (%s), want %g A by %v", c.name, c.p, c.by.Kind, c.by.Note, c.wantP, c.wantBy)
		}
	}
	if _, least := multiplierOf(t, s, pr, "R1", "51N"); math.Abs(least-need(high1)) > handTol*least {
		t.Errorf("R1 51N: least TMS %.8f, hand-derived %.8f", least, need(high1))
	}
	if !pr.Verified() || len(pr.Conflicts) > 0 {
		t.Errorf("verified %v, %d conflicts: want a verified proposal without conflicts", pr.Verified(), len(pr.Conflicts))
	}
}

// TestPickupNotRaisedInVain: when no pickup up to the sensitivity limit
// lets R1 grade (its multiplier range ends at 0.15, below what it needs
// even there), its pickup stays at the lowest admissible, the most
// sensitive, and the margin is named as a conflict.
func TestPickupNotRaisedInVain(t *testing.T) {
	s, pr := proposeFile(t, "../../testdata/propose/pickups-earth.toml", func(text string) string {
		return strings.Replace(text, "multiplier_range = [0.05, 0.152]", "multiplier_range = [0.05, 0.15]", 1)
	})
	if _, p, by := chosen(t, s, pr, "R1", "51N"); p != 20 || by.Kind != LimitCT {
		t.Errorf("R1 51N: pickup %g A bound by %v, want 20 A, the lowest admissible", p, by.Kind)
	}
	found := false
	for _, c := range pr.Conflicts {
		if c.Var >= 0 && s.Devices[pr.Vars[c.Var].Device].Name == "R1" && pr.Vars[c.Var].Stage == 1 {
			found = true
		}
	}
	if !found {
		t.Errorf("no conflict names R1 51N's multiplier: %+v", pr.Conflicts)
	}
}

// TestPickupLoadAboveSensitivity: a stage whose load limit lies above
// its sensitivity limit has no admissible pickup: it is kept as given,
// and the reason names both figures.
func TestPickupLoadAboveSensitivity(t *testing.T) {
	s, pr := proposeFile(t, "../../testdata/propose/pickups-earth.toml", func(text string) string {
		i := strings.Index(text, `name = "R2"`)
		r2 := strings.Replace(text[i:], "ct_primary_a = 400", "ct_primary_a = 2000\nmax_load_a = 1500", 1)
		r2 = strings.Replace(r2, "  pickup_a = 200\n", "  pickup_a = 200\n  pickup_range_a = [100, 2000, 10]\n", 1)
		return text[:i] + r2
	})
	for _, k := range pr.KeptPickups {
		d := s.Devices[k.Device]
		if d.Name == "R2" && d.Stages[k.Stage].Label == "51" {
			for _, want := range []string{"no pickup of the range meets both limits", "at least 1875 A (load margin: 1.25 × 1500 A", "primary sensitivity"} {
				if !strings.Contains(k.Why, want) {
					t.Errorf("R2 51 kept: %q lacks %q", k.Why, want)
				}
			}
			return
		}
	}
	t.Errorf("R2 51 is not kept: %+v", pr.KeptPickups)
}

// TestLevels: grading levels count the steps below each device, a ring
// of devices that grade over each other sharing one level.
func TestLevels(t *testing.T) {
	// 0 over 1 over 2; 3 and 4 over each other and over 0; 5 alone.
	below := [][]int{{1}, {2}, nil, {4, 0}, {3}, nil}
	got := levels(below)
	want := []int{2, 1, 0, 3, 3, 0}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("levels %v, want %v", got, want)
			break
		}
	}
}

// TestProposeDeterministic: two runs on a generated meshed study, with
// pickups chosen, give the same proposal down to the margins it names,
// although the checker hands its margins out from several goroutines
// and many of them ask exactly the same (rings, definite-time stages).
func TestProposeDeterministic(t *testing.T) {
	s, eng, topo := generated(t, gen.Options{Buses: 60, Seed: 4, Ranges: true})
	describe := func() string {
		pr, err := Propose(s, eng, topo, Settings{Pickups: true})
		if err != nil {
			t.Fatal(err)
		}
		var b strings.Builder
		fmt.Fprintf(&b, "%v %v %v %v\n", pr.P, pr.X, pr.Continuous, pr.Verified())
		for i := range pr.Binding {
			fmt.Fprintf(&b, "%s\n", Describe(s, pr.Binding[i].Src))
		}
		for _, c := range pr.Conflicts {
			fmt.Fprintf(&b, "%d %v %v:", c.Var, c.NeedX, c.ShortS)
			for _, src := range c.Chain {
				fmt.Fprintf(&b, " %s;", Describe(s, src))
			}
			b.WriteString("\n")
		}
		for k := range pr.PickupBy {
			fmt.Fprintf(&b, "%s\n", pr.PickupBy[k].Note)
		}
		return b.String()
	}
	first := describe()
	if len(first) < 1000 {
		t.Fatalf("a proposal of %d bytes: want a study with conflicts to name", len(first))
	}
	if second := describe(); second != first {
		t.Errorf("two runs differ:\n%s\n----\n%s", first, second)
	}
}
