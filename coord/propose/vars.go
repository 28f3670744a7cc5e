package propose

import (
	"fmt"
	"math"

	"tripgrade/coord"
	"tripgrade/curves"
)

// Variable is one inverse-time stage whose multiplier the search may set.
type Variable struct {
	Device, Stage int // indices into the study's devices and the device's stages
	Range         coord.Range
	// Declared is true when the study declares the range; otherwise it is
	// Settings.DefaultTMS or DefaultTD.
	Declared bool
	// Was is the stage's multiplier in the study.
	Was float64
}

// Settings choose what the search may change. The zero value is the
// documented default: every inverse-time stage of every relay, in its
// declared multiplier range or, where it declares none, in DefaultTMS or
// DefaultTD's defaults.
type Settings struct {
	// Keep names devices whose settings stay as they are (a utility's
	// relay; fuses are always kept).
	Keep []string
	// DefaultTMS and DefaultTD are the multiplier ranges of stages that
	// declare none, for IEC (TMS) and IEEE (TD) forms; zero Ranges mean
	// DefaultTMSRange and DefaultTDRange.
	DefaultTMS, DefaultTD coord.Range
	// MaxRounds bounds the rounds of solving and verifying (0: 6).
	MaxRounds int
	// Pickups also chooses the pickups of inverse-time stages from their
	// declared ranges (see pickups.go).
	Pickups bool
}

// Default multiplier ranges of stages that declare none. Numerical relays
// commonly offer at least a TMS of 0.05–1.0 in steps of 0.01, and, for
// the IEEE C37.112 form with the standard's constants (TD multiplying the
// whole expression), a TD of 0.1–3 in steps of 0.01 (common practice,
// from memory: dials of 0.5–15 belong to relays whose constants are the
// standard's divided by about 5). A study states its relays' real ranges
// with multiplier_range.
var (
	DefaultTMSRange = coord.Range{Min: 0.05, Max: 1.0, Step: 0.01}
	DefaultTDRange  = coord.Range{Min: 0.1, Max: 3.0, Step: 0.01}
)

func (o Settings) rounds() int {
	if o.MaxRounds > 0 {
		return o.MaxRounds
	}
	return 6
}

// variables lists the stages the search sets, in study order, and maps
// each (device, stage) to its variable (−1 for a fixed stage).
func variables(s *coord.Study, o Settings) ([]Variable, [][]int, error) {
	keep := map[string]bool{}
	for _, name := range o.Keep {
		keep[name] = true
	}
	tms, td := o.DefaultTMS, o.DefaultTD
	if !tms.Declared() {
		tms = DefaultTMSRange
	}
	if !td.Declared() {
		td = DefaultTDRange
	}
	var vars []Variable
	index := make([][]int, len(s.Devices))
	for i, d := range s.Devices {
		index[i] = make([]int, len(d.Stages))
		for j, st := range d.Stages {
			index[i][j] = -1
			if d.Kind != coord.Relay || keep[d.Name] || !st.Shape.Dependent() {
				continue
			}
			if _, ok := st.Curve.(curves.InverseTime); !ok {
				return nil, nil, fmt.Errorf("relay %q stage %s: an inverse-time stage without an inverse-time curve", d.Name, st.Label)
			}
			v := Variable{Device: i, Stage: j, Range: st.MultiplierRange, Declared: st.MultiplierRange.Declared(), Was: st.Multiplier}
			if !v.Declared {
				v.Range = tms
				if st.Shape.MultiplierName() == "TD" {
					v.Range = td
				}
			}
			index[i][j] = len(vars)
			vars = append(vars, v)
		}
	}
	return vars, index, nil
}

// stepless is the resolution at which a range declared without a step
// is set: numerical relays set TMS and TD in steps of 0.001 or finer
// (common practice, from memory). A proposal on the exact continuous
// optimum would sit on its margins to the last bit of the arithmetic.
const stepless = 0.001

// grid returns the setting grid of r: its first setting and its step.
func grid(r coord.Range) (start, step float64) {
	if r.Step > 0 {
		return r.Min, r.Step
	}
	return 0, stepless
}

// onStep returns the least setting of r at or above x: a step of its
// grid (rounded to 12 significant digits, so that decimal steps print as
// written) at or above Min. Values within 1e-9 of a step count as on it.
func onStep(x float64, r coord.Range) float64 {
	if x < r.Min {
		x = r.Min
	}
	start, step := grid(r)
	k := math.Ceil((x-start)/step - 1e-9)
	return tidy(start + k*step)
}

// tidy rounds v to 12 significant digits.
func tidy(v float64) float64 {
	if v == 0 || math.IsInf(v, 0) || math.IsNaN(v) {
		return v
	}
	e := math.Pow(10, 11-math.Floor(math.Log10(math.Abs(v))))
	return math.Round(v*e) / e
}

// topStep returns the highest setting of r: its top, or the last step
// below it.
func topStep(r coord.Range) float64 {
	return floorStep(r.Max, r)
}

// floorStep returns the highest setting of r at or below x (Min when x
// lies below it).
func floorStep(x float64, r coord.Range) float64 {
	if x <= r.Min {
		return r.Min
	}
	start, step := grid(r)
	k := math.Floor((x-start)/step + 1e-9)
	return math.Max(r.Min, tidy(start+k*step))
}
