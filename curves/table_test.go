package curves_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"

	"tripgrade/curves"
)

// randomTable draws a valid table of 2–15 points: increasing currents,
// non-increasing times, with some flat stretches.
func randomTable(r *rand.Rand) []curves.Point {
	n := 2 + r.IntN(14)
	pts := make([]curves.Point, n)
	currentA, timeS := logUniform(r, 1, 1000), logUniform(r, 10, 10000)
	for i := range pts {
		pts[i] = curves.Point{CurrentA: currentA, TimeS: timeS}
		currentA *= 1 + logUniform(r, 0.01, 3)
		if r.IntN(6) != 0 {
			timeS /= 1 + logUniform(r, 0.01, 20)
		}
	}
	return pts
}

func TestTablePassesThroughPoints(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 9))
	for n := 0; n < randomCases; n++ {
		pts := randomTable(r)
		tab, err := curves.NewTable("random", pts)
		if err != nil {
			t.Fatal(err)
		}
		for i, p := range pts {
			if got, st := tab.Time(p.CurrentA); st != curves.Operates || got != p.TimeS {
				t.Errorf("point %d %+v: got %v, %v", i, p, got, st)
			}
		}
	}
}

func TestTableMonotoneBetweenPoints(t *testing.T) {
	r := rand.New(rand.NewPCG(10, 10))
	for n := 0; n < randomCases; n++ {
		pts := randomTable(r)
		tab, _ := curves.NewTable("random", pts)
		lo, hi := tab.Span()
		currents := make([]float64, 200)
		for i := range currents {
			currents[i] = logUniform(r, lo, hi)
		}
		currents = append(currents, lo, hi)
		sort.Float64s(currents)
		prev := math.Inf(1)
		for _, c := range currents {
			got, st := tab.Time(c)
			if st != curves.Operates {
				t.Fatalf("%v at %v A: status %v", pts, c, st)
			}
			if got > prev {
				t.Fatalf("%v: time rises to %v at %v A from %v", pts, got, c, prev)
			}
			prev = got
		}
		// Between two points the time stays between their times.
		for i := 0; i+1 < len(pts); i++ {
			mid := math.Sqrt(pts[i].CurrentA * pts[i+1].CurrentA)
			got, _ := tab.Time(mid)
			if got > pts[i].TimeS || got < pts[i+1].TimeS {
				t.Errorf("segment %d: %v s at %v A outside [%v, %v]", i, got, mid, pts[i+1].TimeS, pts[i].TimeS)
			}
		}
	}
}

// TestTableReproducesPowerLaw: a power law t = K·I^−n is a straight line
// on log–log axes (textbook property of logarithms), so a table of points
// on I²t = K interpolates back to I²t = K everywhere between them.
func TestTableReproducesPowerLaw(t *testing.T) {
	const i2t = 4e6
	var pts []curves.Point
	for _, c := range []float64{100, 250, 800, 3000} {
		pts = append(pts, curves.Point{CurrentA: c, TimeS: i2t / (c * c)})
	}
	tab, _ := curves.NewTable("i2t", pts)
	for _, c := range []float64{130, 400, 1234, 2999} {
		got, _ := tab.Time(c)
		if e := relErr(got*c*c, i2t); e > roundingRelTol {
			t.Errorf("at %v A: I²t = %v, want %v", c, got*c*c, i2t)
		}
	}
}

func TestTableOutsideData(t *testing.T) {
	tab, _ := curves.NewTable("fuse", []curves.Point{{20, 300}, {400, 0.01}})
	tests := []struct {
		name     string
		currentA float64
		want     curves.Status
	}{
		{"below first point", 19.99, curves.Undefined},
		{"zero", 0, curves.Undefined},
		{"above last point", 400.01, curves.Undefined},
		{"NaN", math.NaN(), curves.Undefined},
		{"first point", 20, curves.Operates},
		{"last point", 400, curves.Operates},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if _, st := tab.Time(tc.currentA); st != tc.want {
				t.Errorf("status %v, want %v", st, tc.want)
			}
		})
	}
	withPickup, err := tab.WithPickup(15)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		currentA float64
		want     curves.Status
	}{{10, curves.NoTrip}, {15, curves.NoTrip}, {17, curves.Undefined}, {20, curves.Operates}} {
		if _, st := withPickup.Time(tc.currentA); st != tc.want {
			t.Errorf("with pickup 15 A at %v A: status %v, want %v", tc.currentA, st, tc.want)
		}
	}
	if _, st := tab.Time(10); st != curves.Undefined {
		t.Error("WithPickup changed the original table")
	}
	if _, err := tab.WithPickup(25); err == nil {
		t.Error("pickup above the first point accepted")
	}
	if _, err := tab.WithPickup(-1); err == nil {
		t.Error("negative pickup accepted")
	}
}

func TestTableErrors(t *testing.T) {
	tests := []struct {
		name    string
		pts     []curves.Point
		indices []int
		want    string
	}{
		{"too short", []curves.Point{{10, 1}}, nil, "at least 2 points (got 1)"},
		{"empty", nil, nil, "at least 2 points (got 0)"},
		{"unsorted", []curves.Point{{10, 5}, {30, 2}, {20, 1}}, []int{2}, "current must be above"},
		{"repeated current", []curves.Point{{10, 5}, {10, 2}}, []int{1}, "no repeats"},
		{"time rises", []curves.Point{{10, 5}, {20, 6}, {30, 1}}, []int{1}, "time must not increase"},
		{"negative time", []curves.Point{{10, 5}, {20, -1}}, []int{1}, "finite and > 0"},
		{"NaN current and zero time", []curves.Point{{math.NaN(), 5}, {20, 1}, {30, 0}}, []int{0, 2}, "finite and > 0"},
		{"infinite time", []curves.Point{{10, math.Inf(1)}, {20, 1}}, []int{0}, "finite and > 0"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := curves.NewTable("fuse 63A", tc.pts)
			if err == nil {
				t.Fatal("no error")
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %q does not contain %q", err, tc.want)
			}
			var got []int
			var list curves.SettingErrors
			if errors.As(err, &list) {
				for _, e := range list {
					var pe *curves.PointError
					if errors.As(e, &pe) {
						got = append(got, pe.Index)
					}
				}
			} else {
				var pe *curves.PointError
				if errors.As(err, &pe) {
					got = append(got, pe.Index)
				}
			}
			if len(got) != len(tc.indices) {
				t.Fatalf("error %q names indices %v, want %v", err, got, tc.indices)
			}
			for i := range got {
				if got[i] != tc.indices[i] {
					t.Errorf("indices %v, want %v", got, tc.indices)
				}
			}
		})
	}
}

func TestTableAccessors(t *testing.T) {
	pts := []curves.Point{{20, 300}, {400, 0.01}}
	tab, _ := curves.NewTable("fuse", pts)
	pts[0].TimeS = 1
	if got := tab.Points(); got[0].TimeS != 300 {
		t.Error("table shares the caller's slice")
	}
	got := tab.Points()
	got[1].TimeS = 5
	if v, _ := tab.Time(400); v != 0.01 {
		t.Error("Points returns the table's own slice")
	}
	if tab.Name() != "fuse" || tab.PickupA() != 0 {
		t.Errorf("name %q pickup %v", tab.Name(), tab.PickupA())
	}
}
