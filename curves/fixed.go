package curves

import "math"

// DefiniteTime is a definite-time overcurrent stage (50/51 DT): above its
// pickup it operates after DelayS, whatever the current.
type DefiniteTime struct {
	PickupA float64
	DelayS  float64
}

// Instantaneous is an instantaneous overcurrent stage (50). DelayS is an
// optional fixed (intentional) delay; 0 means the stage's time is taken as
// 0 s and the relay's own operating and the breaker's times are left to the
// caller.
type Instantaneous struct {
	PickupA float64
	DelayS  float64
}

var (
	_ Characteristic = DefiniteTime{}
	_ Characteristic = Instantaneous{}
)

// NewDefiniteTime returns a definite-time stage; pickup must be > 0 A and
// the delay >= 0 s.
func NewDefiniteTime(pickupA, delayS float64) (DefiniteTime, error) {
	c := DefiniteTime{PickupA: pickupA, DelayS: delayS}
	if err := validateFixed(pickupA, delayS); err != nil {
		return DefiniteTime{}, err
	}
	return c, nil
}

// NewInstantaneous returns an instantaneous stage; pickup must be > 0 A
// and the delay >= 0 s.
func NewInstantaneous(pickupA, delayS float64) (Instantaneous, error) {
	c := Instantaneous{PickupA: pickupA, DelayS: delayS}
	if err := validateFixed(pickupA, delayS); err != nil {
		return Instantaneous{}, err
	}
	return c, nil
}

func validateFixed(pickupA, delayS float64) error {
	var k checker
	k.positive("pickup", "A", pickupA)
	k.nonNegative("delay", "s", delayS)
	return k.err()
}

// fixedTime is the behaviour the two fixed-time stages share.
func fixedTime(pickupA, delayS, currentA float64) (float64, Status) {
	if badCurrent(currentA) {
		return undefined()
	}
	if !(currentA > pickupA) {
		return noTrip()
	}
	return delayS, Operates
}

// fixedCurrentFor: every current above pickup gives delayS, so the lowest
// current that operates within timeS is the pickup itself (as a limit from
// above) when timeS >= delayS.
func fixedCurrentFor(pickupA, delayS, timeS float64) (float64, Status) {
	if !(timeS >= delayS) {
		return undefined()
	}
	return pickupA, Operates
}

// Time returns DelayS above pickup, NoTrip at or below it.
func (c DefiniteTime) Time(currentA float64) (float64, Status) {
	return fixedTime(c.PickupA, c.DelayS, currentA)
}

// Span returns the pickup and +Inf.
func (c DefiniteTime) Span() (float64, float64) { return c.PickupA, math.Inf(1) }

// CurrentFor returns the pickup when timeS >= DelayS (every current above
// it operates in DelayS), Undefined otherwise.
func (c DefiniteTime) CurrentFor(timeS float64) (float64, Status) {
	return fixedCurrentFor(c.PickupA, c.DelayS, timeS)
}

// Time returns DelayS above pickup, NoTrip at or below it.
func (c Instantaneous) Time(currentA float64) (float64, Status) {
	return fixedTime(c.PickupA, c.DelayS, currentA)
}

// Span returns the pickup and +Inf.
func (c Instantaneous) Span() (float64, float64) { return c.PickupA, math.Inf(1) }

// CurrentFor returns the pickup when timeS >= DelayS, Undefined otherwise.
func (c Instantaneous) CurrentFor(timeS float64) (float64, Status) {
	return fixedCurrentFor(c.PickupA, c.DelayS, timeS)
}
