package curves

import "math"

// Status says whether a characteristic gives a time at a current.
type Status uint8

const (
	Operates  Status = iota // a finite operating (or withstand) time
	NoTrip                  // at or below pickup: the device does not operate
	Undefined               // the characteristic is not defined at this current (outside a table's data, beyond a validity limit)
)

// String returns the status as a report prints it.
func (s Status) String() string {
	switch s {
	case Operates:
		return "operates"
	case NoTrip:
		return "does not operate"
	case Undefined:
		return "not defined"
	}
	return "Status(" + formatValue(float64(s)) + ")"
}

// Characteristic is anything with an operating (or, for damage curves,
// withstand) time at a current.
type Characteristic interface {
	// Time returns the time in seconds at currentA (primary amperes). The
	// float is meaningful only when Status is Operates.
	Time(currentA float64) (float64, Status)
	// Span returns the currents between which Time is defined and
	// operates: low is the pickup (or first table point), high is +Inf
	// when unbounded.
	Span() (lowA, highA float64)
}

// The placeholder times returned with a status other than Operates. They
// are chosen so that a caller who forgets to look at the status cannot
// mistake them for a fast operation: a minimum over stages ignores +Inf and
// any comparison with NaN is false.
var (
	noTripTimeS    = math.Inf(1)
	undefinedTimeS = math.NaN()
)

// noTrip and undefined return the placeholder time with its status.
func noTrip() (float64, Status)    { return noTripTimeS, NoTrip }
func undefined() (float64, Status) { return undefinedTimeS, Undefined }

// badCurrent reports a current that is not a magnitude: NaN or negative.
// Every characteristic answers Undefined for it.
func badCurrent(currentA float64) bool { return !(currentA >= 0) }

// Func adapts a plain function to a Characteristic, for curves this
// package does not model. TimeOf must follow the conventions of the
// package (non-increasing time, Status as documented); LowA and HighA are
// returned by Span.
type Func struct {
	TimeOf      func(currentA float64) (float64, Status)
	LowA, HighA float64
}

// Time calls f.TimeOf.
func (f Func) Time(currentA float64) (float64, Status) { return f.TimeOf(currentA) }

// Span returns f.LowA and f.HighA.
func (f Func) Span() (float64, float64) { return f.LowA, f.HighA }

var _ Characteristic = Func{}
