package curves

import "math"

// Fastest is a relay's operating time: the fastest of its stages.
//
// Time returns the minimum time over the stages that operate. When none
// operates it is NoTrip if at least one stage answered NoTrip, and
// Undefined only if every stage is Undefined (or there are no stages). So
// a stage that is undefined at a current (a table outside its data) is
// passed over when another stage answers; callers who must know use Time
// of each stage.
type Fastest []Characteristic

var _ Characteristic = Fastest{}

// Time returns the fastest operating time over the stages.
func (f Fastest) Time(currentA float64) (float64, Status) {
	best, status := undefined()
	for _, ch := range f {
		t, st := ch.Time(currentA)
		switch {
		case st == Operates:
			if status != Operates || t < best {
				best, status = t, Operates
			}
		case st == NoTrip && status == Undefined:
			best, status = noTrip()
		}
	}
	return best, status
}

// Span returns the lowest low and the highest high of the stages; with no
// stages both are +Inf (an empty span).
func (f Fastest) Span() (float64, float64) {
	if len(f) == 0 {
		return math.Inf(1), math.Inf(1)
	}
	low, high := math.Inf(1), math.Inf(-1)
	for _, ch := range f {
		l, h := ch.Span()
		low = math.Min(low, l)
		high = math.Max(high, h)
	}
	return low, high
}

// CurrentFor returns the lowest current at which some stage operates in
// at most timeS: the least of the stages' answers.
func (f Fastest) CurrentFor(timeS float64) (float64, Status) {
	best, status := undefined()
	for _, ch := range f {
		i, st := CurrentFor(ch, timeS)
		if st == Operates && (status != Operates || i < best) {
			best, status = i, Operates
		}
	}
	return best, status
}
