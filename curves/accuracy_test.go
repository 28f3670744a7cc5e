package curves_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"tripgrade/curves"
)

// TestBandedDependentTime checks the limiting-error multipliers of
// IEC 60255-151:2009 cl. 5.2 (2.5× class from 2–5× setting, 1.5× from
// 5–10×, 1× above 10×) for class 5 % with a 40 ms floor.
func TestBandedDependentTime(t *testing.T) {
	acc := curves.Accuracy{ClassPct: 5, MinErrorS: 0.040}
	si, _ := curves.ShapeIECSI.Law()
	ei, _ := curves.ShapeIECEI.Law()
	tests := []struct {
		name       string
		law        curves.Law
		tms        float64
		multiple   float64
		wantErrPct float64 // limiting error in % of the nominal time; 0 when the floor governs
	}{
		{"3x: 2.5 x class", si, 1, 3, 12.5},
		{"7x: 1.5 x class", si, 1, 7, 7.5},
		{"15x: 1 x class", si, 1, 15, 5},
		{"boundary 5x belongs to 5-10", si, 1, 5, 7.5},
		{"boundary 10x belongs to above 10", si, 1, 10, 5},
		{"15x fast stage: 40 ms floor", ei, 0.05, 15, 0},
	}
	const pickupA = 100
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, _ := curves.NewInverseTime(tc.law, pickupA, tc.tms)
			early, late := curves.Banded(s, acc)
			currentA := tc.multiple * pickupA
			nominal, _ := s.Time(currentA)
			errS := nominal * tc.wantErrPct / 100
			if tc.wantErrPct == 0 {
				errS = acc.MinErrorS
			}
			e, _ := early.Time(currentA)
			l, _ := late.Time(currentA)
			if want := math.Max(nominal-errS, 0); math.Abs(e-want) > roundingRelTol*nominal {
				t.Errorf("early %v s, want %v s (nominal %v s)", e, want, nominal)
			}
			if want := nominal + errS; math.Abs(l-want) > roundingRelTol*nominal {
				t.Errorf("late %v s, want %v s (nominal %v s)", l, want, nominal)
			}
		})
	}
}

func TestLimitingErrorFactor(t *testing.T) {
	tests := []struct {
		multiple, want float64
		source         string
	}{
		{1.2, 2.5, "below 2×: our documented continuation of the 2–5× band, not from the standard"},
		{2, 2.5, "IEC 60255-151:2009 cl. 5.2"},
		{4.99, 2.5, "IEC 60255-151:2009 cl. 5.2"},
		{5, 1.5, "IEC 60255-151:2009 cl. 5.2"},
		{9.99, 1.5, "IEC 60255-151:2009 cl. 5.2"},
		{10, 1, "IEC 60255-151:2009 cl. 5.2"},
		{40, 1, "IEC 60255-151:2009 cl. 5.2"},
	}
	for _, tc := range tests {
		if got := curves.LimitingErrorFactor(tc.multiple); got != tc.want {
			t.Errorf("at %g×: got %v, want %v (%s)", tc.multiple, got, tc.want, tc.source)
		}
	}
}

// TestBandedFixedStages: definite-time and instantaneous stages use the
// plain class with its floor (IEC 60255-151:2009 cl. 5.2).
func TestBandedFixedStages(t *testing.T) {
	acc := curves.Accuracy{ClassPct: 5, MinErrorS: 0.040}
	tests := []struct {
		name                string
		ch                  curves.Characteristic
		currentA            float64
		wantEarly, wantLate float64
	}{
		{"definite 2 s, class governs", curves.DefiniteTime{PickupA: 100, DelayS: 2}, 300, 1.9, 2.1},
		{"definite 2 s at 15x, no multiplier", curves.DefiniteTime{PickupA: 100, DelayS: 2}, 1500, 1.9, 2.1},
		{"definite 0.3 s, floor governs", curves.DefiniteTime{PickupA: 100, DelayS: 0.3}, 300, 0.26, 0.34},
		{"instantaneous, early clipped at 0", curves.Instantaneous{PickupA: 100}, 300, 0, 0.04},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			early, late := curves.Banded(tc.ch, acc)
			e, _ := early.Time(tc.currentA)
			l, _ := late.Time(tc.currentA)
			if math.Abs(e-tc.wantEarly) > roundingRelTol || math.Abs(l-tc.wantLate) > roundingRelTol {
				t.Errorf("got [%v, %v], want [%v, %v]", e, l, tc.wantEarly, tc.wantLate)
			}
			if _, st := early.Time(50); st != curves.NoTrip {
				t.Errorf("early band below pickup: %v", st)
			}
		})
	}
}

func TestBandedOrdering(t *testing.T) {
	r := rand.New(rand.NewPCG(8, 8))
	for n := 0; n < randomCases; n++ {
		f := randomRelay(r)
		acc := curves.Accuracy{ClassPct: r.Float64() * 10, MinErrorS: r.Float64() * 0.1}
		early, late := curves.Banded(f, acc)
		for k := 0; k < 20; k++ {
			currentA := f[0].(curves.InverseTime).PickupA * logUniform(r, 0.8, 60)
			nom, st := f.Time(currentA)
			e, est := early.Time(currentA)
			l, lst := late.Time(currentA)
			if est != st || lst != st {
				t.Fatalf("statuses %v %v %v differ", est, st, lst)
			}
			if st == curves.Operates && !(0 <= e && e <= nom && nom <= l) {
				t.Errorf("%v at %v A, %+v: early %v, nominal %v, late %v", f, currentA, acc, e, nom, l)
			}
		}
	}
}

func TestBandedInvalidAccuracyPanics(t *testing.T) {
	defer func() {
		if recover() == nil {
			t.Error("Banded with a negative class did not panic")
		}
	}()
	curves.Banded(curves.DefiniteTime{PickupA: 1, DelayS: 1}, curves.Accuracy{ClassPct: -5})
}

func TestAccuracyValidate(t *testing.T) {
	if err := (curves.Accuracy{ClassPct: 5, MinErrorS: 0.04}).Validate(); err != nil {
		t.Errorf("valid accuracy: %v", err)
	}
	if err := (curves.Accuracy{ClassPct: math.NaN()}).Validate(); err == nil {
		t.Error("NaN class accepted")
	}
	if err := (curves.Accuracy{MinErrorS: -1}).Validate(); err == nil {
		t.Error("negative floor accepted")
	}
}
