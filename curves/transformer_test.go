package curves_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"tripgrade/curves"
)

func mustThroughFault(t *testing.T, s curves.ThroughFaultSettings) *curves.ThroughFault {
	t.Helper()
	tf, err := curves.NewThroughFault(s)
	if err != nil {
		t.Fatal(err)
	}
	return tf
}

// TestThroughFaultCategoryI: IEEE C57.109, category I: I²t = 1250 in per
// unit of rated current, up to 1/Z.
func TestThroughFaultCategoryI(t *testing.T) {
	const ratedA = 50
	tf := mustThroughFault(t, curves.ThroughFaultSettings{Category: curves.CategoryI, RatedA: ratedA, ZPct: 4})
	for _, pu := range []float64{5, 10, 20, 25} {
		got, st := tf.Time(pu * ratedA)
		if st != curves.Operates || relErr(got*pu*pu, 1250) > roundingRelTol {
			t.Errorf("at %g pu: %v s (%v), I²t = %v, want 1250 (IEEE C57.109 category I)", pu, got, st, got*pu*pu)
		}
	}
	// Beyond 1/Z = 25 pu the transformer cannot carry the current.
	if _, st := tf.Time(25.01 * ratedA); st != curves.Undefined {
		t.Errorf("beyond 1/Z: status %v, want undefined", st)
	}
	// At 2× and 3× the long-time points 1800 s and 300 s (IEEE C57.109,
	// from memory).
	for _, p := range []curves.Point{{2, 1800}, {3, 300}} {
		if got, _ := tf.Time(p.CurrentA * ratedA); got != p.TimeS {
			t.Errorf("at %g pu: %v s, want %v s (from memory)", p.CurrentA, got, p.TimeS)
		}
	}
	if _, st := tf.Time(1.99 * ratedA); st != curves.Undefined {
		t.Errorf("below 2 pu: status %v, want undefined", st)
	}
}

// TestThroughFaultThermalPoints: the category II–IV thermal curve points of
// IEEE C57.109 are from memory: 25×/2 s, 11.3×/10 s, 6.3×/30 s,
// 4.75×/60 s, 3×/300 s, 2×/1800 s.
func TestThroughFaultThermalPoints(t *testing.T) {
	const ratedA = 200
	fromMemory := []curves.Point{{25, 2}, {11.3, 10}, {6.3, 30}, {4.75, 60}, {3, 300}, {2, 1800}}
	for _, cat := range []curves.Category{curves.CategoryII, curves.CategoryIII} {
		tf := mustThroughFault(t, curves.ThroughFaultSettings{Category: cat, RatedA: ratedA, ZPct: 4})
		for _, p := range fromMemory {
			if got, st := tf.Time(p.CurrentA * ratedA); st != curves.Operates || relErr(got, p.TimeS) > roundingRelTol {
				t.Errorf("category %s at %g pu: %v s (%v), want %v s (from memory)", cat, p.CurrentA, got, st, p.TimeS)
			}
		}
	}
}

// TestThroughFaultMechanical: the frequent-fault curve of IEEE C57.109
// adds I²t = K with K = 2·(1/Z)², from 70 % of 1/Z for category II and
// from 50 % of 1/(Z_T + Z_S) for categories III and IV (from memory).
func TestThroughFaultMechanical(t *testing.T) {
	const ratedA = 100
	tests := []struct {
		name         string
		s            curves.ThroughFaultSettings
		maxPU        float64
		fromFraction float64
		mechanical   bool
	}{
		{"II infrequent", curves.ThroughFaultSettings{Category: curves.CategoryII, RatedA: ratedA, ZPct: 5}, 20, 0.7, false},
		{"II frequent", curves.ThroughFaultSettings{Category: curves.CategoryII, RatedA: ratedA, ZPct: 5, FrequentFaults: true}, 20, 0.7, true},
		{"III frequent with source", curves.ThroughFaultSettings{Category: curves.CategoryIII, RatedA: ratedA, ZPct: 8, SourceZPct: 2, FrequentFaults: true}, 10, 0.5, true},
		{"III infrequent", curves.ThroughFaultSettings{Category: curves.CategoryIII, RatedA: ratedA, ZPct: 8, SourceZPct: 2}, 10, 0.5, false},
		{"IV always", curves.ThroughFaultSettings{Category: curves.CategoryIV, RatedA: ratedA, ZPct: 10, SourceZPct: 2.5}, 8, 0.5, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tf := mustThroughFault(t, tc.s)
			if _, hi := tf.Span(); relErr(hi, tc.maxPU*ratedA) > roundingRelTol {
				t.Errorf("span ends at %v A, want %v A", hi, tc.maxPU*ratedA)
			}
			k := 2 * tc.maxPU * tc.maxPU
			atMax, _ := tf.Time(tc.maxPU * ratedA)
			from := tc.fromFraction * tc.maxPU
			atFrom, _ := tf.Time(from * ratedA)
			below, _ := tf.Time(from * 0.999 * ratedA)
			if !tc.mechanical {
				if relErr(atMax, 2) < 0.01 {
					t.Errorf("infrequent curve gives the mechanical 2 s at 1/Z")
				}
				return
			}
			if relErr(atMax, 2) > roundingRelTol {
				t.Errorf("at 1/Z: %v s, want 2 s", atMax)
			}
			if want := k / (from * from); relErr(atFrom, want) > roundingRelTol {
				t.Errorf("at %v pu: %v s, want K/I² = %v s", from, atFrom, want)
			}
			if !(below > atFrom) {
				t.Errorf("no step down onto the mechanical curve: %v s just below %v pu, %v s at it", below, from, atFrom)
			}
		})
	}
}

// TestThroughFaultDeltaStarShift: for an earth fault on the star side of a
// delta–star unit the delta-side line current is 1/√3 of the
// ratio-referred star-side current (IEEE C37.91 / IEEE Std 242), so the
// curve seen from the delta side sits at 1/√3 of the currents.
func TestThroughFaultDeltaStarShift(t *testing.T) {
	base := curves.ThroughFaultSettings{Category: curves.CategoryII, RatedA: 100, ZPct: 6}
	shifted := base
	shifted.DeltaStarEarthFault = true
	plain := mustThroughFault(t, base)
	moved := mustThroughFault(t, shifted)
	for _, currentA := range []float64{250, 500, 1000, 1600} {
		want, wantSt := plain.Time(currentA)
		got, st := moved.Time(currentA / math.Sqrt(3))
		if st != wantSt || relErr(got, want) > roundingRelTol {
			t.Errorf("at %v A: shifted curve at I/√3 gives %v (%v), unshifted at I %v (%v)", currentA, got, st, want, wantSt)
		}
	}
	lo, _ := moved.Span()
	if relErr(lo, 200/math.Sqrt(3)) > roundingRelTol {
		t.Errorf("shifted span starts at %v A", lo)
	}
}

func TestThroughFaultMonotone(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 11))
	for n := 0; n < randomCases; n++ {
		s := curves.ThroughFaultSettings{
			Category:            curves.Category(1 + r.IntN(4)),
			RatedA:              logUniform(r, 10, 3000),
			ZPct:                logUniform(r, 4, 15),
			FrequentFaults:      r.IntN(2) == 0,
			DeltaStarEarthFault: r.IntN(2) == 0,
		}
		if s.Category >= curves.CategoryIII {
			s.SourceZPct = r.Float64() * 5
		}
		tf := mustThroughFault(t, s)
		lo, hi := tf.Span()
		for _, end := range []float64{lo, hi} {
			if _, st := tf.Time(end); st != curves.Operates {
				t.Fatalf("%+v: status %v at the span's end %v A", s, st, end)
			}
		}
		prev := math.Inf(1)
		for c := lo; c <= hi; c *= 1.01 {
			got, st := tf.Time(c)
			if st != curves.Operates {
				t.Fatalf("%+v at %v A: status %v inside the span", s, c, st)
			}
			if got > prev {
				t.Fatalf("%+v: time rises to %v at %v A from %v", s, got, c, prev)
			}
			prev = got
		}
	}
}

// TestThroughFaultSpanEnds: both ends of Span are inside the curve for
// any rated current, also when the limit 1/Z falls exactly on the last
// thermal point (Z = 4 % gives 25×).
func TestThroughFaultSpanEnds(t *testing.T) {
	r := rand.New(rand.NewPCG(13, 13))
	for n := 0; n < randomCases; n++ {
		s := curves.ThroughFaultSettings{Category: curves.CategoryII, RatedA: logUniform(r, 1, 5000), ZPct: 4,
			DeltaStarEarthFault: r.IntN(2) == 0}
		tf := mustThroughFault(t, s)
		lo, hi := tf.Span()
		for _, end := range []float64{lo, hi} {
			if _, st := tf.Time(end); st != curves.Operates {
				t.Fatalf("%+v: status %v at the span's end %v A", s, st, end)
			}
		}
	}
}

// TestCategoryForKVA: IEEE C57.109 categories by three-phase kVA:
// I 15–500, II 501–5000, III 5001–30000, IV above 30000.
func TestCategoryForKVA(t *testing.T) {
	tests := []struct {
		kva  float64
		want curves.Category
	}{
		{15, curves.CategoryI}, {500, curves.CategoryI}, {501, curves.CategoryII}, {5000, curves.CategoryII},
		{5001, curves.CategoryIII}, {30000, curves.CategoryIII}, {30001, curves.CategoryIV}, {300000, curves.CategoryIV},
	}
	for _, tc := range tests {
		if got, err := curves.CategoryForKVA(tc.kva); err != nil || got != tc.want {
			t.Errorf("%v kVA: got %v, %v; want %v", tc.kva, got, err, tc.want)
		}
	}
	for _, kva := range []float64{10, -1, math.NaN()} {
		if _, err := curves.CategoryForKVA(kva); err == nil {
			t.Errorf("%v kVA accepted", kva)
		}
	}
}

func TestParseCategory(t *testing.T) {
	tests := []struct {
		in   string
		want curves.Category
	}{
		{"I", curves.CategoryI}, {"ii", curves.CategoryII}, {" III ", curves.CategoryIII}, {"4", curves.CategoryIV},
		{"cat II", curves.CategoryII}, {"Category IV", curves.CategoryIV},
	}
	for _, tc := range tests {
		if got, err := curves.ParseCategory(tc.in); err != nil || got != tc.want {
			t.Errorf("ParseCategory(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
	}
	if _, err := curves.ParseCategory("V"); err == nil || !strings.Contains(err.Error(), "I, II, III, IV") {
		t.Errorf("ParseCategory(V): error %v", err)
	}
	if curves.CategoryIII.String() != "III" {
		t.Errorf("String = %q", curves.CategoryIII.String())
	}
}

func TestThroughFaultValidation(t *testing.T) {
	tests := []struct {
		name string
		s    curves.ThroughFaultSettings
		want []string
	}{
		{"no category", curves.ThroughFaultSettings{RatedA: 100, ZPct: 5}, []string{"category must be I, II, III or IV"}},
		{"bad rated and Z", curves.ThroughFaultSettings{Category: curves.CategoryII, RatedA: -1, ZPct: 0},
			[]string{"rated current must be > 0 A (got -1)", "transformer impedance must be > 0 % (got 0)"}},
		{"source Z on category II", curves.ThroughFaultSettings{Category: curves.CategoryII, RatedA: 100, ZPct: 5, SourceZPct: 1},
			[]string{"categories III and IV only"}},
		{"impedance too high", curves.ThroughFaultSettings{Category: curves.CategoryIII, RatedA: 100, ZPct: 40, SourceZPct: 20},
			[]string{"limits the through-fault current"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := curves.NewThroughFault(tc.s)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
		})
	}
}
