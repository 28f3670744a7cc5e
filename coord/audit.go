package coord

import (
	"fmt"
	"math"
	"strings"

	"tripgrade/faults"
)

// CT limits of common practice: below about 5 % of rated primary current a
// protection CT's ratio error is not specified, and protection classes
// (5P20, C-classes) guarantee accuracy up to 20 × rated current.
const (
	ctLowestPickupFraction = 0.05
	ctAccuracyLimitFactor  = 20
)

// stepTolerance is how close a setting must be to a step of its range to
// count as on it (relative to the step), allowing for decimal settings
// that binary floating point cannot hold exactly.
const stepTolerance = 1e-6

// onStep reports whether v lies on a step of r.
func onStep(v float64, r Range) bool {
	if r.Step == 0 {
		return true
	}
	k := (v - r.Min) / r.Step
	return math.Abs(k-math.Round(k)) <= stepTolerance
}

// rangeProblem describes what is wrong with v against r, or "".
func rangeProblem(what string, v float64, r Range, unit string) string {
	switch {
	case !r.Declared():
		return ""
	case v < r.Min*(1-stepTolerance) || v > r.Max*(1+stepTolerance):
		return fmt.Sprintf("%s %g%s outside the range %g–%g%s", what, v, unit, r.Min, r.Max, unit)
	case !onStep(v, r):
		return fmt.Sprintf("%s %g%s not on a step of %g%s from %g%s", what, v, unit, r.Step, unit, r.Min, unit)
	}
	return ""
}

// settingsAudit checks each relay's settings against its declared ranges
// and its CT: pickups and multipliers inside their ranges and on their
// steps (FAIL otherwise), pickups within the CT's accuracy and thermal
// range (WARN otherwise), and the IEEE C37.110 saturation criterion for
// the maximum fault when the CT class and burden are given (WARN when
// exceeded).
func (c *checker) settingsAudit(i int) ([]Finding, error) {
	d := &c.s.Devices[i]
	if d.Kind != Relay {
		return nil, nil
	}
	var out []Finding
	for _, s := range d.Stages {
		if !s.PickupRange.Declared() && !s.MultiplierRange.Declared() {
			continue
		}
		var problems []string
		if p := rangeProblem("pickup", s.PickupA, s.PickupRange, " A"); p != "" {
			problems = append(problems, p)
		}
		if s.Shape.Dependent() {
			if p := rangeProblem("multiplier", s.Multiplier, s.MultiplierRange, ""); p != "" {
				problems = append(problems, p)
			}
		}
		f := Finding{Check: SettingsAudit, Device: d.Name, Stage: s.Label, Verdict: Pass, Note: "settings inside their declared ranges and on their steps"}
		if len(problems) > 0 {
			f.Verdict, f.Note = Fail, strings.Join(problems, "; ")
		}
		out = append(out, f)
	}
	out = append(out, c.ctRange(d))
	if d.CT.CClassV > 0 {
		f, err := c.saturation(i)
		if err != nil {
			return nil, err
		}
		out = append(out, f)
	}
	return out, nil
}

// CTPickupLimits returns the pickups of stage st that the settings
// audit finds within the CT's range, lowA ≤ pickup ≤ highA (primary
// amperes): at least 5 % of the CT's rating, at most 20 × it, and for an
// inverse-time phase stage at most its continuous thermal rating (common
// practice; a pickup outside is a WARN).
func CTPickupLimits(ct CT, st Stage) (lowA, highA float64) {
	lowA, highA = ctLowestPickupFraction*ct.PrimaryA, ctAccuracyLimitFactor*ct.PrimaryA
	if st.Shape.Dependent() && st.Measures == Phase {
		highA = math.Min(highA, ct.ThermalFactor*ct.PrimaryA)
	}
	return lowA, highA
}

// ctRange checks every pickup against the CT's accuracy and thermal
// range (the limits CTPickupLimits gives).
func (c *checker) ctRange(d *Device) Finding {
	ct := d.CT
	var problems []string
	low := ctLowestPickupFraction * ct.PrimaryA
	thermal := ct.ThermalFactor * ct.PrimaryA
	for _, s := range d.Stages {
		switch {
		case s.PickupA < low:
			problems = append(problems, fmt.Sprintf("stage %s pickup %s A is below %g %% of the CT's %s A rating", s.Label, fmtA(s.PickupA), ctLowestPickupFraction*100, fmtA(ct.PrimaryA)))
		case s.Shape.Dependent() && s.Measures == Phase && s.PickupA > thermal:
			problems = append(problems, fmt.Sprintf("stage %s pickup %s A is above the CT's continuous thermal rating %s A", s.Label, fmtA(s.PickupA), fmtA(thermal)))
		case s.PickupA > ctAccuracyLimitFactor*ct.PrimaryA:
			problems = append(problems, fmt.Sprintf("stage %s pickup %s A is above %g × the CT rating, beyond its accuracy limit", s.Label, fmtA(s.PickupA), float64(ctAccuracyLimitFactor)))
		}
	}
	f := Finding{Check: SettingsAudit, Device: d.Name, Stage: "CT", Verdict: Pass,
		Note: fmt.Sprintf("pickups within the accuracy and thermal range of the %s/%s A CT", fmtA(ct.PrimaryA), fmtA(ct.SecondaryA))}
	if len(problems) > 0 {
		f.Verdict, f.Note = Warn, strings.Join(problems, "; ")
	}
	return f
}

// saturation applies the IEEE C37.110 criterion for a fully offset fault,
// (1 + X/R)·I_F·Z_B ≤ 20, with I_F the largest fault current through the
// device in per unit of the CT rating and Z_B the burden in per unit of
// the C-class standard burden (the class voltage over 20 × rated secondary
// current).
func (c *checker) saturation(i int) (Finding, error) {
	d := &c.s.Devices[i]
	var worst, worstIF, worstXR float64
	var ref FaultRef
	for _, k := range faults.Kinds {
		sol, err := c.sol.solve(c.topo.Zones[i].Start, k, faults.Max)
		if err != nil {
			return Finding{}, err
		}
		a := sol.At(d.Point).PhaseMaxA()
		xr := sol.XR()
		if math.IsInf(xr, 1) {
			xr = 1e6
		}
		ifPU := a / d.CT.PrimaryA
		zb := d.CT.BurdenOhm / (d.CT.CClassV / (ctAccuracyLimitFactor * d.CT.SecondaryA))
		if v := (1 + xr) * ifPU * zb; v > worst {
			worst, worstIF, worstXR = v, ifPU, xr
			ref = FaultRef{Kind: k, Case: faults.Max, Place: PlaceName(c.s.Network, c.topo.Zones[i].Start), DeviceA: a}
		}
	}
	f := atMost(SettingsAudit, worst, ctAccuracyLimitFactor, "")
	f.Device, f.Stage = d.Name, "CT saturation"
	f.Fault = &ref
	f.Note = fmt.Sprintf("IEEE C37.110: (1 + X/R)·I_F·Z_B with X/R %.1f, I_F %.1f × rating, burden %g Ω on C%g", worstXR, worstIF, d.CT.BurdenOhm, d.CT.CClassV)
	if f.Verdict == Fail {
		f.Verdict = Warn
		f.Note += ": the CT may saturate for the maximum fault"
	}
	return f, nil
}
