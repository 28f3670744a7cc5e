package propose

import (
	"errors"
	"math"
	"sort"

	"tripgrade/faults"
)

// The least multipliers.
//
// Every constraint reads x_U ≥ K·x_D + B with K ≥ 0 (a later upstream
// stage, or a faster downstream one, helps), or bounds one multiplier. A
// set of such monotone constraints is closed under the componentwise
// minimum: if x and y meet them, so does min(x, y), since
// min(x_U, y_U) ≥ K·min(x_D, y_D) + B. So when the constraints can be met
// at all there is one least solution, below every other, and it is the
// optimum of the linear programme "minimise Σ w·x" for any positive
// weights w (Hochbaum & Naor, SIAM J. Comput. 23(6), 1994, on systems of
// two variables per inequality). It is found by raising each multiplier
// from the bottom of its range only as far as a constraint forces
// (label correcting, as Bellman–Ford does for shortest paths): every
// value it reaches is forced, so it never passes the least solution, and
// it stops there. lp.go solves the same programme with gonum's simplex
// for small problems.

// problem is the constraint set of one search.
type problem struct {
	vars  []Variable
	lo    []float64 // the bottom of each range, or its fixed lower bound
	hi    []float64 // the top of each range, or its upper bound
	loSrc []*Source // the fixed lower bound that set lo (nil: the range)
	hiSrc []*Source
	edges []edge
	byD   [][]int // edges of each lower variable
	// conflicts found while building and solving; pushed indexes those
	// of multipliers pushed past their range, by variable.
	conflicts []Conflict
	pushed    map[int]int
}

// edge is x_U ≥ K·x_D + B.
type edge struct {
	u, d    int
	k, b    float64
	src     *Source
	dropped bool // found in conflict: left out of the solution
}

// Conflict is a set of constraints that no multipliers within their
// ranges meet together: the margin it names, and the chain of margins
// that raised the multiplier past its range (or the bound it breaks).
type Conflict struct {
	// Var is the multiplier pushed beyond its range (−1 for a margin
	// between fixed settings).
	Var int
	// NeedX is what the constraints ask of it; LimitX its range's top (or
	// bottom, for an upper bound below the range).
	NeedX, LimitX float64
	// Chain lists the margins, last first: the one that asks too much and
	// the ones that raised the multipliers it depends on.
	Chain []*Source
	// Below is true when an upper bound (a fixed upstream stage's margin,
	// a clearing time) lies below the range's bottom.
	Below bool
	// ShortS, for a margin between fixed settings, is how far it falls
	// short.
	ShortS float64
	// Rounding is true when only the step of the setting stands in the
	// way: the continuous value lies between the last step below an
	// upper bound and the bound.
	Rounding bool
	// More counts the further margins that pushed the same multiplier
	// past its range.
	More int
}

// holds reports whether the conflict holds its multiplier below what
// margins ask of it: at the top of its range or of an upper bound, or on
// the step below a bound (not a bound below its range, where the
// multiplier stays at what the margins below ask).
func (c Conflict) holds() bool { return c.Var >= 0 && !c.Below }

// build turns the collected constraints into a problem.
func build(c *collector) *problem {
	n := len(c.vars)
	p := &problem{vars: c.vars, lo: make([]float64, n), hi: make([]float64, n), loSrc: make([]*Source, n), hiSrc: make([]*Source, n), byD: make([][]int, n)}
	for i, v := range c.vars {
		p.lo[i], p.hi[i] = v.Range.Min, v.Range.Max
		if lb := c.lower[i]; lb.src != nil && lb.v > p.lo[i] {
			p.lo[i], p.loSrc[i] = lb.v, lb.src
		}
		// The upper bounds, lowest first (ties by source, for a fixed
		// order): those below what the range and the lower bounds allow
		// cannot be met and are left out, as one conflict.
		ubs := make([]bound, 0, len(c.upper[i]))
		for _, b := range c.upper[i] {
			ubs = append(ubs, b)
		}
		sort.Slice(ubs, func(a, b int) bool {
			if ubs[a].v != ubs[b].v {
				return ubs[a].v < ubs[b].v
			}
			return sourceLess(ubs[a].src, ubs[b].src)
		})
		var under []bound
		for len(ubs) > 0 && ubs[0].v < p.lo[i]-feasTol*math.Max(1, p.lo[i]) {
			under, ubs = append(under, ubs[0]), ubs[1:]
		}
		if len(under) > 0 {
			chain := []*Source{under[0].src}
			if p.loSrc[i] != nil {
				chain = append(chain, p.loSrc[i])
			}
			p.conflicts = append(p.conflicts, Conflict{Var: i, NeedX: under[0].v, LimitX: p.lo[i], Chain: chain, Below: true, More: len(under) - 1})
		}
		if len(ubs) > 0 && ubs[0].v < p.hi[i] {
			p.hi[i], p.hiSrc[i] = ubs[0].v, ubs[0].src
		}
	}
	for i, v := range c.vars {
		if p.lo[i] > p.hi[i]+feasTol*math.Max(1, p.hi[i]) {
			p.conflicts = append(p.conflicts, Conflict{Var: i, NeedX: p.lo[i], LimitX: p.hi[i], Chain: []*Source{p.loSrc[i]}})
			p.lo[i], p.loSrc[i] = math.Max(v.Range.Min, math.Min(p.lo[i], p.hi[i])), nil
		}
	}
	keys := make([][2]int, 0, len(c.lines))
	for k := range c.lines {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if keys[i][1] != keys[j][1] {
			return keys[i][1] < keys[j][1]
		}
		return keys[i][0] < keys[j][0]
	})
	for _, k := range keys {
		ls := append([]line(nil), c.lines[k]...)
		sort.Slice(ls, func(i, j int) bool {
			if ls[i].k != ls[j].k {
				return ls[i].k < ls[j].k
			}
			return ls[i].b < ls[j].b
		})
		for _, l := range ls {
			p.byD[k[1]] = append(p.byD[k[1]], len(p.edges))
			p.edges = append(p.edges, edge{u: k[0], d: k[1], k: l.k, b: l.b, src: l.src})
		}
	}
	fixed := make([]fixedKey, 0, len(c.fixed))
	for k := range c.fixed {
		fixed = append(fixed, k)
	}
	sort.Slice(fixed, func(i, j int) bool {
		a, b := fixed[i], fixed[j]
		if a.check != b.check {
			return a.check < b.check
		}
		if a.up != b.up {
			return a.up < b.up
		}
		return a.down < b.down
	})
	for _, k := range fixed {
		m := c.fixed[k]
		p.conflicts = append(p.conflicts, Conflict{Var: -1, Chain: []*Source{m.src}, ShortS: m.shortS})
	}
	return p
}

// errNoConvergence is returned when raising the multipliers does not
// settle (a loop of margins whose gains nearly balance).
var errNoConvergence = errors.New("the least multipliers did not settle within the iteration limit")

// least raises x (which starts at or above lo) until every edge holds,
// rounding each raised value with round. An edge that would push a
// multiplier past its top is a conflict: recorded, dropped, and the
// multiplier left at its top. It returns, per variable, the edge that set
// it last (−1: its start).
func (p *problem) least(x []float64, round func(i int, v float64) float64) ([]int, error) {
	n := len(x)
	reason := make([]int, n)
	for i := range reason {
		reason[i] = -1
	}
	queue := make([]int, 0, n)
	queued := make([]bool, n)
	for i := 0; i < n; i++ {
		queue, queued[i] = append(queue, i), true
	}
	budget := 200 * (n + len(p.edges) + 10)
	for len(queue) > 0 {
		d := queue[0]
		queue = queue[1:]
		queued[d] = false
		for _, ei := range p.byD[d] {
			e := &p.edges[ei]
			if e.dropped {
				continue
			}
			need := e.k*x[d] + e.b
			if need <= x[e.u]+feasTol*math.Max(1, math.Abs(x[e.u])) {
				continue
			}
			if budget--; budget < 0 {
				return nil, errNoConvergence
			}
			v := round(e.u, need)
			if v > p.hi[e.u]+feasTol*math.Max(1, p.hi[e.u]) {
				p.conflict(Conflict{Var: e.u, NeedX: need, LimitX: p.hi[e.u]}, func() []*Source { return p.chain(ei, reason) })
				// The margin is left out, and the multiplier goes as far
				// towards it as its range allows.
				e.dropped = true
				v = p.hi[e.u]
				p.lo[e.u] = math.Max(p.lo[e.u], v)
				if v <= x[e.u] {
					continue
				}
			}
			x[e.u], reason[e.u] = v, ei
			if !queued[e.u] {
				queue, queued[e.u] = append(queue, e.u), true
			}
		}
	}
	return reason, nil
}

// conflict records a conflict of a multiplier pushed past its range:
// the first with its chain, and a count of the others.
func (p *problem) conflict(c Conflict, chain func() []*Source) {
	if p.pushed == nil {
		p.pushed = map[int]int{}
	}
	if i, ok := p.pushed[c.Var]; ok {
		p.conflicts[i].More++
		return
	}
	c.Chain = chain()
	p.pushed[c.Var] = len(p.conflicts)
	p.conflicts = append(p.conflicts, c)
}

// chain lists the margin of edge ei and those that raised its lower
// variable, and so on down, each once.
func (p *problem) chain(ei int, reason []int) []*Source {
	var out []*Source
	seen := map[int]bool{}
	for ei >= 0 && !seen[ei] && len(out) < 12 {
		seen[ei] = true
		out = append(out, p.edges[ei].src)
		ei = reason[p.edges[ei].d]
	}
	return out
}

// continuous returns the least multipliers, unrounded.
func (p *problem) continuous() ([]float64, error) {
	x := append([]float64(nil), p.lo...)
	_, err := p.least(x, func(_ int, v float64) float64 { return v })
	return x, err
}

// rounded returns the least multipliers on their steps at or above x.
func (p *problem) rounded(x []float64) ([]float64, error) {
	r := make([]float64, len(x))
	for i := range x {
		rg := p.vars[i].Range
		hi := math.Min(p.hi[i], topStep(rg))
		r[i] = onStep(x[i], rg)
		if r[i] > hi+feasTol*math.Max(1, hi) {
			// Between the last step and the top of the range, or above an
			// upper bound that lies between two steps.
			chain := []*Source{p.hiSrc[i]}
			if p.hiSrc[i] == nil {
				chain = nil
			}
			p.conflicts = append(p.conflicts, Conflict{Var: i, NeedX: r[i], LimitX: hi, Chain: chain, Rounding: true})
			r[i] = floorStep(hi, rg)
		}
		// A multiplier the rounds push to its top stops at the highest
		// step within the range and its upper bound: a relay is set on
		// its steps, and the bound (a clearing time) is kept.
		p.hi[i] = floorStep(hi, rg)
	}
	round := func(i int, v float64) float64 { return onStep(v, p.vars[i].Range) }
	_, err := p.least(r, round)
	return r, err
}

// binding returns, per variable, what holds it where it is in x: the
// edge whose need is highest (−1 when none reaches the range's bottom or
// a fixed lower bound is higher), and that need.
func (p *problem) binding(x []float64) (edges []int, need []float64) {
	n := len(x)
	edges, need = make([]int, n), make([]float64, n)
	for i := range edges {
		edges[i], need[i] = -1, p.lo[i]
	}
	for ei, e := range p.edges {
		if e.dropped {
			continue
		}
		if v := e.k*x[e.d] + e.b; v > need[e.u] {
			edges[e.u], need[e.u] = ei, v
		}
	}
	return edges, need
}

// sourceLess orders two sources by check, devices, stage and fault (its
// scenario first), so that of equal constraints the same one is kept
// whatever order the checker's workers hand them in. A nil source (none)
// comes last.
func sourceLess(a, b *Source) bool {
	switch {
	case a == nil || b == nil:
		return a != nil && b == nil
	case a.Check != b.Check:
		return a.Check < b.Check
	case a.Up != b.Up:
		return a.Up < b.Up
	case a.Down != b.Down:
		return a.Down < b.Down
	case a.UpStage != b.UpStage:
		return a.UpStage < b.UpStage
	case a.Scenario != b.Scenario:
		return a.Scenario < b.Scenario
	case a.Kind != b.Kind:
		return a.Kind < b.Kind
	case a.Case != b.Case:
		return a.Case < b.Case
	case a.Where != b.Where:
		return a.Where < b.Where
	case a.Place != b.Place:
		return placeLess(a.Place, b.Place)
	case a.Scale != b.Scale:
		return a.Scale < b.Scale
	case a.Sequence != b.Sequence:
		return !a.Sequence
	case a.RequiredS != b.RequiredS:
		return a.RequiredS < b.RequiredS
	case a.MarginS != b.MarginS:
		return a.MarginS < b.MarginS
	case a.Equipment != b.Equipment:
		return a.Equipment < b.Equipment
	}
	return a.CurrentA < b.CurrentA
}

// placeLess orders fault places: buses before branches, then by index
// and position.
func placeLess(a, b faults.Place) bool {
	switch {
	case a.Branch != b.Branch:
		return a.Branch < b.Branch
	case a.Bus != b.Bus:
		return a.Bus < b.Bus
	}
	return a.Frac < b.Frac
}
