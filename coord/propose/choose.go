package propose

import (
	"fmt"

	"tripgrade/coord"
	"tripgrade/faults"
)

// maxReverts bounds the reruns after the checker faults chosen pickups.
const maxReverts = 2

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
// search (search.go), then the rounds at the chosen pickups. A chosen
// pickup whose sensitivity or load finding the checker then fails, where
// it passed the study's, is set back to the study's pickup and the rounds
// run again (at most maxReverts times).
func (pr *Proposal) choosePickups(eng *faults.Engine, topo *coord.Topology, o Settings, index [][]int, ia []float64) error {
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
	if len(pr.Pickups) == 0 {
		e := &NoPickupsError{}
		for _, k := range pr.KeptPickups {
			d := s.Devices[k.Device]
			e.Kept = append(e.Kept, fmt.Sprintf("relay %q stage %s: %s", d.Name, d.Stages[k.Stage].Label, k.Why))
		}
		return e
	}
	low := make([]float64, len(pr.Pickups))
	for k, v := range pr.Pickups {
		low[k] = v.Low
	}
	s0 := withPickups(s, pr.Pickups, low)
	t0, err := coord.NewTopology(s0, eng)
	if err != nil {
		return err
	}
	store := &sampleStore{}
	if _, err := coord.CheckWith(s0, eng, t0, coord.Options{Margins: store.margin}); err != nil {
		return err
	}
	samples := store.sorted()
	from := newLinearizer(s0, index, multipliers(s0, pr.Vars))
	sr := newSearch(s0, index, pr.Vars, pr.Pickups, samples, ia)
	var atLow, atChosen []int
	pr.P, atLow, atChosen = sr.run()
	pr.PickupEvals = sr.evals
	pr.pickupBinding(atLow, atChosen)
	for attempt := 0; ; attempt++ {
		base := withPickups(s, pr.Pickups, pr.P)
		lin := newLinearizer(base, index, multipliers(base, pr.Vars))
		lin.from = from
		col := newCollector(lin, pr.Vars)
		for i := range samples {
			col.margin(&samples[i])
		}
		col.inrush(base, ia)
		pr.Margins, pr.Unresolved = col.n, nil
		if err := pr.solve(base, eng, index, col, o, ia); err != nil {
			return err
		}
		if pr.Verified() || attempt == maxReverts || !pr.revert() {
			return nil
		}
	}
}

// pickupBinding records what holds each chosen pickup: the limit that
// sets the bottom of its interval, or, for a pickup the search raised,
// the margins it lets the multipliers meet (and the top of the interval
// when it went that far).
func (pr *Proposal) pickupBinding(atLow, atChosen []int) {
	pr.PickupBy = make([]Limit, len(pr.Pickups))
	for k, v := range pr.Pickups {
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

// revert sets the chosen pickups of the devices whose sensitivity or
// load findings the checker fails on the proposal, where it passed the
// study's, back to the study's pickups. It reports whether any moved.
func (pr *Proposal) revert() bool {
	faulted := map[string]coord.Finding{}
	for _, f := range pr.Unresolved {
		if !pickupChecks[f.Check] {
			continue
		}
		name := f.Device
		if f.Check == coord.BackupSensitivity {
			name = f.Other
		}
		if _, ok := faulted[name]; !ok {
			faulted[name] = f
		}
	}
	moved := false
	for k, v := range pr.Pickups {
		f, ok := faulted[pr.Study.Devices[v.Device].Name]
		if !ok || pr.P[k] == v.Was {
			continue
		}
		tried := pr.P[k]
		pr.P[k], moved = v.Was, true
		pr.PickupBy[k] = Limit{Kind: LimitChecker, A: v.Was,
			Note: fmt.Sprintf("set back to the study's pickup: at %s A the checker fails the %s finding (%s)", fmtA(tried), f.Check, f.Note)}
	}
	return moved
}
