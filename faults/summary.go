package faults

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// Extreme is the largest or smallest current found over a set of faults,
// with the fault that produced it.
type Extreme struct {
	A     float64
	Fault Fault
	At    Currents // the point's currents for that fault
	// V are the voltages at the point's bus for that fault (what a
	// directional element there is polarised by), Pre its pre-fault
	// voltage.
	V, Pre Voltages
	Found  bool // false when no fault of the set drives any current
}

// tieTolerance is the relative difference below which two currents count
// as equal, so that the first fault offered keeps its place: faults that
// theory makes equal (an LL fault seen across a delta–star transformer
// gives the same largest phase current as an LLL fault) then report the
// same fault whatever the rounding of the solves.
const tieTolerance = 1e-9

func (x *Extreme) offer(a float64, f Fault, at Currents, v func() (Voltages, Voltages), larger bool) {
	if !x.Found || (larger && a > x.A*(1+tieTolerance)) || (!larger && a < x.A*(1-tieTolerance)) {
		*x = Extreme{A: a, Fault: f, At: at, Found: true}
		x.V, x.Pre = v()
	}
}

// PointSummary gives the extreme currents at a measuring point over a set
// of fault places.
type PointSummary struct {
	Point Point
	// PhaseMax: the largest phase current, maximum case, any fault kind.
	PhaseMax Extreme
	// PhaseMin: the smallest non-zero phase current, minimum case, LLL
	// and LL faults (the faults a phase element must detect). Faults that
	// drive no current through the point (a fault of its zone fed only
	// from the other side, as a transformer fault is in the minimum case
	// at an LV incomer with no generation behind it) are left out.
	PhaseMin Extreme
	// ResidualMax: the largest residual current 3I0, maximum case, LG and
	// LLG faults.
	ResidualMax Extreme
	// ResidualMin: the smallest non-zero residual current, minimum case
	// (with the Settings' fault resistance), LG and LLG faults. Faults that
	// drive no residual current through the point (an earth fault beyond a
	// delta winding) are left out; Found is false when none drives any.
	ResidualMin Extreme
}

// Reach returns the fault places a measuring point's figures are taken
// over: close-in just beyond the point, the line positions of the
// Settings along its own branch, and the bus at the far end (where the
// next branches start, so a fault close-in on any of them gives the point
// the same current). For a point on a winding of a three-winding
// transformer the far end is the other two windings' buses, not the
// internal star point.
func (e *Engine) Reach(pt Point) []Place {
	n := e.net
	from, to := n.BranchEnds(pt.Branch)
	near, far := 0.0, to
	if pt.End == To {
		near, far = 1, from
	}
	places := []Place{OnBranch(pt.Branch, near)}
	if t, w, ok := n.Star(pt.Branch); ok && pt.End == From {
		for v, bus := range t.Buses {
			if v != w {
				places = append(places, AtBus(bus))
			}
		}
		return places
	}
	if !n.IsTransformer(pt.Branch) {
		for _, f := range e.set.Fractions() {
			places = append(places, OnBranch(pt.Branch, f))
		}
	}
	return append(places, AtBus(far))
}

// SummarisePoint solves every fault kind at every place in both cases and
// keeps the extremes seen at pt.
func (e *Engine) SummarisePoint(pt Point, places []Place) (PointSummary, error) {
	return e.SummarisePointWith(pt, places, nil)
}

// GroundFunc gives the current a ground element measures for a solved
// earth fault, the currents at its point given: the residual current 3I0
// there unless its element measures something else (a transformer's
// neutral current).
type GroundFunc func(sol Solution, at Currents) float64

// SummarisePointWith is SummarisePoint with the residual extremes taken of
// ground (nil: the residual current at pt).
func (e *Engine) SummarisePointWith(pt Point, places []Place, ground GroundFunc) (PointSummary, error) {
	if ground == nil {
		ground = func(_ Solution, at Currents) float64 { return at.ResidualA() }
	}
	s := PointSummary{Point: pt}
	// Solution responses are exactly zero where a point carries no current
	// of a sequence (rounding residue is cut off there: negligibleShare).
	const floor = 0
	for _, pl := range places {
		for _, cs := range Cases {
			// One solution per place and case: the other kinds reuse its
			// Thevenin impedances and the point's response.
			base, err := e.Solve(e.CaseFault(pl, LLL, cs))
			if err != nil {
				return s, err
			}
			if !base.Energised() {
				continue
			}
			resp := base.Response(pt)
			for _, k := range Kinds {
				f := e.CaseFault(pl, k, cs)
				sol := base.WithKind(k, f.ZOhm)
				c := resp.Currents(sol)
				v := func() (Voltages, Voltages) { return resp.Voltages(sol), resp.Prefault() }
				switch {
				case cs == Max:
					s.PhaseMax.offer(c.PhaseMaxA(), f, c, v, true)
					if k.Earth() {
						s.ResidualMax.offer(ground(sol, c), f, c, v, true)
					}
				case k.Earth():
					if r := ground(sol, c); r > floor {
						s.ResidualMin.offer(r, f, c, v, false)
					}
				default:
					if a := c.PhaseMaxA(); a > floor {
						s.PhaseMin.offer(a, f, c, v, false)
					}
				}
			}
		}
	}
	if s.ResidualMax.Found && s.ResidualMax.A <= floor {
		s.ResidualMax.Found = false
	}
	return s, nil
}

// BusFault is the current into one bolted or resistive fault at a bus.
type BusFault struct {
	PhaseA float64 // largest phase current into the fault
	EarthA float64 // current to earth, |3I0|
}

// BusSummary holds the four fault kinds at one bus in both cases, indexed
// [case][kind].
type BusSummary struct {
	Bus    int
	Faults [2][4]BusFault
}

// SummariseBus solves the four fault kinds at bus k in both cases.
func (e *Engine) SummariseBus(k int) (BusSummary, error) {
	s := BusSummary{Bus: k}
	for _, cs := range Cases {
		for _, kind := range Kinds {
			sol, err := e.Solve(e.CaseFault(AtBus(k), kind, cs))
			if err != nil {
				return s, err
			}
			c := sol.FaultCurrents()
			s.Faults[cs][kind] = BusFault{PhaseA: c.PhaseMaxA(), EarthA: c.ResidualA()}
		}
	}
	return s, nil
}

// AllBuses summarises every bus, using every CPU. The result is in bus
// order and does not depend on scheduling.
func (e *Engine) AllBuses() ([]BusSummary, error) {
	out := make([]BusSummary, len(e.net.Buses))
	err := parallel(len(out), func(i int) (err error) {
		out[i], err = e.SummariseBus(i)
		return err
	})
	return out, err
}

// AllPoints summarises measuring points over the places that places(i)
// gives for pts[i] (Engine.Reach when places is nil), using every CPU.
func (e *Engine) AllPoints(pts []Point, places func(i int) []Place) ([]PointSummary, error) {
	return e.AllPointsWith(pts, places, nil)
}

// AllPointsWith is AllPoints with the residual extremes of point i taken
// of ground(i) (nil, or a nil GroundFunc: the residual current there).
func (e *Engine) AllPointsWith(pts []Point, places func(i int) []Place, ground func(i int) GroundFunc) ([]PointSummary, error) {
	if ground == nil {
		ground = func(int) GroundFunc { return nil }
	}
	if places == nil {
		places = func(i int) []Place { return e.Reach(pts[i]) }
	}
	out := make([]PointSummary, len(pts))
	err := parallel(len(out), func(i int) (err error) {
		out[i], err = e.SummarisePointWith(pts[i], places(i), ground(i))
		return err
	})
	return out, err
}

// parallel runs job(0..n−1) on GOMAXPROCS workers and returns the error of
// the lowest-numbered failing job.
func parallel(n int, job func(i int) error) error {
	workers := runtime.GOMAXPROCS(0)
	if workers > n {
		workers = n
	}
	errs := make([]error, n)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				errs[i] = job(i)
			}
		}()
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
