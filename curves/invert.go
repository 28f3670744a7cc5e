package curves

import (
	"fmt"
	"math"
)

// currentFinder is implemented by characteristics that invert their own
// time in closed form.
type currentFinder interface {
	CurrentFor(timeS float64) (float64, Status)
}

// Search limits for CurrentFor on characteristics without a closed form.
const (
	// searchRelTol stops the bisection when the bracket's ratio is within
	// this of 1; a few hundred ulps, far below any measurement accuracy.
	searchRelTol = 1e-13
	// searchMaxSteps bounds the bisection; halving the logarithm of a
	// bracket of 1e300 down to 1e-13 takes under 70 steps.
	searchMaxSteps = 200
	// searchCeilingA is the largest current tried when the span is
	// unbounded: far above any fault current on Earth.
	searchCeilingA = 1e15
)

// CurrentFor returns the lowest current at which ch operates (Status
// Operates) in at most timeS seconds. Characteristics with a closed form
// (InverseTime, DefiniteTime, Instantaneous, I2tLimit, Fastest) answer
// themselves; for the others it bisects in log space within ch.Span(),
// assuming, as the package does everywhere, that time does not increase
// with current. It is Undefined when no current in the span is that fast
// and for a NaN or negative timeS.
//
// For a flat stretch (a definite-time stage) the answer is where the
// stretch starts, even if the stage itself only operates above it.
func CurrentFor(ch Characteristic, timeS float64) (float64, Status) {
	if f, ok := ch.(currentFinder); ok {
		return f.CurrentFor(timeS)
	}
	if !(timeS >= 0) {
		return undefined()
	}
	fast := func(currentA float64) bool {
		t, st := ch.Time(currentA)
		return st == Operates && t <= timeS
	}
	lo, hi := ch.Span()
	if !(lo >= 0) || math.IsNaN(hi) || !(hi >= lo) {
		return undefined()
	}
	if fast(lo) {
		return lo, Operates
	}
	if math.IsInf(hi, 1) {
		hi = math.Max(2*lo, 1)
		for !fast(hi) {
			if hi > searchCeilingA {
				return undefined()
			}
			hi *= 10
		}
	} else if !fast(hi) {
		return undefined()
	}
	if lo == 0 {
		lo = hi * 1e-300
	}
	for step := 0; step < searchMaxSteps && hi > lo*(1+searchRelTol); step++ {
		mid := math.Sqrt(lo) * math.Sqrt(hi)
		if fast(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, Operates
}

// Sample is the answer of a characteristic at one current.
type Sample struct {
	CurrentA float64
	TimeS    float64 // meaningful only when Status is Operates
	Status   Status
}

// Evaluate returns ch's time at each current, in order.
func Evaluate(ch Characteristic, currentsA []float64) []Sample {
	out := make([]Sample, len(currentsA))
	for i, a := range currentsA {
		t, st := ch.Time(a)
		out[i] = Sample{CurrentA: a, TimeS: t, Status: st}
	}
	return out
}

// LogSpace returns n currents from fromA to toA (both included) evenly
// spaced in logarithm, the natural spacing for a time-current curve. It
// needs 0 < fromA < toA and n >= 2.
func LogSpace(fromA, toA float64, n int) ([]float64, error) {
	var k checker
	k.positive("from", "A", fromA)
	k.positive("to", "A", toA)
	if err := k.err(); err != nil {
		return nil, err
	}
	if !(toA > fromA) {
		return nil, fmt.Errorf("log spacing needs from < to (got %s A to %s A)", formatValue(fromA), formatValue(toA))
	}
	if n < 2 {
		return nil, fmt.Errorf("log spacing needs at least 2 points (got %d)", n)
	}
	out := make([]float64, n)
	ratio := math.Log(toA / fromA)
	for i := range out {
		out[i] = fromA * math.Exp(ratio*float64(i)/float64(n-1))
	}
	out[0], out[n-1] = fromA, toA
	return out, nil
}
