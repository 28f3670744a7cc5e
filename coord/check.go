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
	keep    *reusable // the items' findings, recorded for the outages' checks
	region  *region   // the part of the network an outage changes (nil: all)
}

// Check runs every check on a study and returns the backup pairs and the
// findings, grouped by check in report order and, within a check, in the
// study's device order.
func Check(s *Study, eng *faults.Engine, t *Topology) (*Result, error) {
	return CheckWith(s, eng, t, Options{})
}

// CheckWith is Check with options.
func CheckWith(s *Study, eng *faults.Engine, t *Topology, o Options) (*Result, error) {
	return checkWith(s, eng, t, o, nil, nil)
}

// checkWith is CheckWith that, with keep, records every item's findings
// for the checks of the study's outages, and with g, checks only the
// items in region g and takes every other item's findings from g.prior.
func checkWith(s *Study, eng *faults.Engine, t *Topology, o Options, keep *reusable, g *region) (*Result, error) {
	c := &checker{s: s, eng: eng, topo: t, sol: newSolver(eng), atPoint: map[faults.Point][]int{}, hook: o.Margins,
		names: newPlaceNames(s.Network, s.Faults.Fractions()), keep: keep, region: g}
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

	fs, notes, err := c.discrimination()
	if err != nil {
		return nil, err
	}
	r.Notes = notes
	parts = append(parts, fs)
	nd, np := len(s.Devices), len(r.Pairs)
	device := func(i int) (string, bool) { return s.Devices[i].Name, g.device(s, i) }
	pair := func(i int) (string, bool) {
		p := r.Pairs[i]
		return s.Devices[p.Downstream].Name + "\x00" + s.Devices[p.Upstream].Name, g.device(s, p.Downstream)
	}
	steps := []struct {
		part  part
		n     int
		which func(i int) (string, bool) // the item's name, and whether it lies in the region
		run   func(i int) ([]Finding, error)
	}{
		{partGrading, np, pair, func(i int) ([]Finding, error) { f, err := c.grading(r.Pairs[i]); return []Finding{f}, err }},
		{partPrimary, nd, device, c.primarySensitivity},
		{partBackup, np, pair, func(i int) ([]Finding, error) { return c.backupSensitivity(r.Pairs[i]) }},
		{partLoad, nd, device, func(i int) ([]Finding, error) { return optional(c.loadMargin(i)) }},
		{partReach, nd, device, c.instantaneousReach},
		{partInrush, nd, device, func(i int) ([]Finding, error) { return optional(c.inrush(i)) }},
	}
	run := func(p part, n int, which func(int) (string, bool), run func(int) ([]Finding, error)) error {
		fs, err := inParallel(n, func(i int) ([]Finding, error) {
			name, in := which(i)
			return item(g, nil, p, name, in, func() ([]Finding, error) { return run(i) })
		})
		if err != nil {
			return err
		}
		if keep != nil {
			for i := range fs {
				name, _ := which(i)
				keep.put(p, name, fs[i])
			}
		}
		parts = append(parts, fs...)
		return nil
	}
	for _, st := range steps {
		if err := run(st.part, st.n, st.which, st.run); err != nil {
			return nil, err
		}
	}
	fs, err = c.damage()
	if err != nil {
		return nil, err
	}
	parts = append(parts, fs)
	if err := run(partAudit, nd, device, c.settingsAudit); err != nil {
		return nil, err
	}
	r.Findings = slices.Concat(parts...)
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
