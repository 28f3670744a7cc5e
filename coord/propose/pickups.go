package propose

import (
	"fmt"
	"math"

	"tripgrade/coord"
	"tripgrade/curves"
)

// Choosing pickups (Settings.Pickups).
//
// Each inverse-time stage that declares a pickup range may take any
// pickup on the range's steps between two limits the checker itself
// applies:
//
//   - from below: the load-margin check, pickup ≥ load_factor × the
//     maximum load through the relay (phase stages that load current
//     reaches: coord's figure, LoadThrough, referred by the transformers'
//     rated winding ratios), and the CT's accuracy range (≥ 5 % of its
//     rating, coord.CTPickupLimits);
//   - from above: primary sensitivity, pickup ≤ the zone's minimum fault
//     ÷ sensitivity_primary, and backup sensitivity, pickup ≤ the minimum
//     fault at the far end of every zone it backs up ÷ sensitivity_backup
//     (the minimum currents are those the checker's findings report,
//     stage group by stage group), and the CT's thermal and accuracy
//     limits.
//
// The figures are read from the checker's findings on the study as
// given, so each limit is exactly the comparison the checker makes.
// search.go chooses within these intervals.

// LimitKind says what sets one end of a pickup's admissible interval, or
// what holds a chosen pickup where it is.
type LimitKind uint8

// Limits of a pickup.
const (
	LimitRange   LimitKind = iota // the declared pickup_range_a
	LimitCT                       // the CT's accuracy or thermal range
	LimitLoad                     // the load-margin check
	LimitPrimary                  // primary sensitivity
	LimitBackup                   // backup sensitivity
	LimitGrading                  // raised by the search so that margins can be met
	LimitChecker                  // set back to the study's pickup: the checker faulted the choice
)

// String names the limit as the proposal prints it.
func (k LimitKind) String() string {
	return [...]string{"range", "CT", "load", "sensitivity", "sensitivity", "grading", "checker"}[k]
}

// Limit is one end of a pickup's admissible interval, or what holds a
// chosen pickup.
type Limit struct {
	Kind LimitKind
	A    float64 // the bound in primary amperes, before the step
	Note string  // the checker's figures behind it
}

// PickupVar is an inverse-time stage whose pickup the search chooses.
type PickupVar struct {
	Var           int // its multiplier variable
	Device, Stage int
	Range         coord.Range // as declared, primary amperes
	// Step is the step searched: the range's, or for a range declared
	// without one, pickupStepless × the CT's rating.
	Step float64
	Was  float64
	// Low and High are the admissible interval, on the steps; LowBy and
	// HighBy the limits that set them.
	Low, High     float64
	LowBy, HighBy Limit
}

// KeptPickup is a stage whose pickup --pickups leaves as given, and why.
type KeptPickup struct {
	Device, Stage int
	Why           string
}

// pickupStepless is the pickup resolution of a range declared without a
// step, as a fraction of the CT's rated primary current: numerical relays
// set pickups in steps of 0.01 × rated current (common practice, from
// memory).
const pickupStepless = 0.01

// at returns the k-th setting of the stage's grid.
func (v *PickupVar) at(k int) float64 { return tidy(v.Range.Min + float64(k)*v.Step) }

// top returns the index of the last setting at or below the range's top.
func (v *PickupVar) top() int { return int(math.Floor((v.Range.Max-v.Range.Min)/v.Step + 1e-9)) }

// index returns the grid index of pickup a (which lies on the grid).
func (v *PickupVar) index(a float64) int { return int(math.Round((a - v.Range.Min) / v.Step)) }

// limitTest is one limit with the checker's own comparison.
type limitTest struct {
	lim Limit
	ok  func(a float64) bool
}

// pickupVars lists the stages whose pickups the search chooses, with
// their admissible intervals from the checker's findings on the study as
// given (before), and the stages it leaves as given.
func pickupVars(s *coord.Study, topo *coord.Topology, before *coord.Result, vars []Variable, keep map[string]bool) ([]PickupVar, []KeptPickup) {
	fs := indexFindings(before)
	var pv []PickupVar
	var kept []KeptPickup
	isVar := map[[2]int]bool{}
	for _, v := range vars {
		if s.Devices[v.Device].Stages[v.Stage].PickupRange.Declared() {
			isVar[[2]int{v.Device, v.Stage}] = true
		}
	}
	for i, v := range vars {
		st := s.Devices[v.Device].Stages[v.Stage]
		if !st.PickupRange.Declared() {
			kept = append(kept, KeptPickup{v.Device, v.Stage, "no pickup_range_a declared: pickup kept as given"})
			continue
		}
		p := PickupVar{Var: i, Device: v.Device, Stage: v.Stage, Range: st.PickupRange, Step: st.PickupRange.Step, Was: st.PickupA}
		if p.Step <= 0 {
			p.Step = pickupStepless * s.Devices[v.Device].CT.PrimaryA
		}
		lows, highs := limitTests(s, topo, fs, isVar, v.Device, v.Stage)
		if why, ok := p.admissible(lows, highs); !ok {
			kept = append(kept, KeptPickup{v.Device, v.Stage, why})
			continue
		}
		pv = append(pv, p)
	}
	// Definite-time and instantaneous stages that declare a pickup range
	// are named, so that a reader knows they were not searched.
	for i, d := range s.Devices {
		if d.Kind != coord.Relay || keep[d.Name] {
			continue
		}
		for j, st := range d.Stages {
			if !st.Shape.Dependent() && st.PickupRange.Declared() {
				why := "definite-time stage: it grades by its delay and its reach, which the search does not set; pickup kept as given"
				if st.Shape == curves.ShapeInstantaneous {
					why = "instantaneous stage: set for reach, which the search does not set; pickup kept as given"
				}
				kept = append(kept, KeptPickup{i, j, why})
			}
		}
	}
	return pv, kept
}

// admissible sets Low and High on the grid from the limits, or says why
// no setting of the range meets them.
func (p *PickupVar) admissible(lows, highs []limitTest) (string, bool) {
	lowBy, highBy := lows[0].lim, highs[0].lim
	for _, t := range lows[1:] {
		if t.lim.A >= lowBy.A {
			lowBy = t.lim
		}
	}
	for _, t := range highs[1:] {
		if t.lim.A <= highBy.A {
			highBy = t.lim
		}
	}
	all := func(ts []limitTest, a float64) bool {
		for _, t := range ts {
			if !t.ok(a) {
				return false
			}
		}
		return true
	}
	top := p.top()
	lo := max(0, int(math.Ceil((lowBy.A-p.Range.Min)/p.Step-1e-9)))
	for lo <= top && !all(lows, p.at(lo)) {
		lo++
	}
	hi := min(top, int(math.Floor((highBy.A-p.Range.Min)/p.Step+1e-9)))
	for hi >= 0 && !all(highs, p.at(hi)) {
		hi--
	}
	if lo > hi || hi < 0 || lo > top {
		return fmt.Sprintf("no pickup of the range meets both limits: at least %s A (%s), at most %s A (%s); pickup kept as given",
			fmtA(lowBy.A), lowBy.Note, fmtA(highBy.A), highBy.Note), false
	}
	p.Low, p.High, p.LowBy, p.HighBy = p.at(lo), p.at(hi), lowBy, highBy
	return "", true
}

// findings indexes the checker's findings by check, device, other and
// stage, and the backup-sensitivity findings by upstream device and
// stage group, each list in the checker's order.
type findings struct {
	byKey  map[findingKey][]coord.Finding
	backup map[[2]string][]coord.Finding
}

func indexFindings(r *coord.Result) findings {
	fs := findings{byKey: map[findingKey][]coord.Finding{}, backup: map[[2]string][]coord.Finding{}}
	for _, f := range r.Findings {
		k := keyOf(f)
		fs.byKey[k] = append(fs.byKey[k], f)
		if f.Check == coord.BackupSensitivity {
			fs.backup[[2]string{f.Other, f.Stage}] = append(fs.backup[[2]string{f.Other, f.Stage}], f)
		}
	}
	return fs
}

// limitTests returns the lower and upper limits of stage j of device i,
// each with the checker's comparison.
func limitTests(s *coord.Study, topo *coord.Topology, fs findings, isVar map[[2]int]bool, i, j int) (lows, highs []limitTest) {
	d := &s.Devices[i]
	st := d.Stages[j]
	crit := s.Criteria
	r := st.PickupRange
	g := func(v float64) string { return fmt.Sprintf("%g", v) }
	lows = append(lows, limitTest{Limit{LimitRange, r.Min, fmt.Sprintf("range %s–%s A", g(r.Min), g(r.Max))}, func(float64) bool { return true }})
	highs = append(highs, limitTest{Limit{LimitRange, r.Max, fmt.Sprintf("range %s–%s A", g(r.Min), g(r.Max))}, func(float64) bool { return true }})
	ctLow, ctHigh := coord.CTPickupLimits(d.CT, st)
	lows = append(lows, limitTest{Limit{LimitCT, ctLow, fmt.Sprintf("5 %% of the %s A CT", fmtA(d.CT.PrimaryA))}, func(a float64) bool { return !(a < ctLow) }})
	highNote := fmt.Sprintf("20 × the %s A CT", fmtA(d.CT.PrimaryA))
	if ctHigh < 20*d.CT.PrimaryA {
		highNote = fmt.Sprintf("the CT's continuous thermal rating, %s A", fmtA(ctHigh))
	}
	highs = append(highs, limitTest{Limit{LimitCT, ctHigh, highNote}, func(a float64) bool { return !(a > ctHigh) }})
	q := st.Measures.String()
	// Load: the load-margin check judges the lowest pickup of the phase
	// stages load current reaches.
	if st.Measures == coord.Phase && reachedByLoad(topo, d, st) {
		for _, f := range fs.byKey[findingKey{coord.LoadMargin, d.Name, "", "phase"}] {
			if !f.Valid || math.IsNaN(f.Required) || math.IsInf(f.Required, 0) {
				continue
			}
			req := f.Required
			src := "the sum of the loads beyond"
			if d.MaxLoadA > 0 {
				src = "declared max_load_a"
			}
			note := fmt.Sprintf("load margin: %g × %s A maximum load (%s)", crit.LoadFactor, fmtA(req/crit.LoadFactor), src)
			lows = append(lows, limitTest{Limit{LimitLoad, req, note}, func(a float64) bool { return a-req >= 0 }})
		}
	}
	// Sensitivity: the checks judge the lowest pickup of the stage group;
	// a fixed stage of the group that meets a limit already lets the
	// check pass whatever this stage's pickup.
	groupMeets := func(ok func(float64) bool) bool {
		for k, o := range d.Stages {
			if k != j && o.Measures == st.Measures && !isVar[[2]int{i, k}] && ok(o.PickupA) {
				return true
			}
		}
		return false
	}
	sens := func(kind LimitKind, f coord.Finding, factor float64, what string) {
		if !f.Valid || f.Fault == nil || math.IsNaN(f.Measured) || math.IsInf(f.Measured, 0) {
			return
		}
		m := f.Measured
		ok := func(a float64) bool { return m-factor*a >= 0 }
		if groupMeets(ok) {
			return
		}
		note := fmt.Sprintf("%s: %s A (%s %s @ %s) ÷ %g", what, fmtA(m), f.Fault.Kind, f.Fault.Case, f.Fault.Place, factor)
		highs = append(highs, limitTest{Limit{kind, m / factor, note}, ok})
	}
	for _, f := range fs.byKey[findingKey{coord.PrimarySensitivity, d.Name, "", q}] {
		sens(LimitPrimary, f, crit.SensitivityPrimary, "primary sensitivity")
	}
	for _, f := range fs.backup[[2]string{d.Name, q}] {
		sens(LimitBackup, f, crit.SensitivityBackup, "backup sensitivity over "+f.Device)
	}
	return lows, highs
}

// reachedByLoad reports whether load current reaches a phase stage: a
// directional stage looking against the load's flow does not see it (as
// the load-margin check takes it).
func reachedByLoad(topo *coord.Topology, d *coord.Device, st coord.Stage) bool {
	loadDir := coord.Forward
	if !topo.IntoBranch(d.Point) {
		loadDir = coord.Reverse
	}
	return st.Direction == coord.NonDirectional || st.Direction == loadDir
}

// withPickups returns a copy of the study with pickup p[k] on stage
// pv[k] (devices and stages copied, everything else shared).
func withPickups(s *coord.Study, pv []PickupVar, p []float64) *coord.Study {
	out := copyStages(s)
	for k, v := range pv {
		setPickup(&out.Devices[v.Device].Stages[v.Stage], p[k])
	}
	return out
}

// setPickup sets an inverse-time stage's pickup.
func setPickup(st *coord.Stage, a float64) {
	c := st.Curve.(curves.InverseTime)
	c.PickupA = a
	st.PickupA, st.Curve = a, c
}

// fmtA formats a current for a note.
func fmtA(a float64) string {
	if a >= 100 {
		return fmt.Sprintf("%.0f", a)
	}
	return fmt.Sprintf("%.3g", a)
}
