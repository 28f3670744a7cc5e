package curves_test

import (
	"math"
	"strings"
	"testing"

	"tripgrade/curves"
)

func TestFixedStages(t *testing.T) {
	dt, err := curves.NewDefiniteTime(500, 0.4)
	if err != nil {
		t.Fatal(err)
	}
	inst, err := curves.NewInstantaneous(3000, 0)
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name     string
		ch       curves.Characteristic
		currentA float64
		wantS    float64
		want     curves.Status
	}{
		{"definite below", dt, 400, 0, curves.NoTrip},
		{"definite at pickup", dt, 500, 0, curves.NoTrip},
		{"definite above", dt, 500.001, 0.4, curves.Operates},
		{"definite far above", dt, 1e5, 0.4, curves.Operates},
		{"definite NaN", dt, math.NaN(), 0, curves.Undefined},
		{"instantaneous at pickup", inst, 3000, 0, curves.NoTrip},
		{"instantaneous above", inst, 3001, 0, curves.Operates},
		{"instantaneous negative", inst, -3001, 0, curves.Undefined},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, st := tc.ch.Time(tc.currentA)
			if st != tc.want || (st == curves.Operates && got != tc.wantS) {
				t.Errorf("got %v, %v; want %v, %v", got, st, tc.wantS, tc.want)
			}
		})
	}
	if lo, hi := dt.Span(); lo != 500 || !math.IsInf(hi, 1) {
		t.Errorf("Span = %v, %v", lo, hi)
	}
	if i, st := dt.CurrentFor(0.5); st != curves.Operates || i != 500 {
		t.Errorf("CurrentFor(0.5 s) = %v, %v; want the pickup", i, st)
	}
	if _, st := dt.CurrentFor(0.3); st != curves.Undefined {
		t.Errorf("CurrentFor faster than the delay: %v", st)
	}
}

func TestFixedStageValidation(t *testing.T) {
	tests := []struct {
		name string
		make func() error
		want []string
	}{
		{"definite zero pickup", func() error { _, err := curves.NewDefiniteTime(0, 0.3); return err },
			[]string{"pickup must be > 0 A (got 0)"}},
		{"definite negative delay", func() error { _, err := curves.NewDefiniteTime(100, -0.1); return err },
			[]string{"delay must be >= 0 s (got -0.1)"}},
		{"instantaneous both bad", func() error { _, err := curves.NewInstantaneous(-5, math.Inf(1)); return err },
			[]string{"pickup must be > 0 A (got -5)", "delay must be a finite number (got +Inf)"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := tc.make()
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
