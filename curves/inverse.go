package curves

import (
	"fmt"
	"math"
)

// InverseTime is a dependent-time overcurrent stage (51/51N).
//
// Its time at current I is Multiplier·(A/((I/PickupA)^P − 1) + B) for
// I > PickupA (IEC 60255-151:2009 and IEEE C37.112-2018 equations, see
// Law). At or below pickup it does not operate. Use NewInverseTime, or
// Validate after setting the optional fields; Time does not check the
// settings again.
type InverseTime struct {
	Law        Law
	PickupA    float64
	Multiplier float64 // TMS for IEC shapes, TD for IEEE shapes
	// MaxMultiple, when not 0, is the multiple of pickup above which the
	// time stays at its value there (definite beyond it). IEC 60255-151
	// has a dependent-time range ending at a declared definite-time point,
	// commonly 20× setting. 0 = off.
	MaxMultiple float64
	// MinTimeS, when not 0, is a floor on the operating time. 0 = off.
	MinTimeS float64
}

var _ Characteristic = InverseTime{}

// NewInverseTime returns a stage with the given law, pickup (primary
// amperes) and multiplier, with MaxMultiple and MinTimeS off. It reports
// every setting that is out of range.
func NewInverseTime(law Law, pickupA, multiplier float64) (InverseTime, error) {
	c := InverseTime{Law: law, PickupA: pickupA, Multiplier: multiplier}
	if err := c.Validate(); err != nil {
		return InverseTime{}, err
	}
	return c, nil
}

// Validate reports every setting that is out of range: the law's
// constants, pickup > 0 A, multiplier > 0, MaxMultiple 0 or > 1, MinTimeS
// >= 0 s.
func (c InverseTime) Validate() error {
	var k checker
	k.add(c.Law.Validate())
	k.add(c.validateSettings("multiplier"))
	return k.err()
}

// validateSettings checks everything but the law; multiplierName is what
// the user calls the multiplier (TMS, TD).
func (c InverseTime) validateSettings(multiplierName string) error {
	var k checker
	k.positive("pickup", "A", c.PickupA)
	k.positive(multiplierName, "", c.Multiplier)
	if k.finite("max multiple", c.MaxMultiple) && c.MaxMultiple != 0 && !(c.MaxMultiple > 1) {
		k.fail("max multiple", "> 1 (or 0 for off)", "", c.MaxMultiple)
	}
	k.nonNegative("min time", "s", c.MinTimeS)
	return k.err()
}

// Time returns the operating time at currentA: NoTrip at or below pickup,
// Undefined for a NaN or negative current.
func (c InverseTime) Time(currentA float64) (float64, Status) {
	if badCurrent(currentA) {
		return undefined()
	}
	m := currentA / c.PickupA
	if !(m > 1) {
		return noTrip()
	}
	if c.MaxMultiple > 0 && m > c.MaxMultiple {
		m = c.MaxMultiple
	}
	t := c.Multiplier * c.Law.base(m)
	if t < c.MinTimeS {
		t = c.MinTimeS
	}
	return t, Operates
}

// Span returns the pickup and +Inf.
func (c InverseTime) Span() (float64, float64) { return c.PickupA, math.Inf(1) }

// fastestS is the shortest time the stage can give: at MaxMultiple, or
// Multiplier·B as the current grows without bound, never below MinTimeS.
func (c InverseTime) fastestS() float64 {
	t := c.Multiplier * c.Law.B
	if c.MaxMultiple > 0 {
		t = c.Multiplier * c.Law.base(c.MaxMultiple)
	}
	return math.Max(t, c.MinTimeS)
}

// CurrentFor returns the lowest current at which the stage operates in at
// most timeS seconds, in closed form. It is Undefined when no current is
// that fast (timeS below the time at MaxMultiple, below MinTimeS, or not
// above Multiplier·B) and for a NaN or negative timeS. For very long times
// the answer approaches the pickup.
func (c InverseTime) CurrentFor(timeS float64) (float64, Status) {
	if !(timeS >= 0) || timeS < c.fastestS() || !(timeS > c.Multiplier*c.Law.B) {
		return undefined()
	}
	m := c.Law.multipleFor(timeS / c.Multiplier)
	if c.MaxMultiple > 0 && m > c.MaxMultiple {
		m = c.MaxMultiple
	}
	return m * c.PickupA, Operates
}

// MultiplierFor returns the TMS or TD that makes the stage operate in
// timeS seconds at currentA, keeping the pickup, law and limits. It fails
// when the current is not above pickup, when timeS is not positive, or
// when timeS is below MinTimeS.
func (c InverseTime) MultiplierFor(currentA, timeS float64) (float64, error) {
	var k checker
	k.positive("time", "s", timeS)
	k.nonNegative("current", "A", currentA)
	if err := k.err(); err != nil {
		return 0, err
	}
	m := currentA / c.PickupA
	if !(m > 1) {
		return 0, fmt.Errorf("current %s A is not above the pickup %s A, so no multiplier gives a time",
			formatValue(currentA), formatValue(c.PickupA))
	}
	if timeS < c.MinTimeS {
		return 0, fmt.Errorf("time %s s is below the stage's minimum time %s s",
			formatValue(timeS), formatValue(c.MinTimeS))
	}
	if c.MaxMultiple > 0 && m > c.MaxMultiple {
		m = c.MaxMultiple
	}
	base := c.Law.base(m)
	if !(base > 0) || math.IsInf(base, 0) {
		return 0, fmt.Errorf("the law gives %s s at %s× pickup, so no multiplier gives %s s",
			formatValue(base), formatValue(m), formatValue(timeS))
	}
	return timeS / base, nil
}

// ResetTime returns the IEEE C37.112-2018 reset time
// t_r = Multiplier·ResetS/(1 − M²) for M = currentA/PickupA < 1: how long
// the stage takes to reset fully from operation when the current falls to
// currentA. It is NoTrip at or above pickup (the stage does not reset
// there) and Undefined when the law has no reset characteristic or the
// current is NaN or negative.
func (c InverseTime) ResetTime(currentA float64) (float64, Status) {
	if badCurrent(currentA) || c.Law.ResetS == 0 {
		return undefined()
	}
	m := currentA / c.PickupA
	if !(m < 1) {
		return noTrip()
	}
	return c.Multiplier * c.Law.ResetS / (1 - m*m), Operates
}
