package curves_test

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"tripgrade/curves"
)

// bisectionRelTol: the bisection stops within 1e-13 of the answer in
// current; after the curve's slope the time agrees to well within this.
const bisectionRelTol = 1e-10

// hidden wraps a characteristic in Func so CurrentFor cannot use its
// closed form and must bisect.
func hidden(ch curves.Characteristic) curves.Characteristic {
	lo, hi := ch.Span()
	return curves.Func{TimeOf: ch.Time, LowA: lo, HighA: hi}
}

func TestCurrentForBisectionMatchesClosedForm(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 7))
	for n := 0; n < randomCases; n++ {
		s := randomStage(r)
		if r.IntN(2) == 0 {
			s.MaxMultiple = 20
		}
		timeS, _ := s.Time(s.PickupA * logUniform(r, 1.05, 19))
		want, wantSt := s.CurrentFor(timeS)
		got, st := curves.CurrentFor(hidden(s), timeS)
		if st != wantSt || relErr(got, want) > bisectionRelTol {
			t.Errorf("%+v at %v s: bisection %v, %v; closed form %v, %v", s, timeS, got, st, want, wantSt)
		}
		// Faster than the stage can ever be: both undefined.
		if s.MaxMultiple > 0 {
			fastest, _ := s.Time(s.PickupA * s.MaxMultiple)
			if _, st := curves.CurrentFor(hidden(s), fastest*0.9); st != curves.Undefined {
				t.Errorf("%+v: bisection found a current for %v s, faster than the stage", s, fastest*0.9)
			}
		}
	}
}

func TestCurrentForTable(t *testing.T) {
	tab, err := curves.NewTable("fuse", []curves.Point{{20, 300}, {40, 10}, {100, 1}, {400, 0.01}})
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name  string
		timeS float64
		wantA float64
		want  curves.Status
	}{
		{"slower than the first point", 1000, 20, curves.Operates},
		{"first point", 300, 20, curves.Operates},
		{"tabulated point", 1, 100, curves.Operates},
		{"last point", 0.01, 400, curves.Operates},
		{"faster than the data", 0.001, 0, curves.Undefined},
		{"negative", -1, 0, curves.Undefined},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, st := curves.CurrentFor(tab, tc.timeS)
			if st != tc.want || (st == curves.Operates && relErr(got, tc.wantA) > bisectionRelTol) {
				t.Errorf("got %v, %v; want %v, %v", got, st, tc.wantA, tc.want)
			}
		})
	}
}

func TestCurrentForI2t(t *testing.T) {
	l, err := curves.NewI2tLimit(1e6, 5)
	if err != nil {
		t.Fatal(err)
	}
	// I = sqrt(I²t/t): sqrt(1e6/0.25) = 2000 A.
	if got, st := curves.CurrentFor(l, 0.25); st != curves.Operates || relErr(got, 2000) > roundingRelTol {
		t.Errorf("CurrentFor(0.25 s) = %v, %v; want 2000 A", got, st)
	}
	if got, st := curves.CurrentFor(hidden(l), 0.25); st != curves.Operates || relErr(got, 2000) > bisectionRelTol {
		t.Errorf("bisection CurrentFor(0.25 s) = %v, %v; want 2000 A", got, st)
	}
	lo, _ := l.Span()
	if got, _ := curves.CurrentFor(l, 60); got != lo {
		t.Errorf("CurrentFor beyond the validity limit = %v, want the span's start %v", got, lo)
	}
}

func TestLogSpace(t *testing.T) {
	got, err := curves.LogSpace(1, 1000, 4)
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{1, 10, 100, 1000}
	for i := range want {
		if relErr(got[i], want[i]) > roundingRelTol {
			t.Errorf("LogSpace(1, 1000, 4)[%d] = %v, want %v", i, got[i], want[i])
		}
	}
	if got[0] != 1 || got[3] != 1000 {
		t.Errorf("endpoints %v, %v not exact", got[0], got[3])
	}
	for _, tc := range []struct {
		name     string
		from, to float64
		n        int
		want     string
	}{
		{"reversed", 10, 1, 5, "from < to"},
		{"one point", 1, 10, 1, "at least 2"},
		{"zero start", 0, 10, 5, "from must be > 0 A (got 0)"},
		{"NaN end", 1, math.NaN(), 5, "to must be a finite number"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := curves.LogSpace(tc.from, tc.to, tc.n); err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want one containing %q", err, tc.want)
			}
		})
	}
}

func TestEvaluate(t *testing.T) {
	dt := curves.DefiniteTime{PickupA: 100, DelayS: 0.3}
	got := curves.Evaluate(dt, []float64{50, 150, math.NaN()})
	want := []curves.Status{curves.NoTrip, curves.Operates, curves.Undefined}
	if len(got) != len(want) {
		t.Fatalf("got %d samples", len(got))
	}
	for i, s := range got {
		if s.Status != want[i] {
			t.Errorf("sample %d: status %v, want %v", i, s.Status, want[i])
		}
	}
	if got[1].CurrentA != 150 || got[1].TimeS != 0.3 {
		t.Errorf("sample 1 = %+v", got[1])
	}
}

func TestStatusString(t *testing.T) {
	for st, want := range map[curves.Status]string{
		curves.Operates: "operates", curves.NoTrip: "does not operate", curves.Undefined: "not defined",
		curves.Status(9): "Status(9)",
	} {
		if st.String() != want {
			t.Errorf("%d: got %q, want %q", st, st.String(), want)
		}
	}
}
