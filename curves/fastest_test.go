package curves_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"tripgrade/curves"
)

// randomRelay draws an inverse stage with, at random, a definite-time and
// an instantaneous stage above it.
func randomRelay(r *rand.Rand) curves.Fastest {
	inv := randomStage(r)
	f := curves.Fastest{inv}
	if r.IntN(2) == 0 {
		f = append(f, curves.DefiniteTime{PickupA: inv.PickupA * logUniform(r, 1.5, 10), DelayS: logUniform(r, 0.05, 2)})
	}
	if r.IntN(2) == 0 {
		f = append(f, curves.Instantaneous{PickupA: inv.PickupA * logUniform(r, 5, 30), DelayS: r.Float64() * 0.05})
	}
	return f
}

func TestFastestIsMinimumOfStages(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 5))
	for n := 0; n < randomCases; n++ {
		f := randomRelay(r)
		currentA := f[0].(curves.InverseTime).PickupA * logUniform(r, 0.5, 60)
		want, wantSt := math.Inf(1), curves.NoTrip
		for _, s := range f {
			if ts, st := s.Time(currentA); st == curves.Operates {
				want, wantSt = math.Min(want, ts), curves.Operates
			}
		}
		got, st := f.Time(currentA)
		if st != wantSt || (st == curves.Operates && got != want) {
			t.Errorf("%v at %v A: got %v, %v; want %v, %v", f, currentA, got, st, want, wantSt)
		}
	}
}

func TestFastestStatusRule(t *testing.T) {
	table, err := curves.NewTable("t", []curves.Point{{1000, 10}, {2000, 1}})
	if err != nil {
		t.Fatal(err)
	}
	dt := curves.DefiniteTime{PickupA: 1500, DelayS: 0.5}
	tests := []struct {
		name     string
		f        curves.Fastest
		currentA float64
		wantS    float64
		want     curves.Status
	}{
		{"empty", curves.Fastest{}, 100, 0, curves.Undefined},
		{"all undefined", curves.Fastest{table}, 100, 0, curves.Undefined},
		{"no-trip beats undefined", curves.Fastest{table, dt}, 100, 0, curves.NoTrip},
		{"operating beats undefined", curves.Fastest{table, dt}, 3000, 0.5, curves.Operates},
		{"minimum of two operating", curves.Fastest{table, dt}, 1800, 0.5, curves.Operates},
		{"table alone operating", curves.Fastest{dt, table}, 1200, 0, curves.Operates},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, st := tc.f.Time(tc.currentA)
			if st != tc.want {
				t.Fatalf("status %v, want %v", st, tc.want)
			}
			if tc.wantS != 0 && got != tc.wantS {
				t.Errorf("got %v s, want %v s", got, tc.wantS)
			}
		})
	}
	if lo, hi := (curves.Fastest{table, dt}).Span(); lo != 1000 || !math.IsInf(hi, 1) {
		t.Errorf("Span = %v, %v; want 1000, +Inf", lo, hi)
	}
}

func TestFastestCurrentFor(t *testing.T) {
	r := rand.New(rand.NewPCG(6, 6))
	for n := 0; n < randomCases; n++ {
		f := randomRelay(r)
		timeS := logUniform(r, 0.01, 50)
		got, st := curves.CurrentFor(f, timeS)
		if st != curves.Operates {
			continue
		}
		// Just above the answer the relay is at least that fast; just
		// below it, slower (or not operating).
		if ts, s := f.Time(got * (1 + 1e-9)); s != curves.Operates || ts > timeS*(1+roundTripRelTol) {
			t.Errorf("%v: %v A for %v s, but just above it %v, %v", f, got, timeS, ts, s)
		}
		if ts, s := f.Time(got * (1 - 1e-6)); s == curves.Operates && ts <= timeS {
			t.Errorf("%v: %v A for %v s, but below it already %v s", f, got, timeS, ts)
		}
	}
}
