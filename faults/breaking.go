package faults

import "math"

// The decay factors of IEC 60909-0 for the symmetrical breaking current,
// from memory of IEC 60909-0:2016 eq. (70) (μ) and eq. (73) (q). Each is
// given at the four minimum time delays the standard tabulates; between
// them it is interpolated linearly in t_min, as the standard allows, and
// beyond 0.25 s the 0.25 s form holds.

// decayTimes are the minimum time delays t_min of the standard's forms.
var decayTimes = [...]float64{0.02, 0.05, 0.10, 0.25}

// muForms are a + b·e^(−c·I"kG/IrG) for each t_min.
var muForms = [...][3]float64{
	{0.84, 0.26, 0.26},
	{0.71, 0.51, 0.30},
	{0.62, 0.72, 0.32},
	{0.56, 0.94, 0.38},
}

// qForms are a + b·ln(m), m in MW per pair of poles, for each t_min.
var qForms = [...][2]float64{
	{1.03, 0.12},
	{0.79, 0.12},
	{0.57, 0.12},
	{0.26, 0.10},
}

// DecayMu returns μ, the factor by which a synchronous machine's or an
// asynchronous motor's share of the initial current has decayed at the
// minimum time delay tMinS, for its share ratio = I"kG/IrG (or I"kM/IrM)
// at its terminals: 1 when the ratio is at most 2 (a far fault), never
// above 1.
func DecayMu(ratio, tMinS float64) float64 {
	if ratio <= 2 {
		return 1
	}
	mu := interpolateDecay(tMinS, func(i int) float64 {
		f := muForms[i]
		return f[0] + f[1]*math.Exp(-f[2]*ratio)
	})
	return math.Min(mu, 1)
}

// DecayQ returns q, the further decay factor of an asynchronous motor's
// share at tMinS, for mwPerPolePair = P_rM/p; never above 1 nor below 0.
func DecayQ(mwPerPolePair, tMinS float64) float64 {
	q := interpolateDecay(tMinS, func(i int) float64 {
		f := qForms[i]
		return f[0] + f[1]*math.Log(mwPerPolePair)
	})
	return math.Max(0, math.Min(q, 1))
}

// interpolateDecay evaluates form at the standard's time delays around
// tMinS and interpolates linearly; below 0.02 s the 0.02 s form holds.
func interpolateDecay(tMinS float64, form func(i int) float64) float64 {
	last := len(decayTimes) - 1
	switch {
	case tMinS <= decayTimes[0]:
		return form(0)
	case tMinS >= decayTimes[last]:
		return form(last)
	}
	i := 1
	for tMinS > decayTimes[i] {
		i++
	}
	w := (tMinS - decayTimes[i-1]) / (decayTimes[i] - decayTimes[i-1])
	return form(i-1) + w*(form(i)-form(i-1))
}

// defaultMinTimeDelayS is t_min when the Settings give none: the shortest
// the standard's factors cover, which gives the largest breaking current.
const defaultMinTimeDelayS = 0.02

// minTimeDelay returns the Settings' t_min or its default.
func (s Settings) minTimeDelay() float64 {
	if s.MinTimeDelayS > 0 {
		return s.MinTimeDelayS
	}
	return defaultMinTimeDelayS
}
