package propose

import (
	"math"
	"sync"

	"tripgrade/coord"
	"tripgrade/faults"
)

// Source is the margin a constraint comes from: which check judged it,
// the two devices, the upstream stage, and the fault.
type Source struct {
	Check    coord.CheckKind
	Up, Down int // device indices (Up −1 for a clearing bound)
	UpStage  int // the upstream stage the constraint holds (−1: the device as a whole)
	Kind     faults.Kind
	Case     faults.Case
	Place    faults.Place
	Scale    float64
	Sequence bool
	// RequiredS is the margin required (the maximum clearing time for a
	// clearing bound); MarginS the margin the checker found where the
	// constraint was linearised.
	RequiredS, MarginS float64
	// CurrentA is the inrush current of an inrush bound (Check Inrush).
	CurrentA float64
	// Equipment names the equipment of a damage bound; Element the bus or
	// branch faulted, for a clearing bound.
	Equipment, Element string
	// Scenario names the operating scenario the margin was judged in (""
	// for the study as drawn); Where then names the fault's place, which
	// Place cannot (it indexes the scenario's own network), and Up and
	// Down are the study's device indices.
	Scenario, Where string
}

// origin says where a margin handed to a collector was judged: in which
// scenario, whose network names the fault's place. nil: the study as drawn.
type origin struct {
	scenario string
	net      *faults.Network // the scenario's network, which names the fault's place
}

// line is x_U ≥ K·x_D + B between two variables.
type line struct {
	k, b float64
	src  *Source
}

// bound is a fixed lower or upper bound of one variable.
type bound struct {
	v   float64
	src *Source
}

// collector gathers the constraints of every margin the checker hands
// out, keeping only those that can bind: between two variables the
// upper envelope of the lines over the lower variable's range, per
// variable the highest lower bound and the lowest upper bound, and per
// pair of devices the worst margin that no multiplier changes.
type collector struct {
	lin  *linearizer
	vars []Variable
	mu   sync.Mutex
	// lines, per (upper variable, lower variable).
	lines map[[2]int][]line
	lower []bound              // x ≥ lower (max), src nil when none
	upper []map[upperKey]bound // x ≤ upper, the lowest of each source
	// fixed holds, per (check, up, down), the worst constraint 0 ≥ C with
	// C > 0 between fixed times: a margin no multiplier can change.
	fixed map[fixedKey]fixedMiss
	n     int // margins seen
}

// upperKey is the source of an upper bound: a check and an upstream
// device's stage (−1 for a clearing bound).
type upperKey struct {
	check       coord.CheckKind
	up, upStage int
}

type fixedKey struct {
	check    coord.CheckKind
	up, down int
}

type fixedMiss struct {
	shortS float64 // how much the margin falls short
	src    *Source
}

func newCollector(lin *linearizer, vars []Variable) *collector {
	c := &collector{lin: lin, vars: vars, lines: map[[2]int][]line{}, fixed: map[fixedKey]fixedMiss{},
		lower: make([]bound, len(vars)), upper: make([]map[upperKey]bound, len(vars))}
	for i := range vars {
		c.lower[i] = bound{v: math.Inf(-1)}
	}
	return c
}

// margin receives one margin from the checker (coord.Options.Margins).
func (c *collector) margin(ms *coord.MarginSample) { c.marginFrom(ms, nil) }

// marginIn returns the receiver of the margins of the study's scenario
// named name, whose own study is st: its devices are the study's (s) of
// the same name (a scenario has the study's settings and no devices of
// its own), so each margin is taken as one between the study's devices,
// with its scenario and its fault's place by name.
func (c *collector) marginIn(name string, st, s *coord.Study) func(*coord.MarginSample) {
	at := map[string]int{}
	for i := range s.Devices {
		at[s.Devices[i].Name] = i
	}
	dev := make([]int, len(st.Devices))
	for i := range st.Devices {
		j, ok := at[st.Devices[i].Name]
		if !ok {
			j = -1
		}
		dev[i] = j
	}
	return func(ms *coord.MarginSample) {
		m := *ms
		if m.Down = dev[ms.Down]; m.Down < 0 {
			return
		}
		if ms.Up >= 0 {
			if m.Up = dev[ms.Up]; m.Up < 0 {
				return
			}
		}
		c.marginFrom(&m, &origin{scenario: name, net: st.Network})
	}
}

// marginFrom receives one margin judged where o says.
func (c *collector) marginFrom(ms *coord.MarginSample, o *origin) {
	var buf [16]constraint
	cons := buf[:0]
	c.lin.constraints(ms, func(k constraint) { cons = append(cons, k) })
	c.mu.Lock()
	defer c.mu.Unlock()
	c.n++
	for _, k := range cons {
		c.add(k, ms, o)
	}
}

// source describes the margin a kept constraint comes from.
func (c *collector) source(ms *coord.MarginSample, upStage int, o *origin) *Source {
	src := &Source{Check: ms.Check, Up: ms.Up, Down: ms.Down, UpStage: upStage, Kind: ms.Kind, Case: ms.Case, Place: ms.Place,
		Scale: ms.Scale, Sequence: ms.Sequence, RequiredS: ms.RequiredS, MarginS: ms.MarginS, Equipment: ms.Equipment}
	net := c.lin.s.Network
	if o != nil {
		net = o.net
		src.Scenario, src.Where = o.scenario, coord.PlaceName(net, ms.Place)
	}
	if ms.Check == coord.Clearing {
		if ms.Place.IsBus() {
			src.Element = net.Buses[ms.Place.Bus].Name
		} else {
			src.Element = net.BranchName(ms.Place.Branch)
		}
	}
	return src
}

// feasTol is the slack below which a constraint counts as met: the
// checker's figures are compared at the nanosecond.
const feasTol = 1e-9

// add files one constraint A·x_U − B·x_D ≥ C of margin ms.
func (c *collector) add(k constraint, ms *coord.MarginSample, o *origin) {
	hasU, hasD := k.u >= 0 && k.a > 0, k.d >= 0 && k.b > 0
	// The source is described only when the constraint is kept or ties,
	// and once.
	var src *Source
	describe := func() *Source {
		if src == nil {
			src = c.source(ms, k.upStage, o)
		}
		return src
	}
	switch {
	case hasU && hasD:
		c.addLine(k.u, k.d, line{k: k.b / k.a, b: k.c / k.a}, describe)
	case hasU:
		if v := k.c / k.a; v > c.lower[k.u].v || v == c.lower[k.u].v && sourceLess(describe(), c.lower[k.u].src) {
			c.lower[k.u] = bound{v, describe()}
		}
	case hasD:
		// Bounds below the range cannot be met: the lowest of them is kept
		// apart, for the conflict, so that it does not hide the lowest
		// bound the range can meet.
		// Every source's lowest bound is kept: which of them the range
		// (and the lower bounds) can meet is known only when all are in.
		v, key := -k.c/k.b, upperKey{ms.Check, ms.Up, k.upStage}
		if old, ok := c.upper[k.d][key]; !ok || v < old.v || v == old.v && sourceLess(describe(), old.src) {
			if c.upper[k.d] == nil {
				c.upper[k.d] = map[upperKey]bound{}
			}
			c.upper[k.d][key] = bound{v, describe()}
		}
	case k.c > feasTol:
		key := fixedKey{ms.Check, ms.Up, ms.Down}
		if m, ok := c.fixed[key]; !ok || k.c > m.shortS || k.c == m.shortS && sourceLess(describe(), m.src) {
			c.fixed[key] = fixedMiss{k.c, describe()}
		}
	}
}

// addLine keeps x_u ≥ l.k·x_d + l.b unless another line is at least as
// high at both ends of x_d's range, and drops the lines it lies above.
func (c *collector) addLine(u, d int, l line, src func() *Source) {
	key := [2]int{u, d}
	lo, hi := c.vars[d].Range.Min, c.vars[d].Range.Max
	at := func(m line, x float64) float64 { return m.k*x + m.b }
	ls := c.lines[key]
	for i, m := range ls {
		if at(m, lo) >= at(l, lo) && at(m, hi) >= at(l, hi) {
			// Of two equal lines the one of the lesser source stays,
			// whatever order the checker's workers hand them in.
			if at(m, lo) == at(l, lo) && at(m, hi) == at(l, hi) {
				if l.src == nil {
					l.src = src()
				}
				if sourceLess(l.src, m.src) {
					ls[i] = l
				}
			}
			return
		}
	}
	kept := ls[:0]
	for _, m := range ls {
		if !(at(l, lo) >= at(m, lo) && at(l, hi) >= at(m, hi)) {
			kept = append(kept, m)
		}
	}
	if l.src == nil {
		l.src = src()
	}
	c.lines[key] = append(kept, l)
}

// merge adds another collector's constraints (a later round's
// linearisation) to this one.
func (c *collector) merge(o *collector) {
	for key, ls := range o.lines {
		for _, l := range ls {
			c.addLine(key[0], key[1], l, nil)
		}
	}
	for i := range o.lower {
		if o.lower[i].v > c.lower[i].v || o.lower[i].v == c.lower[i].v && sourceLess(o.lower[i].src, c.lower[i].src) {
			c.lower[i] = o.lower[i]
		}
		for key, b := range o.upper[i] {
			if old, ok := c.upper[i][key]; !ok || b.v < old.v || b.v == old.v && sourceLess(b.src, old.src) {
				if c.upper[i] == nil {
					c.upper[i] = map[upperKey]bound{}
				}
				c.upper[i][key] = b
			}
		}
	}
	for key, m := range o.fixed {
		if old, ok := c.fixed[key]; !ok || m.shortS > old.shortS || m.shortS == old.shortS && sourceLess(m.src, old.src) {
			c.fixed[key] = m
		}
	}
	c.n += o.n
}
