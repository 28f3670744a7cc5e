package propose

import (
	"math"
	"sort"
	"sync"

	"tripgrade/coord"
	"tripgrade/faults"
)

// The pickup search.
//
// A lower pickup makes a stage more sensitive, the first duty of
// overcurrent protection, and at a given multiplier faster at every
// current; but the stage then needs a larger multiplier to wait its
// margin over the stages below it, and the multiplier's range may run
// out. So the search starts from the lowest admissible pickup of every
// stage (the most sensitive settings the load, CT and range allow) and
// raises a pickup only where that lets more margins be met within the
// multiplier ranges:
//
//  1. The checker runs once on the study with every searched stage at
//     its lowest admissible pickup, and every margin it judges is kept
//     (sampleStore). A higher pickup only takes devices out of operation,
//     so these margins cover every candidate's.
//  2. For a candidate set of pickups, every kept margin is linearised at
//     those pickups (linear.go) and the least multipliers found by label
//     correcting (least.go); the count of margins they cannot meet
//     (multipliers pushed past the top of their range, bounds below the
//     bottom) is the candidate's score. A candidate that leaves a device
//     not operating for a fault it must clear is refused.
//  3. The stages whose multipliers meet a margin they cannot are visited
//     in grading order, from the devices nearest the faults upwards; for
//     each, up to maxCandidates pickups between its pickup and the top
//     of its admissible interval are tried, and the lowest that gives the
//     fewest unmet margins kept (the steps between the tried ones are
//     searched by halving). Passes repeat while the count falls, at most
//     maxPasses.
//
// Each evaluation re-linearises only the margins of the device whose
// pickup moves. The rounds that follow (propose.go) set the multipliers
// at the chosen pickups and verify them with the checker.

// Bounds of the search: candidates tried per stage and visit, and passes
// over the stages.
const (
	maxCandidates = 16
	maxPasses     = 3
)

// refused is the score of a candidate that leaves a device not operating
// for a fault it must clear.
const refused = math.MaxInt32

// sampleStore keeps every margin the checker hands out.
type sampleStore struct {
	mu  sync.Mutex
	all []coord.MarginSample
}

func (st *sampleStore) margin(ms *coord.MarginSample) {
	st.mu.Lock()
	st.all = append(st.all, *ms)
	st.mu.Unlock()
}

// sorted returns the samples in a fixed order (the checker hands them
// out from several goroutines): by device pair, then fault.
func (st *sampleStore) sorted() []coord.MarginSample {
	out := st.all
	sort.Slice(out, func(i, j int) bool { return sampleLess(&out[i], &out[j]) })
	return out
}

func sampleLess(a, b *coord.MarginSample) bool {
	switch {
	case a.Up != b.Up:
		return a.Up < b.Up
	case a.Down != b.Down:
		return a.Down < b.Down
	case a.Check != b.Check:
		return a.Check < b.Check
	case a.Kind != b.Kind:
		return a.Kind < b.Kind
	case a.Case != b.Case:
		return a.Case < b.Case
	case a.Place != b.Place:
		return placeLess(a.Place, b.Place)
	case a.Scale != b.Scale:
		return a.Scale < b.Scale
	case a.Sequence != b.Sequence:
		return !a.Sequence
	case a.UpS != b.UpS:
		return a.UpS < b.UpS
	case a.DownS != b.DownS:
		return a.DownS < b.DownS
	case a.UpAt.PhaseA != b.UpAt.PhaseA:
		return a.UpAt.PhaseA < b.UpAt.PhaseA
	case a.DownAt.PhaseA != b.DownAt.PhaseA:
		return a.DownAt.PhaseA < b.DownAt.PhaseA
	case a.UpAt.GroundA != b.UpAt.GroundA:
		return a.UpAt.GroundA < b.UpAt.GroundA
	}
	return a.DownAt.GroundA < b.DownAt.GroundA
}

func placeLess(a, b faults.Place) bool {
	switch {
	case a.Branch != b.Branch:
		return a.Branch < b.Branch
	case a.Bus != b.Bus:
		return a.Bus < b.Bus
	}
	return a.Frac < b.Frac
}

// group is the margins of one pair of devices (Up −1 for clearing
// times) and what they ask at the pickups being tried.
type group struct {
	from, to int      // its samples
	up, down int      // devices
	lines    []edge   // between two multipliers: x_U ≥ K·x_D + B, the envelope
	lows     []vbound // lower bounds of one multiplier, the highest of each
	highs    []vbound // upper bounds, the lowest of each
	bad      bool     // a device no longer operates for a fault it must clear
}

// vbound is a bound on multiplier v.
type vbound struct {
	v int
	x float64
}

// search holds the state of a pickup search.
type search struct {
	s       *coord.Study // its own copy, at the pickups being tried
	lin     *linearizer
	vars    []Variable
	pv      []PickupVar
	ofVar   []int // the pickup variable of each multiplier variable (−1)
	samples []coord.MarginSample
	groups  []group
	byDev   [][]int // the groups each device takes part in
	inrushA []float64
	inrush  []float64 // per multiplier variable: its inrush bound (0: none)
	k       []int     // grid index of each pickup variable's pickup
	evals   int
}

// newSearch prepares a search from the margins of the study s0 (every
// searched stage at its lowest admissible pickup).
func newSearch(s0 *coord.Study, index [][]int, vars []Variable, pv []PickupVar, samples []coord.MarginSample, inrushA []float64) *search {
	s := copyStages(s0)
	sr := &search{s: s, lin: newLinearizer(s, index, multipliers(s, vars)), vars: vars, pv: pv, samples: samples,
		byDev: make([][]int, len(s.Devices)), inrushA: inrushA, inrush: make([]float64, len(vars)),
		ofVar: make([]int, len(vars)), k: make([]int, len(pv))}
	sr.lin.from = newLinearizer(s0, index, multipliers(s0, vars))
	for i := range sr.ofVar {
		sr.ofVar[i] = -1
	}
	for k, v := range pv {
		sr.ofVar[v.Var] = k
		sr.k[k] = v.index(v.Low)
	}
	for from := 0; from < len(samples); {
		to := from + 1
		for to < len(samples) && samples[to].Up == samples[from].Up && samples[to].Down == samples[from].Down {
			to++
		}
		g := group{from: from, to: to, up: samples[from].Up, down: samples[from].Down}
		sr.linearise(&g)
		gi := len(sr.groups)
		sr.groups = append(sr.groups, g)
		sr.byDev[g.down] = append(sr.byDev[g.down], gi)
		if g.up >= 0 && g.up != g.down {
			sr.byDev[g.up] = append(sr.byDev[g.up], gi)
		}
		from = to
	}
	for i := range vars {
		sr.setInrush(i)
	}
	return sr
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

// mustOperate reports whether a margin's downstream device is one that
// must clear its fault (a solved fault of the intact network): at a
// candidate pickup it must still operate for it.
func mustOperate(ms *coord.MarginSample) bool {
	return (ms.Check == coord.Clearing || ms.Check == coord.Discrimination) && ms.Scale == 1 && !ms.Sequence
}

// linearise sets what the group's margins ask at the current pickups.
func (sr *search) linearise(g *group) {
	g.lines, g.lows, g.highs, g.bad = nil, nil, nil, false
	for i := g.from; i < g.to; i++ {
		ms := &sr.samples[i]
		if mustOperate(ms) {
			if _, _, ok := sr.lin.downPieces(ms.Down, ms.DownAt, coord.Nominal); !ok {
				g.bad = true
				return
			}
		}
		sr.lin.constraints(ms, g.add(sr.vars))
	}
}

// add returns the function that files one constraint in the group, as
// collector.add does.
func (g *group) add(vars []Variable) func(constraint) {
	return func(k constraint) {
		hasU, hasD := k.u >= 0 && k.a > 0, k.d >= 0 && k.b > 0
		switch {
		case hasU && hasD:
			g.addLine(edge{u: k.u, d: k.d, k: k.b / k.a, b: k.c / k.a}, vars[k.d].Range)
		case hasU:
			g.lows = setBound(g.lows, k.u, k.c/k.a, math.Max)
		case hasD:
			g.highs = setBound(g.highs, k.d, -k.c/k.b, math.Min)
		}
	}
}

// setBound keeps, per variable, the bound pick chooses.
func setBound(bs []vbound, v int, x float64, pick func(a, b float64) float64) []vbound {
	for i := range bs {
		if bs[i].v == v {
			bs[i].x = pick(bs[i].x, x)
			return bs
		}
	}
	return append(bs, vbound{v, x})
}

// addLine keeps the upper envelope of the lines between two multipliers
// over the lower one's range (as collector.addLine).
func (g *group) addLine(l edge, r coord.Range) {
	at := func(m edge, x float64) float64 { return m.k*x + m.b }
	for _, m := range g.lines {
		if m.u == l.u && m.d == l.d && at(m, r.Min) >= at(l, r.Min) && at(m, r.Max) >= at(l, r.Max) {
			return
		}
	}
	kept := g.lines[:0]
	for _, m := range g.lines {
		if !(m.u == l.u && m.d == l.d && at(l, r.Min) >= at(m, r.Min) && at(l, r.Max) >= at(m, r.Max)) {
			kept = append(kept, m)
		}
	}
	g.lines = append(kept, l)
}

// score counts the margins the least multipliers at the current pickups
// cannot meet, and marks the multipliers that fail one.
func (sr *search) score() (int, []bool) {
	sr.evals++
	n := len(sr.vars)
	lo, hi := make([]float64, n), make([]float64, n)
	for i, v := range sr.vars {
		lo[i], hi[i] = math.Max(v.Range.Min, sr.inrush[i]), v.Range.Max
	}
	nLines := 0
	for gi := range sr.groups {
		g := &sr.groups[gi]
		if g.bad {
			return refused, nil
		}
		for _, b := range g.lows {
			lo[b.v] = math.Max(lo[b.v], b.x)
		}
		nLines += len(g.lines)
	}
	count := 0
	short := make([]bool, n)
	for gi := range sr.groups {
		for _, b := range sr.groups[gi].highs {
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
	for gi := range sr.groups {
		for _, e := range sr.groups[gi].lines {
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
	return count, short
}

// set moves pickup variable k to grid index idx and re-linearises its
// device's margins.
func (sr *search) set(k, idx int) {
	v := sr.pv[k]
	sr.k[k] = idx
	setPickup(&sr.s.Devices[v.Device].Stages[v.Stage], v.at(idx))
	sr.setInrush(v.Var)
	for _, gi := range sr.byDev[v.Device] {
		sr.linearise(&sr.groups[gi])
	}
}

// try scores pickup variable k at grid index idx and puts it back.
func (sr *search) try(k, idx int) int {
	v := sr.pv[k]
	old := sr.k[k]
	saved := make([]group, len(sr.byDev[v.Device]))
	for i, gi := range sr.byDev[v.Device] {
		saved[i] = sr.groups[gi] // linearise starts new slices, so these stay as they are
	}
	sr.set(k, idx)
	c, _ := sr.score()
	sr.k[k] = old
	setPickup(&sr.s.Devices[v.Device].Stages[v.Stage], v.at(old))
	sr.setInrush(v.Var)
	for i, gi := range sr.byDev[v.Device] {
		sr.groups[gi] = saved[i]
	}
	return c
}

// run searches and returns the chosen pickups and, per pickup variable,
// the count of unmet margins at its lowest admissible pickup and at the
// chosen one (equal when it was not raised).
func (sr *search) run() (p []float64, atLow, atChosen []int) {
	cur, short := sr.score()
	atLow, atChosen = make([]int, len(sr.pv)), make([]int, len(sr.pv))
	order := sr.order()
	for pass := 0; pass < maxPasses && cur > 0 && cur < refused; pass++ {
		improved := false
		for _, k := range order {
			if !short[sr.pv[k].Var] {
				continue
			}
			best, idx := sr.raise(k, cur)
			if best < cur {
				if sr.k[k] == sr.pv[k].index(sr.pv[k].Low) {
					atLow[k] = cur
				}
				sr.set(k, idx)
				cur, short = sr.score()
				atChosen[k] = cur
				improved = true
			}
			if cur == 0 {
				break
			}
		}
		if !improved {
			break
		}
	}
	p = make([]float64, len(sr.pv))
	for k, v := range sr.pv {
		p[k] = v.at(sr.k[k])
	}
	return p, atLow, atChosen
}

// raise tries pickup variable k above its grid index: up to
// maxCandidates settings spread to the top of its interval, then halving
// between the best and the one below it. It returns the fewest unmet
// margins found and the lowest index that gives them (cur and the
// current index when none gives fewer).
func (sr *search) raise(k, cur int) (int, int) {
	v := sr.pv[k]
	from, top := sr.k[k], v.index(v.High)
	if from >= top {
		return cur, from
	}
	span := top - from
	var cands []int
	for j := 1; j <= maxCandidates; j++ {
		c := from + int(math.Ceil(float64(j*span)/maxCandidates))
		if len(cands) == 0 || c > cands[len(cands)-1] {
			cands = append(cands, c)
		}
	}
	best, at, below := cur, from, from
	for i, c := range cands {
		if s := sr.try(k, c); s < best {
			best, at = s, c
			below = from
			if i > 0 {
				below = cands[i-1]
			}
		}
	}
	if at == from {
		return cur, from
	}
	// The lowest setting between the last tried below and the best that
	// gives as few.
	lo, hi := below+1, at
	for lo < hi {
		mid := (lo + hi) / 2
		if sr.try(k, mid) <= best {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	return best, hi
}

// order lists the pickup variables in grading order: devices with
// fewer grading steps below them first (devices that grade over each
// other both ways, as in a ring, share a level), then in study order.
func (sr *search) order() []int {
	nd := len(sr.s.Devices)
	below := make([][]int, nd)
	for _, g := range sr.groups {
		if g.up >= 0 && g.up != g.down {
			below[g.up] = append(below[g.up], g.down)
		}
	}
	level := levels(below)
	out := make([]int, len(sr.pv))
	for k := range out {
		out[k] = k
	}
	sort.SliceStable(out, func(a, b int) bool {
		da, db := sr.pv[out[a]].Device, sr.pv[out[b]].Device
		if level[da] != level[db] {
			return level[da] < level[db]
		}
		return da < db
	})
	return out
}

// levels returns, per node of a graph whose edges lead from each node to
// those below it, the length of the longest path down from it, nodes on
// one cycle taken together (Tarjan's strongly connected components,
// found in reverse topological order).
func levels(below [][]int) []int {
	n := len(below)
	index, low, comp := make([]int, n), make([]int, n), make([]int, n)
	onStack := make([]bool, n)
	for i := range index {
		index[i], comp[i] = -1, -1
	}
	var stack []int
	var compLevel []int
	next := 0
	var visit func(v int)
	visit = func(v int) {
		index[v], low[v] = next, next
		next++
		stack = append(stack, v)
		onStack[v] = true
		for _, w := range below[v] {
			if index[w] < 0 {
				visit(w)
				low[v] = min(low[v], low[w])
			} else if onStack[w] {
				low[v] = min(low[v], index[w])
			}
		}
		if low[v] != index[v] {
			return
		}
		// A component is complete; every component below it already has
		// its level.
		c := len(compLevel)
		var members []int
		for {
			w := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			onStack[w] = false
			comp[w] = c
			members = append(members, w)
			if w == v {
				break
			}
		}
		lv := 0
		for _, m := range members {
			for _, w := range below[m] {
				if comp[w] != c {
					lv = max(lv, compLevel[comp[w]]+1)
				}
			}
		}
		compLevel = append(compLevel, lv)
	}
	for v := 0; v < n; v++ {
		if index[v] < 0 {
			visit(v)
		}
	}
	out := make([]int, n)
	for v := range out {
		out[v] = compLevel[comp[v]]
	}
	return out
}
