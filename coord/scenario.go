package coord

import (
	"fmt"
	"runtime"
	"sync"

	"tripgrade/faults"
)

// AsDrawn names the configuration the study file draws, among its
// scenarios: every element in service, every switch as normally operated.
const AsDrawn = "as drawn"

// Scenario is an operating configuration of a study other than the one it
// draws: elements out of service, switches opened or closed, a source's
// strength, a generator running in the minimum case. A scenario is a
// different network, so it is checked as a study of its own (Build, then
// Prepare and Check); its findings carry its name.
type Scenario struct {
	Name string
	// Changes says in words what differs from the study as drawn.
	Changes string
	// Outage is true for a scenario the study's N-1 sweep added: the
	// single outage of one element.
	Outage bool
	// Out names the network elements an outage of the sweep takes out of
	// service, when that is all it changes: its check then works out only
	// the island of the network they are in, and takes the findings of
	// every other island from the study as drawn (see reusable).
	Out []string
	// Build returns the study in this configuration, with no scenarios of
	// its own. The study loader provides it; each call builds afresh, so
	// the studies of many scenarios need never be held at once.
	Build func() (*Study, error)
}

// Tag sets the scenario of every finding of a result.
func (r *Result) Tag(scenario string) {
	for i := range r.Findings {
		r.Findings[i].Scenario = scenario
	}
}

// Checked is one scenario's check: the study in that configuration, its
// engine and topology, and the result of Check.
type Checked struct {
	Scenario string
	Study    *Study
	Engine   *faults.Engine
	Topology *Topology
	Result   *Result
}

// ScenarioError is a scenario that could not be built or prepared.
type ScenarioError struct {
	Scenario string
	Err      error
}

func (e *ScenarioError) Error() string { return fmt.Sprintf("scenario %q: %v", e.Scenario, e.Err) }

func (e *ScenarioError) Unwrap() error { return e.Err }

// CheckScenarios checks study s as drawn (with the engine and topology
// already prepared for it) and then in each of its scenarios, in order,
// and hands each check to visit as soon as it is made: the studies of
// different scenarios are never held at once. pick chooses the
// scenarios to check by name (AsDrawn for the study as drawn); nil picks
// them all. When the study has scenarios, every finding is tagged with
// the name of the one it was made in. An outage of the N-1 sweep takes
// the findings of the islands it leaves alone from the check of the study
// as drawn, which is made (and not handed to visit) also when pick leaves
// it out.
func CheckScenarios(s *Study, eng *faults.Engine, t *Topology, pick func(name string) bool, visit func(Checked) error) error {
	return CheckScenariosWith(s, eng, t, pick, nil, visit)
}

// CheckScenariosWith is CheckScenarios with the options of each check:
// opts, when not nil, gives them for a scenario's name and its study.
func CheckScenariosWith(s *Study, eng *faults.Engine, t *Topology, pick func(name string) bool, opts func(name string, st *Study) Options, visit func(Checked) error) error {
	optsOf := func(name string, st *Study) Options {
		if opts == nil {
			return Options{}
		}
		return opts(name, st)
	}
	tag := len(s.Scenarios) > 0
	var list []Scenario
	var keep *reusable
	for _, sc := range s.Scenarios {
		if pick == nil || pick(sc.Name) {
			list = append(list, sc)
			if len(sc.Out) > 0 && keep == nil {
				keep = newReusable()
			}
		}
	}
	if pick == nil || pick(AsDrawn) || keep != nil {
		r, err := checkWith(s, eng, t, optsOf(AsDrawn, s), keep, nil)
		if err != nil {
			return err
		}
		if tag {
			r.Tag(AsDrawn)
		}
		if pick == nil || pick(AsDrawn) {
			if err := visit(Checked{Scenario: AsDrawn, Study: s, Engine: eng, Topology: t, Result: r}); err != nil {
				return err
			}
		}
	}
	return pipeline(list, func(sc Scenario) (Checked, error) { return checkScenario(s, sc, optsOf, keep) }, visit)
}

// pipeline checks the scenarios of list on every CPU, several at a time,
// and hands them to visit in list order. A scenario's check is kept only
// until visit has taken it, and no more than one per CPU are under way or
// waiting, so memory does not grow with the number of scenarios. The
// first error, in list order, stops it.
func pipeline(list []Scenario, check func(Scenario) (Checked, error), visit func(Checked) error) error {
	type outcome struct {
		c   Checked
		err error
	}
	results := make([]chan outcome, len(list))
	for i := range results {
		results[i] = make(chan outcome, 1)
	}
	slots := make(chan struct{}, runtime.GOMAXPROCS(0))
	stop := make(chan struct{})
	var wg sync.WaitGroup
	defer wg.Wait()
	defer close(stop)
	wg.Add(1)
	go func() {
		defer wg.Done()
		for i, sc := range list {
			select {
			case slots <- struct{}{}:
			case <-stop:
				return
			}
			wg.Add(1)
			go func() {
				defer wg.Done()
				c, err := check(sc)
				if err != nil {
					err = &ScenarioError{Scenario: sc.Name, Err: err}
				} else {
					c.Result.Tag(sc.Name)
				}
				results[i] <- outcome{c, err}
			}()
		}
	}()
	for i := range list {
		o := <-results[i]
		if o.err != nil {
			return o.err
		}
		if err := visit(o.c); err != nil {
			return err
		}
		<-slots
	}
	return nil
}

// checkScenario builds, prepares and checks one scenario of study s.
// With the record of the study as drawn (keep), an outage's check takes
// over the findings of the islands it leaves as drawn.
func checkScenario(s *Study, sc Scenario, opts func(string, *Study) Options, keep *reusable) (Checked, error) {
	st, err := sc.Build()
	if err != nil {
		return Checked{}, err
	}
	eng, t, err := Prepare(st)
	if err != nil {
		return Checked{}, err
	}
	var g *region
	if keep != nil && len(sc.Out) > 0 {
		g = changedRegion(s.Network, st.Network, sc.Out, keep)
	}
	r, err := checkWith(st, eng, t, opts(sc.Name, st), nil, g)
	if err != nil {
		return Checked{}, err
	}
	return Checked{Scenario: sc.Name, Study: st, Engine: eng, Topology: t, Result: r}, nil
}
