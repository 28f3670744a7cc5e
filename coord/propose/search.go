package propose

import (
	"math"

	"tripgrade/coord"
)

// The pickup search.
//
// A lower pickup makes a stage more sensitive, the first duty of
// overcurrent protection, and at a given multiplier faster at every
// current; but the stage then needs a larger multiplier to wait its
// margin over the stages below it, and the multiplier's range may run
// out. So the search starts from the lowest admissible pickup of every
// stage (the most sensitive settings the load, CT and range allow) and
// raises a pickup only where the stage's multiplier cannot meet its
// margins within its range, grading from the bottom up as an engineer
// does by hand:
//
//  1. The checker runs on the study with every searched stage at its
//     lowest admissible pickup; its margins, linearised (linear.go),
//     give the least multipliers (least.go) and the margins they cannot
//     meet: multipliers pushed past the top of their ranges, bounds below
//     the bottom. When some stage that fails one may rise, the checker
//     runs again with every searched stage at its highest admissible
//     pickup; the constraints that bind in either run are kept by pair of
//     devices and rescaled to other pickups (groups.go).
//  2. The stages whose multipliers fail a margin are visited once each,
//     in grading order, from the devices nearest the faults upwards. For
//     each, up to maxCandidates pickups spread between its pickup and the
//     top of its interval are tried, then halving below the first that
//     lets its multiplier meet every constraint of its own device within
//     its range (the multipliers below it held at their least values).
//     A pickup at or above a current at which the stage alone operates
//     its device for a fault the device must clear is not tried.
//  3. That pickup is kept when the least multipliers of the whole study
//     then fail fewer margins; otherwise the stage stays where it was.
//     Stages that come to fail a margin on the way are visited in a later
//     pass, at most maxPasses.
//
// The rounds that follow (propose.go) set the multipliers at the chosen
// pickups and verify them with the checker.

// Bounds of the search: candidates tried per stage and visit, and passes
// over the stages.
const (
	maxCandidates = 16
	maxPasses     = 3
)

// search holds the state of a pickup search.
type search struct {
	s       *coord.Study // its own copy, at the pickups being tried
	vars    []Variable
	pv      []PickupVar
	ofVar   []int // the pickup variable of each multiplier variable (−1)
	groups  []*group
	byDev   [][]int // the groups each device takes part in
	inrushA []float64
	inrush  []float64 // per multiplier variable: its inrush bound (0: none)
	caps    []float64 // per multiplier variable: a pickup must stay below it
	k       []int     // grid index of each pickup variable's pickup
	x       []float64 // the least multipliers at the pickups last scored
	// evals counts the whole-study scores, tries the candidate pickups
	// tried on one device's constraints.
	evals, tries int
}

// newSearch prepares a search from the probe at the lowest admissible
// pickups (study s0).
func newSearch(s0 *coord.Study, vars []Variable, pv []PickupVar, pc *pairCollector, inrushA []float64) *search {
	s := copyStages(s0)
	sr := &search{s: s, vars: vars, pv: pv, byDev: make([][]int, len(s.Devices)), inrushA: inrushA,
		inrush: make([]float64, len(vars)), caps: pc.caps, k: make([]int, len(pv)), ofVar: make([]int, len(vars))}
	for i := range sr.ofVar {
		sr.ofVar[i] = -1
	}
	for k, v := range pv {
		sr.k[k] = v.index(v.Low)
		sr.ofVar[v.Var] = k
	}
	for _, key := range pc.pairs() {
		g := &group{up: key[0], down: key[1]}
		gi := len(sr.groups)
		sr.groups = append(sr.groups, g)
		sr.byDev[g.down] = append(sr.byDev[g.down], gi)
		if g.up >= 0 && g.up != g.down {
			sr.byDev[g.up] = append(sr.byDev[g.up], gi)
		}
	}
	sr.addProbe(pc)
	for i := range vars {
		sr.setInrush(i)
	}
	return sr
}

// addProbe adds the constraints of a probe to the groups and evaluates
// them at the current pickups.
func (sr *search) addProbe(pc *pairCollector) {
	index := map[[2]int]int{}
	for gi, g := range sr.groups {
		index[[2]int{g.up, g.down}] = gi
	}
	for _, key := range pc.pairs() {
		gi, ok := index[key]
		if !ok {
			gi = len(sr.groups)
			sr.groups = append(sr.groups, &group{up: key[0], down: key[1]})
			sr.byDev[key[1]] = append(sr.byDev[key[1]], gi)
			if key[0] >= 0 && key[0] != key[1] {
				sr.byDev[key[0]] = append(sr.byDev[key[0]], gi)
			}
		}
		pb := pc.probes[key]
		g := sr.groups[gi]
		g.cons = append(append(append(g.cons, pb.lines...), pb.lows...), pb.highs...)
	}
	for _, g := range sr.groups {
		sr.evaluate(g)
	}
}

// raisable returns the devices of the stages whose multipliers fail a
// margin at the current pickups and whose pickups may rise.
func (sr *search) raisable() map[int]bool {
	_, short := sr.score()
	devs := map[int]bool{}
	for k, v := range sr.pv {
		if short != nil && sr.k[k] >= 0 && short[v.Var] && sr.top(k) > sr.k[k] {
			devs[v.Device] = true
		}
	}
	return devs
}

// top returns the highest grid index pickup variable k may take: the
// top of its interval, below the least current at which its stage alone
// must operate its device.
func (sr *search) top(k int) int {
	v := sr.pv[k]
	t := v.index(v.High)
	for t >= 0 && !(v.at(t) < sr.caps[v.Var]) {
		t--
	}
	return t
}

// setInrush computes multiplier i's inrush bound at its stage's pickup.
func (sr *search) setInrush(i int) {
	v := sr.vars[i]
	x, ok := inrushBound(sr.s.Devices[v.Device].Stages[v.Stage], sr.inrushA[v.Device], sr.s.Criteria.InrushTimeS)
	sr.inrush[i] = 0
	if ok {
		sr.inrush[i] = x
	}
}

// score counts the margins the least multipliers at the current pickups
// cannot meet, marks the multipliers that fail one, and keeps the least
// multipliers in sr.x. A refused candidate scores refused.
func (sr *search) score() (int, []bool) {
	sr.evals++
	n := len(sr.vars)
	lo, hi := make([]float64, n), make([]float64, n)
	for i, v := range sr.vars {
		lo[i], hi[i] = math.Max(v.Range.Min, sr.inrush[i]), v.Range.Max
	}
	nLines := 0
	for _, g := range sr.groups {
		for _, b := range g.lows {
			lo[b.v] = math.Max(lo[b.v], b.x)
		}
		nLines += len(g.lines)
	}
	count := 0
	short := make([]bool, n)
	for _, g := range sr.groups {
		for _, b := range g.highs {
			if b.x < lo[b.v]-feasTol*math.Max(1, lo[b.v]) {
				count++
				short[b.v] = true
			} else {
				hi[b.v] = math.Min(hi[b.v], b.x)
			}
		}
	}
	for i := range lo {
		if lo[i] > hi[i]+feasTol*math.Max(1, hi[i]) {
			count++
			short[i] = true
			lo[i] = math.Max(sr.vars[i].Range.Min, math.Min(lo[i], hi[i]))
		}
	}
	p := &problem{vars: sr.vars, lo: lo, hi: hi, edges: make([]edge, 0, nLines), byD: make([][]int, n)}
	for _, g := range sr.groups {
		for _, e := range g.lines {
			p.byD[e.d] = append(p.byD[e.d], len(p.edges))
			p.edges = append(p.edges, e)
		}
	}
	x := append([]float64(nil), lo...)
	if _, err := p.least(x, func(_ int, v float64) float64 { return v }); err != nil {
		return refused, nil
	}
	for _, c := range p.conflicts {
		count += 1 + c.More
		short[c.Var] = true
	}
	sr.x = x
	return count, short
}

// refused is the score of pickups at which the least multipliers cannot
// be found (a loop of margins that does not settle).
const refused = math.MaxInt32

// fits reports whether multiplier u can meet every margin of its own
// device at the current pickups within its range, the multipliers below
// it at their least values (sr.x).
func (sr *search) fits(u int) bool {
	sr.tries++
	lo, hi := math.Max(sr.vars[u].Range.Min, sr.inrush[u]), sr.vars[u].Range.Max
	for _, gi := range sr.byDev[sr.vars[u].Device] {
		g := sr.groups[gi]
		for _, b := range g.lows {
			if b.v == u {
				lo = math.Max(lo, b.x)
			}
		}
		for _, e := range g.lines {
			if e.u == u {
				lo = math.Max(lo, e.k*sr.x[e.d]+e.b)
			}
		}
		for _, b := range g.highs {
			if b.v == u {
				hi = math.Min(hi, b.x)
			}
		}
	}
	return lo <= hi+feasTol*math.Max(1, hi)
}

// saved is a device's groups as they were, to put back.
type saved []group

func (sr *search) save(dev int) saved {
	out := make(saved, len(sr.byDev[dev]))
	for i, gi := range sr.byDev[dev] {
		out[i] = *sr.groups[gi] // evaluate starts new slices, so these stay as they are
	}
	return out
}

// fix puts pickup variable k at pickup a (the study's own) and leaves it
// out of the search.
func (sr *search) fix(k int, a float64) {
	v := sr.pv[k]
	sr.k[k] = -1
	setPickup(&sr.s.Devices[v.Device].Stages[v.Stage], a)
	sr.setInrush(v.Var)
	for _, gi := range sr.byDev[v.Device] {
		sr.evaluate(sr.groups[gi])
	}
}

// pickups returns the current pickups.
func (sr *search) pickups() []float64 {
	p := make([]float64, len(sr.pv))
	for k, v := range sr.pv {
		p[k] = sr.s.Devices[v.Device].Stages[v.Stage].PickupA
	}
	return p
}

// set moves pickup variable k to grid index idx and evaluates its
// device's constraints again.
func (sr *search) set(k, idx int) {
	v := sr.pv[k]
	sr.k[k] = idx
	setPickup(&sr.s.Devices[v.Device].Stages[v.Stage], v.at(idx))
	sr.setInrush(v.Var)
	for _, gi := range sr.byDev[v.Device] {
		sr.evaluate(sr.groups[gi])
	}
}

// restore puts pickup variable k back at grid index idx with its
// device's groups as saved.
func (sr *search) restore(k, idx int, sv saved) {
	v := sr.pv[k]
	sr.k[k] = idx
	setPickup(&sr.s.Devices[v.Device].Stages[v.Stage], v.at(idx))
	sr.setInrush(v.Var)
	for i, gi := range sr.byDev[v.Device] {
		*sr.groups[gi] = sv[i]
	}
}

// run searches and returns the chosen pickups and, per pickup variable,
// the count of unmet margins before and after it was raised (equal when
// it was not).
func (sr *search) run() (p []float64, atLow, atChosen []int) {
	cur, short := sr.score()
	atLow, atChosen = make([]int, len(sr.pv)), make([]int, len(sr.pv))
	order := sr.order()
	visited := make([]bool, len(sr.pv))
	for pass := 0; pass < maxPasses && cur > 0 && cur < refused; pass++ {
		improved := false
		for _, k := range order {
			if sr.k[k] < 0 || !short[sr.pv[k].Var] || sr.top(k) <= sr.k[k] || visited[k] {
				continue
			}
			visited[k] = true
			old := sr.k[k]
			sv := sr.save(sr.pv[k].Device)
			idx, ok := sr.lowestFitting(k)
			if !ok {
				sr.restore(k, old, sv)
				continue
			}
			sr.set(k, idx)
			x := sr.x
			if c, s := sr.score(); c < cur {
				if old == sr.pv[k].index(sr.pv[k].Low) {
					atLow[k] = cur
				}
				cur, short, atChosen[k], improved = c, s, c, true
			} else {
				sr.restore(k, old, sv)
				sr.x = x
			}
			if cur == 0 {
				break
			}
		}
		if !improved {
			break
		}
	}
	return sr.pickups(), atLow, atChosen
}

// lowestFitting tries pickup variable k above its grid index: up to
// maxCandidates settings spread to the top of its interval, then halving
// between the first that fits and the one tried below it. It returns the
// lowest setting found that lets its multiplier fit (fits), leaving the
// stage at some tried setting.
func (sr *search) lowestFitting(k int) (int, bool) {
	v := sr.pv[k]
	u := v.Var
	from, top := sr.k[k], sr.top(k)
	span := top - from
	below := from
	found := -1
	for j := 1; j <= maxCandidates; j++ {
		c := from + int(math.Ceil(float64(j*span)/maxCandidates))
		if c <= below {
			continue
		}
		sr.set(k, c)
		if sr.fits(u) {
			found = c
			break
		}
		below = c
	}
	if found < 0 {
		return 0, false
	}
	lo, hi := below+1, found
	for lo < hi {
		mid := (lo + hi) / 2
		sr.set(k, mid)
		if sr.fits(u) {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	return hi, true
}
