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
	study  *coord.Study
	engine *faults.Engine
	topo   *coord.Topology
}

// loadStudy reads, checks and prepares a study file, printing every
// problem to stderr. ok is false when the input is wrong.
func loadStudy(path string, stderr io.Writer) (l loaded, ok bool) {
	s, err := study.Load(path)
	if err != nil {
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
	return loaded{study: s, engine: eng, topo: topo}, true
}
