package propose

import (
	"fmt"

	"tripgrade/coord"
	"tripgrade/faults"
)

// maxReverts bounds the reruns after the checker faults chosen pickups.
const maxReverts = 1

// pickupChecks are the checks whose findings a pickup moves and the
// multipliers do not: a proposal with chosen pickups must not fail one
// that the study passed.
var pickupChecks = map[coord.CheckKind]bool{coord.PrimarySensitivity: true, coord.BackupSensitivity: true, coord.LoadMargin: true}

// NoPickupsError says that Settings.Pickups found no stage whose pickup
// it may choose, and why.
type NoPickupsError struct {
	Kept []string // each stage left as given, with the reason
}

func (e *NoPickupsError) Error() string {
	msg := "no stage's pickup can be chosen"
	if len(e.Kept) == 0 {
		return msg + ": the study has no inverse-time stage of a relay that is not kept"
	}
	msg += ": " + e.Kept[0]
	if len(e.Kept) > 1 {
		msg += fmt.Sprintf(" (and %d more stages)", len(e.Kept)-1)
	}
	return msg
}

// choosePickups is Propose with Settings.Pickups: the admissible
// interval of every searched stage from the checker's findings on the
// study, the margins of the study at the lowest admissible pickups, the
// search (search.go), then the rounds at the chosen pickups.
//
// A lower pickup can widen a device's zone (it then operates first for
// faults beyond it) to faults it cannot detect with the margin, so the
// check at the lowest pickups is also read for the sensitivity and load
// findings it fails where the study passed: those stages keep the
// study's pickups. After the rounds, when such findings are all that
// keeps the proposal from being verified, the chosen pickups they
// concern are set back likewise and the rounds run again (at most
// maxReverts times).
func (pr *Proposal) choosePickups(eng *faults.Engine, topo *coord.Topology, o Settings, index [][]int, ia []float64) error {
	if err := pr.pickupLimits(eng, topo, o); err != nil {
		return err
	}
	col, err := pr.searchPickups(eng, index, ia)
	if err != nil {
		return err
	}
	for attempt := 0; ; attempt++ {
		base := withPickups(pr.Study, pr.Pickups, pr.P)
		if attempt > 0 || !equal(pr.P, lows(pr.Pickups)) {
			// The first round's constraints at the chosen pickups.
			tb, err := coord.NewTopology(base, eng)
			if err != nil {
				return err
			}
			col = newCollector(newLinearizer(base, index, multipliers(base, pr.Vars)), pr.Vars)
			col.inrush(base, ia)
			if _, err := checkEvery(pr.Study, base, eng, tb, col); err != nil {
				return err
			}
		}
		pr.Margins, pr.Unresolved = col.n, nil
		if err := pr.solve(base, eng, index, col, o, ia); err != nil {
			return err
		}
		if pr.Verified() || attempt == maxReverts || !pr.onlyRegressions() || !pr.revert() {
			return nil
		}
	}
}

// pickupLimits checks the study as given and sets the stages to search
// with their admissible intervals, or says why there are none.
func (pr *Proposal) pickupLimits(eng *faults.Engine, topo *coord.Topology, o Settings) error {
	s := pr.Study
	var err error
	if pr.Before, err = checkEvery(s, s, eng, topo, nil); err != nil {
		return err
	}
	keep := map[string]bool{}
	for _, n := range o.Keep {
		keep[n] = true
	}
	pr.Pickups, pr.KeptPickups = pickupVars(s, topo, pr.Before, pr.Vars, keep)
	if len(pr.Pickups) > 0 {
		return nil
	}
	e := &NoPickupsError{}
	for _, k := range pr.KeptPickups {
		d := s.Devices[k.Device]
		e.Kept = append(e.Kept, fmt.Sprintf("relay %q stage %s: %s", d.Name, d.Stages[k.Stage].Label, k.Why))
	}
	return e
}

// searchPickups checks the study at the lowest admissible pickups, keeps
// the study's pickups where that widens a zone past what the stage
// detects, and, when a stage that fails a margin may rise, checks it at
// the highest and searches. It returns the collector of the check at the
// lowest pickups (the first round's, when they are the ones chosen).
func (pr *Proposal) searchPickups(eng *faults.Engine, index [][]int, ia []float64) (*collector, error) {
	s := pr.Study
	low := lows(pr.Pickups)
	s0 := withPickups(s, pr.Pickups, low)
	t0, err := coord.NewTopology(s0, eng)
	if err != nil {
		return nil, err
	}
	col := newCollector(newLinearizer(s0, index, multipliers(s0, pr.Vars)), pr.Vars)
	col.inrush(s0, ia)
	pcLow := newPairCollector(col, newLinearizer(s0, index, multipliers(s0, pr.Vars)), pr.Vars)
	r0, err := coord.CheckWith(s0, eng, t0, coord.Options{Margins: pcLow.margin})
	if err != nil {
		return nil, err
	}
	sr := newSearch(s0, pr.Vars, pr.Pickups, pcLow, ia)
	pr.PickupBy = make([]Limit, len(pr.Pickups))
	faulted := pr.regressions(r0.Findings)
	for k, v := range pr.Pickups {
		if f, ok := faulted.of(s, v); ok {
			sr.fix(k, v.Was)
			pr.PickupBy[k] = Limit{Kind: LimitChecker, A: v.Was, Note: fmt.Sprintf(
				"the study's pickup: at the lowest admissible, %s A, the checker fails the %s finding (%s), which the study passes (a lower pickup widens the zone to faults it cannot detect with the margin)",
				fmtA(v.Low), f.Check, f.Note)}
		}
	}
	pr.P = sr.pickups()
	atLow, atChosen := make([]int, len(low)), make([]int, len(low))
	if len(sr.raisable()) > 0 {
		// The constraints that bind at the highest admissible pickups.
		high := make([]float64, len(pr.Pickups))
		for k, v := range pr.Pickups {
			high[k] = v.High
		}
		sHigh := withPickups(s, pr.Pickups, high)
		tHigh, err := coord.NewTopology(sHigh, eng)
		if err != nil {
			return nil, err
		}
		pcHigh := newPairCollector(nil, newLinearizer(sHigh, index, multipliers(sHigh, pr.Vars)), pr.Vars)
		if _, err := coord.CheckWith(sHigh, eng, tHigh, coord.Options{Margins: pcHigh.margin}); err != nil {
			return nil, err
		}
		sr.addProbe(pcHigh)
		pr.P, atLow, atChosen = sr.run()
	}
	pr.PickupEvals = sr.evals + sr.tries
	pr.pickupBinding(atLow, atChosen)
	return col, nil
}

// equal reports whether two lists of pickups are the same.
func equal(a, b []float64) bool {
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return len(a) == len(b)
}

// lows returns the lowest admissible pickups.
func lows(pv []PickupVar) []float64 {
	out := make([]float64, len(pv))
	for k, v := range pv {
		out[k] = v.Low
	}
	return out
}

// regressions returns the sensitivity and load findings among fs that
// fail where the study's passed, by device (the upstream device of a
// backup finding).
func (pr *Proposal) regressions(fs []coord.Finding) faultedBy {
	before := map[findingKey]bool{}
	for _, f := range pr.Before.Findings {
		if f.Verdict == coord.Fail {
			before[keyOf(f)] = true
		}
	}
	out := faultedBy{}
	for _, f := range fs {
		if !pickupChecks[f.Check] || f.Verdict != coord.Fail || before[keyOf(f)] {
			continue
		}
		name := f.Device
		if f.Check == coord.BackupSensitivity {
			name = f.Other
		}
		out[name] = append(out[name], f)
	}
	return out
}

// faultedBy holds failing findings by device name.
type faultedBy map[string][]coord.Finding

// of returns the first finding that concerns stage v's pickup: one of
// its stage group, or the every-kind finding of its device.
func (fb faultedBy) of(s *coord.Study, v PickupVar) (coord.Finding, bool) {
	q := s.Devices[v.Device].Stages[v.Stage].Measures.String()
	for _, f := range fb[s.Devices[v.Device].Name] {
		if f.Stage == q || f.Stage == "every kind" {
			return f, true
		}
	}
	return coord.Finding{}, false
}

// pickupBinding records what holds each chosen pickup: the limit that
// sets the bottom of its interval, or, for a pickup the search raised,
// the margins it lets the multipliers meet (and the top of the interval
// when it went that far).
func (pr *Proposal) pickupBinding(atLow, atChosen []int) {
	for k, v := range pr.Pickups {
		if pr.PickupBy[k].Kind == LimitChecker {
			continue
		}
		if pr.P[k] == v.Low {
			pr.PickupBy[k] = v.LowBy
			continue
		}
		note := fmt.Sprintf("raised from %s A: at the lowest admissible pickups the multipliers cannot meet %s within their ranges, at this one %s",
			fmtA(v.Low), margins(atLow[k]), margins(atChosen[k]))
		lim := Limit{Kind: LimitGrading, A: pr.P[k], Note: note}
		if pr.P[k] == v.High {
			lim = Limit{Kind: v.HighBy.Kind, A: v.HighBy.A, Note: note + "; as far as " + v.HighBy.Note}
		}
		pr.PickupBy[k] = lim
	}
}

// margins says "1 margin" or "n margins".
func margins(n int) string {
	if n == 1 {
		return "1 margin"
	}
	return fmt.Sprintf("%d margins", n)
}

// onlyRegressions reports whether every finding the proposal leaves
// unresolved is a sensitivity or load finding: only then can setting
// pickups back make it verified.
func (pr *Proposal) onlyRegressions() bool {
	for _, f := range pr.Unresolved {
		if !pickupChecks[f.Check] {
			return false
		}
	}
	return true
}

// revert sets the chosen pickups whose sensitivity or load findings the
// checker fails on the proposal, where it passed the study's, back to
// the study's pickups. It reports whether any moved.
func (pr *Proposal) revert() bool {
	faulted := pr.regressions(pr.Unresolved)
	moved := false
	for k, v := range pr.Pickups {
		f, ok := faulted.of(pr.Study, v)
		if !ok || pr.P[k] == v.Was {
			continue
		}
		tried := pr.P[k]
		pr.P[k], moved = v.Was, true
		pr.PickupBy[k] = Limit{Kind: LimitChecker, A: v.Was,
			Note: fmt.Sprintf("the study's pickup: at %s A the checker fails the %s finding (%s), which the study passes", fmtA(tried), f.Check, f.Note)}
	}
	return moved
}
