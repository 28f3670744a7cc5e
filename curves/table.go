package curves

import (
	"fmt"
	"math"
)

// Point is one point of a tabulated curve.
type Point struct {
	CurrentA float64
	TimeS    float64
}

// Table is a tabulated time-current curve: a fuse's minimum-melt or
// total-clearing curve, a recloser curve, any curve read off a published
// graph.
//
// Between points it interpolates linearly in log current–log time: each
// segment is a power law t = tᵢ·(I/Iᵢ)^sᵢ, the straight line such a graph
// draws on log–log paper, which passes exactly through the points and
// never rises where the data do not (monotone). It does not extrapolate:
// it is defined on the closed range from the first to the last point and
// Undefined outside it. With WithPickup it also knows a current at or
// below which the device does not operate.
type Table struct {
	name    string
	pts     []Point
	slopes  []float64 // d ln t / d ln I of segment i, between pts[i] and pts[i+1]
	pickupA float64   // 0 when none
}

var _ Characteristic = (*Table)(nil)

// minTablePoints is the fewest points that make a curve.
const minTablePoints = 2

// A PointError reports a point of a table that is not acceptable. Index
// counts from 0 in the slice given to NewTable.
type PointError struct {
	Table   string
	Index   int
	Point   Point
	Problem string
}

// Error implements the error interface.
func (e *PointError) Error() string {
	return fmt.Sprintf("table %q: point index %d (%s A, %s s): %s",
		e.Table, e.Index, formatValue(e.Point.CurrentA), formatValue(e.Point.TimeS), e.Problem)
}

// NewTable returns a tabulated curve through pts, which must have at least
// two points, every current and time finite and > 0, currents strictly
// increasing and times not increasing. Every offending point is reported,
// each error naming its index. The table keeps its own copy of pts.
func NewTable(name string, pts []Point) (*Table, error) {
	if len(pts) < minTablePoints {
		return nil, fmt.Errorf("table %q needs at least %d points (got %d)", name, minTablePoints, len(pts))
	}
	var k checker
	bad := func(i int, format string, args ...any) {
		k.add(&PointError{Table: name, Index: i, Point: pts[i], Problem: fmt.Sprintf(format, args...)})
	}
	for i, p := range pts {
		if !usable(p.CurrentA) || !usable(p.TimeS) {
			bad(i, "current and time must be finite and > 0")
			continue
		}
		if i == 0 || !usable(pts[i-1].CurrentA) || !usable(pts[i-1].TimeS) {
			continue
		}
		prev := pts[i-1]
		if !(p.CurrentA > prev.CurrentA) {
			bad(i, "current must be above the previous point's %s A (points sorted by increasing current, no repeats)",
				formatValue(prev.CurrentA))
		}
		if p.TimeS > prev.TimeS {
			bad(i, "time rises from the previous point's %s s; time must not increase with current",
				formatValue(prev.TimeS))
		}
	}
	if err := k.err(); err != nil {
		return nil, err
	}
	t := &Table{name: name, pts: append([]Point(nil), pts...), slopes: make([]float64, len(pts)-1)}
	for i := range t.slopes {
		a, b := pts[i], pts[i+1]
		t.slopes[i] = math.Log(b.TimeS/a.TimeS) / math.Log(b.CurrentA/a.CurrentA)
	}
	return t, nil
}

func usable(v float64) bool { return v > 0 && !math.IsInf(v, 1) }

// WithPickup returns a copy of t that does not operate at or below
// pickupA, which must be > 0 A and not above the first point's current.
// Between pickupA and the first point the curve is still Undefined: the
// table has no data there.
func (t *Table) WithPickup(pickupA float64) (*Table, error) {
	var k checker
	k.positive("pickup", "A", pickupA)
	if err := k.err(); err != nil {
		return nil, err
	}
	if first := t.pts[0].CurrentA; pickupA > first {
		return nil, fmt.Errorf("table %q: pickup %s A is above the first point's current %s A",
			t.name, formatValue(pickupA), formatValue(first))
	}
	c := *t
	c.pickupA = pickupA
	return &c, nil
}

// Name returns the name given to NewTable.
func (t *Table) Name() string { return t.name }

// Points returns a copy of the table's points.
func (t *Table) Points() []Point { return append([]Point(nil), t.pts...) }

// PickupA returns the pickup set with WithPickup, 0 when none.
func (t *Table) PickupA() float64 { return t.pickupA }

// Time returns the interpolated time. It is exactly the tabulated time at
// a tabulated current, NoTrip at or below the pickup (if one is set), and
// Undefined below the first point, above the last, or for a NaN or
// negative current.
func (t *Table) Time(currentA float64) (float64, Status) {
	if badCurrent(currentA) {
		return undefined()
	}
	if t.pickupA > 0 && currentA <= t.pickupA {
		return noTrip()
	}
	n := len(t.pts)
	if currentA < t.pts[0].CurrentA || currentA > t.pts[n-1].CurrentA {
		return undefined()
	}
	// Binary search for the segment: the last i with pts[i].CurrentA <= currentA.
	lo, hi := 0, n-1
	for hi-lo > 1 {
		mid := int(uint(lo+hi) >> 1)
		if t.pts[mid].CurrentA <= currentA {
			lo = mid
		} else {
			hi = mid
		}
	}
	if currentA == t.pts[hi].CurrentA {
		return t.pts[hi].TimeS, Operates
	}
	a, b := t.pts[lo], t.pts[hi]
	if currentA == a.CurrentA {
		return a.TimeS, Operates
	}
	v := a.TimeS * math.Pow(currentA/a.CurrentA, t.slopes[lo])
	// Clamp to the segment's end times so rounding can never make the
	// curve rise across a tabulated point.
	return math.Min(math.Max(v, b.TimeS), a.TimeS), Operates
}

// Span returns the first and last tabulated currents.
func (t *Table) Span() (float64, float64) {
	return t.pts[0].CurrentA, t.pts[len(t.pts)-1].CurrentA
}
