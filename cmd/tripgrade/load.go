package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/faults"
)

// loaded is a study ready for the fault engine and the checks.
type loaded struct {
	path   string // the study file as the user named it
	study  *coord.Study
	engine *faults.Engine
	topo   *coord.Topology
}

// loadStudy reads, checks and prepares a study file, printing every
// problem to stderr. ok is false when the input is wrong.
func loadStudy(path string, stderr io.Writer) (l loaded, ok bool) {
	s, err := study.Load(path)
	if err != nil {
		printLoadError(path, err, stderr)
		return l, false
	}
	printNotes(s, stderr)
	return prepare(path, s, stderr)
}

// printNotes tells what loading the study assumed where its input left a
// choice; the reports repeat it.
func printNotes(s *coord.Study, stderr io.Writer) {
	for _, n := range s.Notes {
		fmt.Fprintf(stderr, "note: %s\n", n)
	}
}

// printLoadError prints every problem study.Load found.
func printLoadError(path string, err error, stderr io.Writer) {
	var list study.ErrorList
	switch {
	case errors.As(err, &list):
		for _, e := range list {
			fmt.Fprintln(stderr, e)
		}
		fmt.Fprintf(stderr, "tripgrade: %d problem(s) in %s\n", len(list), path)
	case errors.Is(err, os.ErrNotExist):
		fmt.Fprintf(stderr, "tripgrade: %s: no such file\n", path)
	default:
		fmt.Fprintf(stderr, "tripgrade: %v\n", err)
	}
}

// suggestDevice offers the nearest device name to a mistyped one.
func suggestDevice(s *coord.Study, name string) string {
	if name == "" {
		return ""
	}
	if near := study.Closest(name, deviceNames(s)); near != "" && near != name {
		return fmt.Sprintf("; did you mean %q?", near)
	}
	return ""
}

// prepare builds the fault engine and the zones of a checked study.
func prepare(path string, s *coord.Study, stderr io.Writer) (loaded, bool) {
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		var list study.ErrorList
		if errors.As(study.Locate(path, err), &list) {
			for _, e := range list {
				fmt.Fprintln(stderr, e)
			}
			return loaded{}, false
		}
		fmt.Fprintf(stderr, "%s: %v\n", path, err)
		return loaded{}, false
	}
	return loaded{path: path, study: s, engine: eng, topo: topo}, true
}

// printStale prints, with its line, every [[accept]] entry that covered
// no failing or warning finding; ok is false when there is any.
func printStale(l loaded, stale []error, stderr io.Writer) (ok bool) {
	for _, err := range stale {
		var sa *coord.StaleAcceptance
		if errors.As(err, &sa) && sa.Entry.Line > 0 {
			fmt.Fprintf(stderr, "%s:%d: %v\n", l.path, sa.Entry.Line, err)
			continue
		}
		fmt.Fprintf(stderr, "%s: %v\n", l.path, err)
	}
	if len(stale) > 0 {
		fmt.Fprintf(stderr, "tripgrade: %d stale acceptance(s) in %s\n", len(stale), l.path)
	}
	return len(stale) == 0
}
