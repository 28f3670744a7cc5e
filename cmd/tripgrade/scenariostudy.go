package main

import (
	"fmt"
	"io"

	"tripgrade/coord"
	"tripgrade/coord/study"
)

// scenarioFlagHelp is the help of faults' and plot's --scenario.
const scenarioFlagHelp = "the study in its scenario `NAME` (a [[scenario]] table or an N-1 outage, \"L5 out\") instead of as drawn"

// inScenario returns the study l in its scenario name, built and
// prepared, with the scenario named in its title; the study as drawn for
// "" or coord.AsDrawn. Problems are printed to stderr; ok is false when
// the name or the scenario's network is wrong.
func inScenario(l loaded, name string, stderr io.Writer) (loaded, bool) {
	if name == "" || name == coord.AsDrawn {
		return l, true
	}
	var names []string
	for _, sc := range l.study.Scenarios {
		if sc.Name != name {
			names = append(names, sc.Name)
			continue
		}
		in, err := buildScenario(l.path, sc)
		if err != nil {
			scenarioFailure(l, &coord.ScenarioError{Scenario: sc.Name, Err: err}, stderr)
			return loaded{}, false
		}
		return in, true
	}
	hint := ""
	if near := closestScenario(name, names); near != "" {
		hint = fmt.Sprintf("; did you mean %q?", near)
	}
	if len(l.study.Scenarios) == 0 {
		hint = "; it has none ([[scenario]] tables and n_minus_1 make them)"
	}
	fmt.Fprintf(stderr, "tripgrade: --scenario: study %q has no scenario %q (%q is the study as drawn)%s\n", l.study.Name, name, coord.AsDrawn, hint)
	return loaded{}, false
}

// buildScenario builds and prepares the study of a scenario, named in
// its title.
func buildScenario(path string, sc coord.Scenario) (loaded, error) {
	st, err := sc.Build()
	if err != nil {
		return loaded{}, err
	}
	eng, topo, err := coord.Prepare(st)
	if err != nil {
		return loaded{}, err
	}
	st.Name = fmt.Sprintf("%s, scenario %s (%s)", st.Name, sc.Name, sc.Changes)
	return loaded{path: path, study: st, engine: eng, topo: topo}, nil
}

// closestScenario is the scenario name (or coord.AsDrawn) a mistyped name
// most likely meant: the nearest in spelling, or the N-1 outage of an
// element of that name ("TB-AB" for "TB-AB out").
func closestScenario(name string, names []string) string {
	if near := study.Closest(name, append(names, coord.AsDrawn)); near != "" {
		return near
	}
	for _, n := range names {
		if n == name+" out" {
			return n
		}
	}
	return ""
}
