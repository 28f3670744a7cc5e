package curves_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"tripgrade/curves"
)

// Tolerances used across the tests.
const (
	// roundingRelTol: a handful of float64 roundings (ulp 2.2e-16) in one
	// evaluation; tighter than any engineering need, loose enough for
	// reordered arithmetic.
	roundingRelTol = 1e-12
	// roundTripRelTol is the round-trip accuracy the package promises for
	// its inverse questions.
	roundTripRelTol = 1e-9
	// randomCases is how many random settings each property test draws.
	randomCases = 500
)

func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// logUniform draws from [lo, hi) evenly in logarithm.
func logUniform(r *rand.Rand, lo, hi float64) float64 {
	return lo * math.Exp(r.Float64()*math.Log(hi/lo))
}

// randomLaw returns one of the standard laws or a random user law.
func randomLaw(r *rand.Rand) curves.Law {
	std := []curves.Shape{curves.ShapeIECSI, curves.ShapeIECVI, curves.ShapeIECEI, curves.ShapeIECLTI,
		curves.ShapeIEEEMI, curves.ShapeIEEEVI, curves.ShapeIEEEEI}
	if i := r.IntN(len(std) + 2); i < len(std) {
		law, _ := std[i].Law()
		return law
	}
	law, err := curves.IEEELaw("random", logUniform(r, 0.01, 200), r.Float64()*0.5, logUniform(r, 0.02, 3), r.Float64()*30)
	if err != nil {
		panic(err)
	}
	return law
}

// randomStage draws a stage with random law, pickup and multiplier.
func randomStage(r *rand.Rand) curves.InverseTime {
	s, err := curves.NewInverseTime(randomLaw(r), logUniform(r, 1, 5000), logUniform(r, 0.02, 15))
	if err != nil {
		panic(err)
	}
	return s
}

func TestInverseTimeStrictlyDecreasing(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 1))
	for n := 0; n < randomCases; n++ {
		s := randomStage(r)
		prev := math.Inf(1)
		m := 1 + logUniform(r, 1e-6, 0.05)
		for m < 100 {
			got, st := s.Time(m * s.PickupA)
			if st != curves.Operates {
				t.Fatalf("%+v at %g×: status %v", s, m, st)
			}
			if !(got < prev) {
				t.Fatalf("%+v: time %v at %g× is not below %v just before", s, got, m, prev)
			}
			prev = got
			m *= 1 + logUniform(r, 0.001, 0.3)
		}
	}
}

func TestInverseTimeLinearInMultiplier(t *testing.T) {
	r := rand.New(rand.NewPCG(2, 2))
	for n := 0; n < randomCases; n++ {
		s := randomStage(r)
		scale := logUniform(r, 0.1, 10)
		scaled := s
		scaled.Multiplier *= scale
		currentA := s.PickupA * logUniform(r, 1.01, 50)
		base, _ := s.Time(currentA)
		got, _ := scaled.Time(currentA)
		if e := relErr(got, scale*base); e > roundingRelTol {
			t.Errorf("%+v at %g A: ×%g multiplier gives %v, want %v (rel err %g)", s, currentA, scale, got, scale*base, e)
		}
	}
}

func TestInverseTimeCurrentForRoundTrip(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 3))
	for n := 0; n < randomCases; n++ {
		s := randomStage(r)
		if r.IntN(2) == 0 {
			s.MaxMultiple = 20
		}
		currentA := s.PickupA * logUniform(r, 1.05, 19.9)
		timeS, _ := s.Time(currentA)
		back, st := s.CurrentFor(timeS)
		if st != curves.Operates || relErr(back, currentA) > roundTripRelTol {
			t.Errorf("%+v: CurrentFor(Time(%v) = %v) = %v, %v", s, currentA, timeS, back, st)
		}
		again, _ := s.Time(back)
		if relErr(again, timeS) > roundTripRelTol {
			t.Errorf("%+v: Time(CurrentFor(%v)) = %v", s, timeS, again)
		}
	}
}

func TestInverseTimeMultiplierForRoundTrip(t *testing.T) {
	r := rand.New(rand.NewPCG(4, 4))
	for n := 0; n < randomCases; n++ {
		s := randomStage(r)
		currentA := s.PickupA * logUniform(r, 1.05, 50)
		wantS := logUniform(r, 0.05, 100)
		m, err := s.MultiplierFor(currentA, wantS)
		if err != nil {
			t.Fatalf("%+v: MultiplierFor(%v, %v): %v", s, currentA, wantS, err)
		}
		set := s
		set.Multiplier = m
		if got, _ := set.Time(currentA); relErr(got, wantS) > roundTripRelTol {
			t.Errorf("%+v: multiplier %v gives %v s at %v A, want %v s", s, m, got, currentA, wantS)
		}
		own, _ := s.Time(currentA)
		if back, _ := s.MultiplierFor(currentA, own); relErr(back, s.Multiplier) > roundTripRelTol {
			t.Errorf("%+v: MultiplierFor its own time gives %v", s, back)
		}
	}
}

func TestInverseTimeStatus(t *testing.T) {
	law, _ := curves.ShapeIECSI.Law()
	s, _ := curves.NewInverseTime(law, 100, 0.1)
	tests := []struct {
		name     string
		currentA float64
		want     curves.Status
	}{
		{"zero", 0, curves.NoTrip},
		{"below pickup", 99.9, curves.NoTrip},
		{"at pickup", 100, curves.NoTrip},
		{"just above pickup", 100 * (1 + 1e-9), curves.Operates},
		{"far above", 1e6, curves.Operates},
		{"infinite", math.Inf(1), curves.Operates},
		{"negative", -1, curves.Undefined},
		{"NaN", math.NaN(), curves.Undefined},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, st := s.Time(tc.currentA)
			if st != tc.want {
				t.Fatalf("status %v, want %v", st, tc.want)
			}
			switch st {
			case curves.Operates:
				if math.IsNaN(got) || math.IsInf(got, 0) || got < 0 {
					t.Errorf("operating time %v is not a finite time", got)
				}
			case curves.NoTrip:
				if !math.IsInf(got, 1) {
					t.Errorf("no-trip placeholder %v, want +Inf", got)
				}
			case curves.Undefined:
				if !math.IsNaN(got) {
					t.Errorf("undefined placeholder %v, want NaN", got)
				}
			}
		})
	}
}

func TestInverseTimeLimits(t *testing.T) {
	law, _ := curves.ShapeIECVI.Law()
	s, _ := curves.NewInverseTime(law, 100, 1)
	s.MaxMultiple = 20
	at20, _ := s.Time(2000)
	// IEC 60255-151 very inverse at 20×, TMS 1: 13.5/19 s (the equation).
	if want := 13.5 / 19; relErr(at20, want) > roundingRelTol {
		t.Errorf("time at 20×: got %v, want %v", at20, want)
	}
	if at30, _ := s.Time(3000); at30 != at20 {
		t.Errorf("beyond MaxMultiple: got %v at 30×, want the 20× time %v", at30, at20)
	}
	if i, st := s.CurrentFor(at20); st != curves.Operates || relErr(i, 2000) > roundTripRelTol {
		t.Errorf("CurrentFor(time at 20×) = %v, %v; want 2000 A", i, st)
	}
	if _, st := s.CurrentFor(at20 * 0.99); st != curves.Undefined {
		t.Errorf("CurrentFor faster than the 20× time: status %v, want undefined", st)
	}

	s.MaxMultiple = 0
	s.MinTimeS = 1
	if got, _ := s.Time(5000); got != 1 {
		t.Errorf("MinTimeS 1 s at 50×: got %v s", got)
	}
	// 13.5/(M−1) = 1 s at M = 14.5.
	if i, st := s.CurrentFor(1); st != curves.Operates || relErr(i, 1450) > roundTripRelTol {
		t.Errorf("CurrentFor(min time) = %v, %v; want 1450 A", i, st)
	}
	if _, st := s.CurrentFor(0.5); st != curves.Undefined {
		t.Errorf("CurrentFor below the min time: status %v, want undefined", st)
	}
	if _, err := s.MultiplierFor(5000, 0.5); err == nil {
		t.Error("MultiplierFor below the min time: no error")
	}
	if _, err := s.MultiplierFor(50, 1); err == nil || !strings.Contains(err.Error(), "not above the pickup") {
		t.Errorf("MultiplierFor below pickup: error %v", err)
	}
	if _, st := s.CurrentFor(math.NaN()); st != curves.Undefined {
		t.Errorf("CurrentFor(NaN): status %v", st)
	}
}

func TestCurrentForIEEEAsymptote(t *testing.T) {
	law, _ := curves.ShapeIEEEEI.Law()
	s, _ := curves.NewInverseTime(law, 100, 2)
	// Without a MaxMultiple the time tends to TD·B = 0.2434 s and never
	// reaches it (IEEE C37.112 equation: A/(M^p−1) → 0).
	if _, st := s.CurrentFor(2 * 0.1217); st != curves.Undefined {
		t.Errorf("CurrentFor(TD·B): status %v, want undefined", st)
	}
	if _, st := s.CurrentFor(2*0.1217 + 1e-3); st != curves.Operates {
		t.Errorf("CurrentFor just above TD·B: status %v, want operates", st)
	}
}

func TestInverseTimeValidation(t *testing.T) {
	law, _ := curves.ShapeIECSI.Law()
	tests := []struct {
		name       string
		law        curves.Law
		pickupA    float64
		multiplier float64
		want       []string
	}{
		{"negative pickup", law, -5, 0.1, []string{"pickup must be > 0 A (got -5)"}},
		{"zero multiplier", law, 100, 0, []string{"multiplier must be > 0 (got 0)"}},
		{"NaN pickup and negative multiplier", law, math.NaN(), -1,
			[]string{"pickup must be a finite number (got NaN)", "multiplier must be > 0 (got -1)"}},
		{"empty law", curves.Law{}, 100, 0.1, []string{"A must be > 0 s (got 0)", "P must be > 0 (got 0)"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := curves.NewInverseTime(tc.law, tc.pickupA, tc.multiplier)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
			var se *curves.SettingError
			if !errors.As(err, &se) {
				t.Errorf("error %v is not a *SettingError", err)
			}
		})
	}
	s, _ := curves.NewInverseTime(law, 100, 0.1)
	s.MaxMultiple = 0.5
	if err := s.Validate(); err == nil || !strings.Contains(err.Error(), "max multiple must be > 1") {
		t.Errorf("MaxMultiple 0.5: error %v", err)
	}
}

// TestResetTime checks the IEEE C37.112-2018 reset equation
// t_r = TD·tr/(1 − M²); each want is worked by hand in its comment.
func TestResetTime(t *testing.T) {
	mi, _ := curves.ShapeIEEEMI.Law()
	vi, _ := curves.ShapeIEEEVI.Law()
	ei, _ := curves.ShapeIEEEEI.Law()
	si, _ := curves.ShapeIECSI.Law()
	tests := []struct {
		name     string
		law      curves.Law
		td       float64
		multiple float64
		wantS    float64
		want     curves.Status
	}{
		{"vi TD 1 at 0.5", vi, 1, 0.5, 28.8, curves.Operates},            // 21.6/(1 − 0.25) = 28.8
		{"mi TD 2 at zero", mi, 2, 0, 9.7, curves.Operates},              // 2·4.85/(1 − 0) = 9.7
		{"ei TD 0.5 at 0.8", ei, 0.5, 0.8, 29.1 / 0.72, curves.Operates}, // 0.5·29.1/(1 − 0.64) = 40.4167
		{"ei TD 1 at 0.99", ei, 1, 0.99, 29.1 / 0.0199, curves.Operates}, // 29.1/(1 − 0.9801) = 1462.3
		{"at pickup", vi, 1, 1, 0, curves.NoTrip},                        // not resetting
		{"iec law has no reset", si, 1, 0.5, 0, curves.Undefined},        // IEC 60255-151 gives none here
	}
	const pickupA = 200
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := curves.NewInverseTime(tc.law, pickupA, tc.td)
			if err != nil {
				t.Fatal(err)
			}
			got, st := s.ResetTime(tc.multiple * pickupA)
			if st != tc.want {
				t.Fatalf("status %v, want %v", st, tc.want)
			}
			if st == curves.Operates && relErr(got, tc.wantS) > roundingRelTol {
				t.Errorf("got %v s, want %v s", got, tc.wantS)
			}
		})
	}
}

// TestInverseTimeNearPickup: just above pickup M^P − 1 is tiny and a naive
// evaluation loses digits. The reference uses the binomial series
// (1+x)^P − 1 = Px + P(P−1)x²/2 + P(P−1)(P−2)x³/6 + … (textbook), whose
// fourth term is below 1e-24 relative for x ≤ 1e-6.
func TestInverseTimeNearPickup(t *testing.T) {
	for _, shape := range []curves.Shape{curves.ShapeIECSI, curves.ShapeIEEEMI, curves.ShapeIECEI} {
		law, _ := shape.Law()
		s, _ := curves.NewInverseTime(law, 1, 1)
		for _, x := range []float64{1e-6, 1e-8, 1e-10} {
			// The multiple actually evaluated: 1+x rounded to float64.
			m := 1 + x
			x = m - 1
			p := law.P
			series := p*x + p*(p-1)*x*x/2 + p*(p-1)*(p-2)*x*x*x/6
			want := law.A/series + law.B
			got, st := s.Time(m)
			if st != curves.Operates || relErr(got, want) > roundingRelTol {
				t.Errorf("%s at 1+%g: got %v s, want %v s (rel err %g)", shape, x, got, want, relErr(got, want))
			}
		}
	}
}
