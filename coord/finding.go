package coord

import (
	"fmt"
	"math"
	"strings"

	"tripgrade/faults"
)

// Verdict is the outcome of one finding.
type Verdict uint8

// Verdicts. Warn covers both a figure worth a look that the criteria do not
// fail, and a check that could not be made (the note says which).
// Accepted is a failing or warning finding that a reviewer accepted with
// an [[accept]] entry (see Accept): it is counted apart and fails nothing.
const (
	Pass Verdict = iota
	Warn
	Fail
	Accepted
)

// String returns "PASS", "WARN", "FAIL" or "ACCEPTED".
func (v Verdict) String() string { return [...]string{"PASS", "WARN", "FAIL", "ACCEPTED"}[v] }

// CheckKind names a check.
type CheckKind uint8

// The checks, in report order.
const (
	Grading CheckKind = iota
	PrimarySensitivity
	BackupSensitivity
	LoadMargin
	InstantaneousReach
	Inrush
	Damage
	SettingsAudit
	// Discrimination: no device operates for a fault outside its zone
	// before the devices that must clear it (judged fault by fault).
	Discrimination
	// Clearing: every fault is cleared, within the maximum clearing time,
	// by devices of the faulted element's own.
	Clearing
)

// CheckKinds lists the checks in report order.
var CheckKinds = [...]CheckKind{Clearing, Discrimination, Grading, PrimarySensitivity, BackupSensitivity, LoadMargin, InstantaneousReach, Inrush, Damage, SettingsAudit}

// String returns the check's name as reports print it.
func (c CheckKind) String() string {
	return [...]string{"grading margin", "primary sensitivity", "backup sensitivity", "load margin",
		"instantaneous reach", "inrush", "damage", "settings audit", "discrimination", "fault clearing"}[c]
}

// Slug returns the check's name for machine-readable output.
func (c CheckKind) Slug() string {
	return [...]string{"grading", "primary_sensitivity", "backup_sensitivity", "load", "instantaneous_reach",
		"inrush", "damage", "settings", "discrimination", "clearing"}[c]
}

// Timed reports whether the check's findings carry operating times of
// their devices (FaultRef.DeviceS and OtherS), zero included; the other
// checks leave them unset.
func (c CheckKind) Timed() bool { return c == Grading || c == Damage }

// Finding is one line of the verdict: a check on a device (or a pair),
// what was measured, what was required, and the fault behind the figure.
type Finding struct {
	Check   CheckKind
	Device  string // the device checked (the downstream device of a pair)
	Other   string // the upstream device of a pair, or the equipment protected
	Stage   string // stage label or stage group ("phase", "ground"), when it matters
	Verdict Verdict
	// Measured and Required are in Unit; Relation says how they must
	// compare ("≥" or "≤"). Margin is how far Measured lies on the safe
	// side of Required, in Unit (negative when the check fails). Valid is
	// false when no figure could be computed.
	Measured, Required, Margin float64
	Unit                       string
	Relation                   string
	Valid                      bool
	// Fault is the fault behind the figure, when there is one.
	Fault *FaultRef
	Note  string
	// Acceptance is set when an [[accept]] entry covers the finding; the
	// Verdict is then Accepted (see Accept).
	Acceptance *Acceptance
	// Scenario names the operating configuration the finding was made in
	// (see Scenario); "" for a study checked without scenarios.
	Scenario string
}

// FaultRef describes the fault behind a figure.
type FaultRef struct {
	Kind  faults.Kind
	Case  faults.Case
	Place string
	// Interpolated is true for a point of the sweep, whose currents are
	// those of the solved fault of this kind, case and place scaled by
	// Scale (a fault of the same kind and place with more fault
	// impedance; see sweep.go).
	Interpolated bool
	// Scale is the factor applied to the solved fault's currents at a
	// point of the sweep; 1 (or 0 in a FaultRef built by hand) for a
	// solved fault.
	Scale float64
	// Currents and times of the device checked and of the other device (0
	// when not part of the check); a time is NaN when the device does not
	// operate.
	DeviceA, OtherA float64
	DeviceS, OtherS float64
	// DeviceQty and OtherQty say which current each figure is: the phase
	// current or the residual current (when a ground stage set the time).
	DeviceQty, OtherQty Quantity
}

// Pair is a backup pair: Upstream backs up Downstream.
type Pair struct {
	Upstream, Downstream int
	// Manual is true for a pair added by a [[pair]] entry.
	Manual bool
}

// Result is the outcome of checking a study.
type Result struct {
	Pairs    []Pair
	Excluded []Pair // derived pairs the study excluded
	Findings []Finding
	// Notes say what the checks assumed or left to others (sources and
	// generators whose own protection clears what no device of the study
	// stands between), for the report's header.
	Notes []string
}

// Counts returns the number of findings of each verdict; accepted
// findings are counted apart by Accepted.
func (r *Result) Counts() (pass, warn, fail int) {
	for _, f := range r.Findings {
		switch f.Verdict {
		case Pass:
			pass++
		case Warn:
			warn++
		case Fail:
			fail++
		}
	}
	return pass, warn, fail
}

// Failed reports whether any finding fails.
func (r *Result) Failed() bool {
	_, _, f := r.Counts()
	return f > 0
}

// atLeast builds a finding for "measured ≥ required". Figures that are
// not finite numbers cannot be compared: the finding is then WARN, and
// settle gives the reason.
func atLeast(c CheckKind, measured, required float64, unit string) Finding {
	f := Finding{Check: c, Measured: measured, Required: required, Margin: snapMargin(measured-required, measured, required),
		Unit: unit, Relation: "≥", Valid: true}
	f.Verdict = judge(f)
	return f
}

// atMost builds a finding for "measured ≤ required", with atLeast's rule
// for figures that are not finite.
func atMost(c CheckKind, measured, required float64, unit string) Finding {
	f := Finding{Check: c, Measured: measured, Required: required, Margin: snapMargin(required-measured, measured, required),
		Unit: unit, Relation: "≤", Valid: true}
	f.Verdict = judge(f)
	return f
}

// snapMargin returns margin, or 0 when it is rounding residue: no more
// than roundingShare of the figures it is the difference of. Two
// definite-time delays 0.3 s apart give 0.57 − 0.27 − 0.3 = 5.6e-17 s in
// binary floating point, and the verdict must not hang on the last bit
// (a nanosecond in a second is far below any relay's resolution).
func snapMargin(margin, measured, required float64) float64 {
	if math.Abs(margin) <= roundingShare*math.Max(1, math.Max(math.Abs(measured), math.Abs(required))) {
		return 0
	}
	return margin
}

// roundingShare is the share of a finding's figures below which their
// difference counts as none.
const roundingShare = 1e-9

// judge gives a valid finding's verdict from its margin: a negative margin
// fails, a figure that is not a finite number (a NaN margin compares false
// with everything) is not a verdict at all.
func judge(f Finding) Verdict {
	switch {
	case nonFinite(f) != "":
		return Warn
	case f.Margin < 0:
		return Fail
	}
	return Pass
}

// nonFinite names the first figure of f that is not a finite number, with
// its value, or returns "".
func nonFinite(f Finding) string {
	type figure struct {
		name string
		v    float64
	}
	var buf [8]figure // on the stack: every finding of a check passes here
	figs := buf[:0]
	if f.Valid {
		figs = append(figs, figure{"measured figure", f.Measured}, figure{"required figure", f.Required}, figure{"margin", f.Margin})
	}
	if ft := f.Fault; ft != nil {
		figs = append(figs, figure{"device current", ft.DeviceA}, figure{"other current", ft.OtherA})
		if ft.Interpolated {
			figs = append(figs, figure{"sweep scale", ft.Scale})
		}
		if f.Check.Timed() {
			figs = append(figs, figure{"device time", ft.DeviceS}, figure{"other time", ft.OtherS})
		}
	}
	for _, x := range figs {
		if math.IsNaN(x.v) || math.IsInf(x.v, 0) {
			return fmt.Sprintf("the %s is %v, not a number that can be judged", x.name, x.v)
		}
	}
	return ""
}

// settle enforces, after a check has finished a finding, the rule every
// finding obeys: one with a figure that is not a finite number is WARN
// "not checked", saying which figure, never PASS or FAIL, whatever the
// check did to its verdict and note after building it.
func settle(f *Finding) {
	why := nonFinite(*f)
	if why == "" {
		return
	}
	f.Verdict = Warn
	if !strings.HasPrefix(f.Note, "not checked") {
		note := "not checked: " + why
		if f.Note != "" {
			note += "; " + f.Note
		}
		f.Note = note
	}
}

// unchecked builds a finding for a check that could not be made.
func unchecked(c CheckKind, note string) Finding {
	return Finding{Check: c, Verdict: Warn, Note: "not checked: " + note}
}
