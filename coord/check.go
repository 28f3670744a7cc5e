package coord

import (
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"tripgrade/faults"
)

// checker holds what every check needs of one study. Its methods only
// read it (the solver's memory is safe for concurrent use), so the checks
// of different devices and pairs run at once.
type checker struct {
	s       *Study
	eng     *faults.Engine
	topo    *Topology
	sol     *solver
	timers  []*Timer
	places  [][]faults.Place       // fault places of each device's zone
	atPoint map[faults.Point][]int // devices at each branch end
	hook    func(*MarginSample)    // Options.Margins
	names   *placeNames
}

// Check runs every check on a study and returns the backup pairs and the
// findings, grouped by check in report order and, within a check, in the
// study's device order.
func Check(s *Study, eng *faults.Engine, t *Topology) (*Result, error) {
	return CheckWith(s, eng, t, Options{})
}

// CheckWith is Check with options.
func CheckWith(s *Study, eng *faults.Engine, t *Topology, o Options) (*Result, error) {
	c := &checker{s: s, eng: eng, topo: t, sol: newSolver(eng), atPoint: map[faults.Point][]int{}, hook: o.Margins,
		names: newPlaceNames(s.Network, s.Faults.Fractions())}
	for i := range s.Devices {
		c.timers = append(c.timers, NewTimer(&s.Devices[i]))
		c.places = append(c.places, t.Places(t.Zones[i], s.Network, s.Faults))
		c.atPoint[s.Devices[i].Point] = append(c.atPoint[s.Devices[i].Point], i)
	}
	r := &Result{}
	r.Pairs, r.Excluded = derivePairs(s, t)
	// The findings are gathered in parts and joined once at the end: a
	// large study has hundreds of thousands.
	var parts [][]Finding
	add := func(fs ...Finding) { parts = append(parts, fs) }

	fs, notes, err := c.discrimination()
	if err != nil {
		return nil, err
	}
	r.Notes = notes
	add(fs...)
	nd, np := len(s.Devices), len(r.Pairs)
	steps := []struct {
		n   int
		run func(i int) ([]Finding, error)
	}{
		{np, func(i int) ([]Finding, error) { f, err := c.grading(r.Pairs[i]); return []Finding{f}, err }},
		{nd, c.primarySensitivity},
		{np, func(i int) ([]Finding, error) { return c.backupSensitivity(r.Pairs[i]) }},
		{nd, func(i int) ([]Finding, error) { return optional(c.loadMargin(i)) }},
		{nd, c.instantaneousReach},
		{nd, func(i int) ([]Finding, error) { return optional(c.inrush(i)) }},
	}
	for _, st := range steps {
		fs, err := inParallel(st.n, st.run)
		if err != nil {
			return nil, err
		}
		parts = append(parts, fs...)
	}
	fs, err = c.damage()
	if err != nil {
		return nil, err
	}
	add(fs...)
	audit, err := inParallel(nd, c.settingsAudit)
	if err != nil {
		return nil, err
	}
	parts = append(parts, audit...)
	r.Findings = slices.Concat(parts...)
	for i := range r.Findings {
		settle(&r.Findings[i])
	}
	return r, nil
}

func optional(f Finding, ok bool) ([]Finding, error) {
	if !ok {
		return nil, nil
	}
	return []Finding{f}, nil
}

// inParallel runs run(0..n−1) on every CPU and returns their findings by
// index, or the error of the lowest index that failed.
func inParallel(n int, run func(i int) ([]Finding, error)) ([][]Finding, error) {
	res := make([][]Finding, n)
	errs := make([]error, n)
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < min(runtime.GOMAXPROCS(0), n); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				res[i], errs[i] = run(i)
			}
		}()
	}
	wg.Wait()
	for i := range res {
		if errs[i] != nil {
			return nil, errs[i]
		}
	}
	return res, nil
}
