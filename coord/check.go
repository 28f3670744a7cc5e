package coord

import "tripgrade/faults"

// checker holds what every check needs of one study.
type checker struct {
	s      *Study
	eng    *faults.Engine
	topo   *Topology
	sol    *solver
	timers []*Timer
	places [][]faults.Place // fault places of each device's zone
}

// Check runs every check on a study and returns the backup pairs and the
// findings, grouped by check in report order and, within a check, in the
// study's device order.
func Check(s *Study, eng *faults.Engine, t *Topology) (*Result, error) {
	c := &checker{s: s, eng: eng, topo: t, sol: newSolver(eng)}
	for i := range s.Devices {
		c.timers = append(c.timers, NewTimer(&s.Devices[i]))
		c.places = append(c.places, t.Places(t.Zones[i], s.Network, s.Faults))
	}
	r := &Result{}
	r.Pairs, r.Excluded = derivePairs(s, t)
	add := func(fs ...Finding) { r.Findings = append(r.Findings, fs...) }

	for _, p := range r.Pairs {
		f, err := c.grading(p)
		if err != nil {
			return nil, err
		}
		add(f)
	}
	for i := range s.Devices {
		fs, err := c.primarySensitivity(i)
		if err != nil {
			return nil, err
		}
		add(fs...)
	}
	for _, p := range r.Pairs {
		fs, err := c.backupSensitivity(p)
		if err != nil {
			return nil, err
		}
		add(fs...)
	}
	for i := range s.Devices {
		if f, ok := c.loadMargin(i); ok {
			add(f)
		}
	}
	for i := range s.Devices {
		fs, err := c.instantaneousReach(i)
		if err != nil {
			return nil, err
		}
		add(fs...)
	}
	for i := range s.Devices {
		if f, ok := c.inrush(i); ok {
			add(f)
		}
	}
	fs, err := c.damage()
	if err != nil {
		return nil, err
	}
	add(fs...)
	for i := range s.Devices {
		fs, err := c.settingsAudit(i)
		if err != nil {
			return nil, err
		}
		add(fs...)
	}
	for i := range r.Findings {
		settle(&r.Findings[i])
	}
	return r, nil
}
