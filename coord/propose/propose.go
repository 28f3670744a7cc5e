package propose

import (
	"fmt"
	"math"
	"strings"

	"tripgrade/coord"
	"tripgrade/faults"
)

// Proposal is the outcome of a search: the proposed multipliers, what
// binds each, the conflicts, and the checker's findings before and after.
type Proposal struct {
	Study *coord.Study // the study as given
	// Proposed is the study with the proposed settings.
	Proposed *coord.Study
	Vars     []Variable
	// X are the proposed multipliers (on their steps), Continuous the
	// least multipliers before rounding, per variable.
	X, Continuous []float64
	// Binding is, per variable, the margin that holds it where it is
	// (nil Src: the bottom of its range), and the multiplier it asks for.
	Binding []Binding
	// Conflicts are the margins no multipliers within their ranges meet.
	Conflicts []Conflict
	// Before and After are the checker's findings on the study and on the
	// proposal.
	Before, After *coord.Result
	// Unchanged are findings that fail before and after with the same
	// figure: no multiplier moves them (a pickup, a missing device).
	Unchanged []coord.Finding
	// Conflicting are failing findings the conflicts account for.
	Conflicting []coord.Finding
	// Unresolved are findings the checker fails on the proposal that no
	// conflict accounts for and that the multipliers changed: the search
	// did not converge on them. A proposal with any is not verified.
	Unresolved []coord.Finding
	// Pickups are the stages whose pickups were chosen (Settings.Pickups),
	// P the chosen pickups and PickupBy what holds each; KeptPickups the
	// stages whose pickups were left as given, and why. PickupEvals counts
	// the candidate sets of pickups the search scored.
	Pickups     []PickupVar
	P           []float64
	PickupBy    []Limit
	KeptPickups []KeptPickup
	PickupEvals int
	// Rounds is the number of solve-and-verify rounds run.
	Rounds int
	// Margins counts the margins linearised in the first round;
	// Constraints the constraints kept after removing dominated ones
	// (between two multipliers, and bounds); Groups the groups of linked
	// multipliers and LPGroups those the simplex solved.
	Margins, Constraints, Groups, LPGroups int
}

// Binding is what holds one multiplier.
type Binding struct {
	Src   *Source // nil: the bottom of the range (or a fixed lower bound's Source in LowSrc)
	NeedX float64 // the multiplier it asks for, before rounding
	// Held is true when a conflict holds the multiplier below what its
	// margins ask: at the top of its range (Limit nil) or at the upper
	// bound Limit (a clearing or withstand time, a fixed stage's margin).
	Held  bool
	Limit *Source
}

// Verified reports whether the checker passes every margin the proposal
// could change, but for the conflicts it names.
func (p *Proposal) Verified() bool { return len(p.Unresolved) == 0 }

// timedChecks are the checks whose findings the multipliers move.
var timedChecks = map[coord.CheckKind]bool{coord.Grading: true, coord.Discrimination: true, coord.Clearing: true,
	coord.Inrush: true, coord.Damage: true, coord.SettingsAudit: true}

// Propose searches for the least multipliers of the study's inverse-time
// stages that meet every margin the checker judges, rounds them up to
// their steps, and verifies them with the checker, linearising again at
// the new settings until the checker agrees or the rounds run out. With
// Settings.Pickups it first chooses the pickups (pickups.go, search.go).
func Propose(s *coord.Study, eng *faults.Engine, topo *coord.Topology, o Settings) (*Proposal, error) {
	vars, index, err := variables(s, o)
	if err != nil {
		return nil, err
	}
	pr := &Proposal{Study: s, Vars: vars}
	ia := inrushCurrents(s, topo)
	if o.Pickups {
		return pr, pr.choosePickups(eng, topo, o, index, ia)
	}
	col := newCollector(newLinearizer(s, index, multipliers(s, vars)), vars)
	col.inrush(s, ia)
	pr.Before, err = checkEvery(s, s, eng, topo, col)
	if err != nil {
		return nil, err
	}
	pr.Margins = col.n
	return pr, pr.solve(s, eng, index, col, o, ia)
}

// solve runs the rounds: the least multipliers of the collected
// constraints, rounded, applied to base (the study at the pickups
// proposed) and verified by the checker, whose margins at the new
// settings join the constraints for the next round.
func (pr *Proposal) solve(base *coord.Study, eng *faults.Engine, index [][]int, col *collector, o Settings, ia []float64) error {
	vars := pr.Vars
	for round := 1; round <= o.rounds(); round++ {
		pr.Rounds = round
		p := build(col)
		xc, lpGroups, err := p.solve()
		if err != nil {
			return err
		}
		xr, err := p.rounded(xc)
		if err != nil {
			return err
		}
		pr.Continuous, pr.X, pr.Conflicts = xc, xr, p.conflicts
		pr.Constraints, pr.Groups, pr.LPGroups = p.size(), len(p.components()), lpGroups
		pr.binding(p)
		pr.Proposed = Apply(base, vars, xr)
		t2, err := coord.NewTopology(pr.Proposed, eng)
		if err != nil {
			return err
		}
		next := newCollector(newLinearizer(pr.Proposed, index, xr), vars)
		next.inrush(pr.Proposed, ia)
		pr.After, err = checkEvery(pr.Study, pr.Proposed, eng, t2, next)
		if err != nil {
			return err
		}
		last := len(pr.Unresolved)
		pr.sortOut()
		if pr.Verified() || round > 1 && len(pr.Unresolved) >= last {
			break
		}
		col.merge(next)
	}
	return nil
}

// checkEvery checks st, the study s at other settings (its engine and
// topology given), and each scenario of s with st's settings, handing
// every margin to col (nil: none), and returns the worst findings over
// them all, each naming its scenario; a study without scenarios is
// checked as drawn alone. The constraints of every scenario so enter the
// search, and a proposal is verified in every scenario the checker
// checks.
func checkEvery(s, st *coord.Study, eng *faults.Engine, topo *coord.Topology, col *collector) (*coord.Result, error) {
	opts := func(name string, in *coord.Study) coord.Options {
		if col == nil {
			return coord.Options{}
		}
		if name == coord.AsDrawn {
			return coord.Options{Margins: col.margin}
		}
		return coord.Options{Margins: col.marginIn(name, in, st)}
	}
	if len(s.Scenarios) == 0 {
		return coord.CheckWith(st, eng, topo, opts(coord.AsDrawn, st))
	}
	at := *st
	at.Scenarios = make([]coord.Scenario, len(s.Scenarios))
	for i, sc := range s.Scenarios {
		build := sc.Build
		sc.Build = func() (*coord.Study, error) {
			in, err := build()
			if err != nil {
				return nil, err
			}
			return withSettingsOf(in, st), nil
		}
		at.Scenarios[i] = sc
	}
	w := coord.NewWorst()
	err := coord.CheckScenariosWith(&at, eng, topo, nil, opts, func(c coord.Checked) error {
		w.Add(c.Study, c.Result)
		return nil
	})
	if err != nil {
		return nil, err
	}
	return w.Result(), nil
}

// withSettingsOf returns a copy of a scenario's study in whose devices
// the stages are those of the device of the same name in st: the
// scenario at the settings being tried (a scenario changes the network,
// never a device's settings).
func withSettingsOf(in, st *coord.Study) *coord.Study {
	at := map[string]int{}
	for i := range st.Devices {
		at[st.Devices[i].Name] = i
	}
	out := *in
	out.Devices = append([]coord.Device(nil), in.Devices...)
	for i := range out.Devices {
		if j, ok := at[out.Devices[i].Name]; ok {
			out.Devices[i].Stages = append([]coord.Stage(nil), st.Devices[j].Stages...)
		}
	}
	return &out
}

// size counts the constraints of a problem: the edges and the bounds.
func (p *problem) size() int {
	n := len(p.edges)
	for i := range p.lo {
		if p.loSrc[i] != nil {
			n++
		}
		if p.hiSrc[i] != nil {
			n++
		}
	}
	return n
}

// binding records what holds each proposed multiplier.
func (pr *Proposal) binding(p *problem) {
	edges, need := p.binding(pr.X)
	held := map[int]bool{}
	for _, c := range pr.Conflicts {
		if c.holds() {
			held[c.Var] = true
		}
	}
	pr.Binding = make([]Binding, len(pr.X))
	for i := range pr.X {
		b := Binding{NeedX: need[i], Src: p.loSrc[i], Held: held[i], Limit: p.hiSrc[i]}
		if edges[i] >= 0 {
			b.Src = p.edges[edges[i]].src
		}
		pr.Binding[i] = b
	}
}

// BindingText says what holds a multiplier, for a reader: the margin that
// binds it (or the bottom of its range) and, when a conflict holds it
// below what its margins ask, the limit that holds it there.
func BindingText(s *coord.Study, b Binding) string {
	limit := "the top of its range"
	if b.Limit != nil {
		limit = Describe(s, b.Limit)
	}
	switch {
	case !b.Held:
		return Describe(s, b.Src)
	case b.Src == nil:
		return limit + ", an upper bound below what its margins ask (see the conflicts)"
	}
	return Describe(s, b.Src) + "; held below it by " + limit + " (see the conflicts)"
}

// findingKey matches findings of two runs.
type findingKey struct {
	check                coord.CheckKind
	device, other, stage string
}

func keyOf(f coord.Finding) findingKey { return findingKey{f.Check, f.Device, f.Other, f.Stage} }

// sortOut sorts the proposal's failing findings into those a conflict
// accounts for, those no multiplier moves, and the unresolved.
func (pr *Proposal) sortOut() {
	before := map[findingKey][]coord.Finding{}
	for _, f := range pr.Before.Findings {
		k := keyOf(f)
		before[k] = append(before[k], f)
	}
	pr.Unchanged, pr.Unresolved, pr.Conflicting = nil, nil, nil
	in := pr.conflictIndex()
	for _, f := range pr.After.Findings {
		if f.Verdict != coord.Fail {
			continue
		}
		if pr.Pickups != nil && pickupChecks[f.Check] {
			// A pickup moved: the finding fails by the proposal unless it
			// failed on the study too.
			if failed(before[keyOf(f)]) {
				pr.Unchanged = append(pr.Unchanged, f)
			} else {
				pr.Unresolved = append(pr.Unresolved, f)
			}
			continue
		}
		if !timedChecks[f.Check] {
			continue
		}
		if pr.explains(f, in) {
			pr.Conflicting = append(pr.Conflicting, f)
			continue
		}
		if sameFailure(before[keyOf(f)], f) || f.Check == coord.SettingsAudit && !strings.Contains(f.Note, "multiplier") {
			// A settings audit failure that names no multiplier is its
			// pickup's: the proposed multipliers lie on their steps.
			pr.Unchanged = append(pr.Unchanged, f)
			continue
		}
		pr.Unresolved = append(pr.Unresolved, f)
	}
}

// failed reports whether one of the findings fails.
func failed(fs []coord.Finding) bool {
	for _, f := range fs {
		if f.Verdict == coord.Fail {
			return true
		}
	}
	return false
}

// sameFailure reports whether one of the earlier findings failed with
// the same figure.
func sameFailure(fs []coord.Finding, f coord.Finding) bool {
	for _, b := range fs {
		if b.Verdict == coord.Fail && b.Valid == f.Valid && b.Note == f.Note &&
			(!f.Valid || math.Abs(b.Margin-f.Margin) <= 1e-9*math.Max(1, math.Abs(f.Margin))) {
			return true
		}
	}
	return false
}

// explains reports whether a conflict accounts for a failing finding:
// one of its margins is between the finding's two devices, or the device
// that must wait has its multiplier held below what margins ask of it (an
// inrush finding: its own device); for a clearing or damage finding, a
// conflict bounds its device's times or the times at that element's
// faults, or holds its multiplier at the top.
func (pr *Proposal) explains(f coord.Finding, in conflictIndex) bool {
	switch f.Check {
	case coord.Grading:
		// The finding names the downstream device, then the upstream one.
		return in.pairs[[2]string{f.Device, f.Other}] || in.pairs[[2]string{f.Other, f.Device}] || in.held[f.Other]
	case coord.Discrimination:
		// The finding names the device that operates, then the one that
		// must clear.
		return in.pairs[[2]string{f.Device, f.Other}] || in.pairs[[2]string{f.Other, f.Device}] || in.held[f.Device]
	case coord.Clearing:
		if in.elements[f.Device] {
			return true
		}
		for _, n := range strings.Split(f.Other, ", ") {
			if in.clearing[n] {
				return true
			}
		}
	case coord.Damage:
		return in.clearing[f.Device]
	case coord.Inrush:
		// Held below what its margins ask, the inrush bound among them.
		return in.held[f.Device]
	}
	return false
}

// conflictIndex holds the device pairs (by name) of every margin in a
// conflict, the devices of conflicting clearing times and the elements
// whose faults they are (a device that opens later in a fault's sequence
// is not among the devices its finding names), and the devices whose
// multipliers margins push past the top of their ranges.
type conflictIndex struct {
	pairs                    map[[2]string]bool
	clearing, elements, held map[string]bool
}

func (pr *Proposal) conflictIndex() conflictIndex {
	in := conflictIndex{pairs: map[[2]string]bool{}, clearing: map[string]bool{}, elements: map[string]bool{}, held: map[string]bool{}}
	for _, c := range pr.Conflicts {
		if c.holds() {
			// Those margins (the first named, the others counted)
			// follow, and at the top of its range or bound, the
			// clearing times of its device.
			name := pr.Study.Devices[pr.Vars[c.Var].Device].Name
			in.held[name] = true
			if !c.Rounding {
				in.clearing[name] = true
			}
		}
		for _, src := range c.Chain {
			switch {
			case src == nil, isInrush(src):
			case src.Up < 0:
				in.clearing[pr.Study.Devices[src.Down].Name] = true
				if src.Element != "" && !c.Rounding {
					// A bound no setting meets: the fault of that element
					// is cleared late (a rounding conflict keeps the bound).
					in.elements[src.Element] = true
				}
			default:
				in.pairs[[2]string{pr.Study.Devices[src.Up].Name, pr.Study.Devices[src.Down].Name}] = true
			}
		}
	}
	return in
}

// Describe names the fault and margin of a source for a reader:
// "grading FM over MA-R, LL min @ MA-2: 0.300 s required".
func Describe(s *coord.Study, src *Source) string {
	if src == nil {
		return "bottom of the range"
	}
	if isInrush(src) {
		return fmt.Sprintf("inrush: %s does not operate within %.3g s at %s A (%g × the full-load current of the transformers it energises)",
			s.Devices[src.Down].Name, src.RequiredS, fmtA(src.CurrentA), s.Criteria.InrushMultiple)
	}
	where := src.Where
	if src.Scenario == "" {
		where = coord.PlaceName(s.Network, src.Place)
	}
	fault := fmt.Sprintf("%s %s @ %s", src.Kind, src.Case, where)
	if src.Scenario != "" {
		fault += " in scenario " + src.Scenario
	}
	if src.Scale != 1 && src.Scale > 0 {
		fault += fmt.Sprintf(" (sweep, %.0f %%)", src.Scale*100)
	}
	if src.Sequence {
		fault += " (in its opening sequence)"
	}
	down := s.Devices[src.Down].Name
	if src.Check == coord.Damage {
		return fmt.Sprintf("damage: %s clears within %s's withstand time, %.3g s, %s", down, src.Equipment, src.RequiredS, fault)
	}
	if src.Up < 0 {
		return fmt.Sprintf("clearing by %s within %.3g s, %s", down, src.RequiredS, fault)
	}
	up := s.Devices[src.Up].Name
	if src.UpStage >= 0 {
		up += " " + s.Devices[src.Up].Stages[src.UpStage].Label
	}
	return fmt.Sprintf("%s: %s over %s by %.3f s, %s", src.Check, up, down, src.RequiredS, fault)
}
