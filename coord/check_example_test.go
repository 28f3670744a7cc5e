package coord_test

import (
	"fmt"
	"os"

	"tripgrade/coord"
	"tripgrade/coord/study"
)

// Check finds the backup pairs of a study and judges every check; here two
// standard-inverse relays in series whose margin is too small, seen by the
// grading check (R2 under R1) and fault by fault (R1 operates for a fault
// R2 must clear).
func ExampleCheck() {
	s, err := study.Load("../testdata/checks/grading.toml")
	if err != nil {
		fmt.Println(err)
		return
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		fmt.Println(err)
		return
	}
	r, err := coord.Check(s, eng, topo)
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return
	}
	for _, p := range r.Pairs {
		fmt.Printf("%s backs up %s\n", s.Devices[p.Upstream].Name, s.Devices[p.Downstream].Name)
	}
	for _, f := range r.Findings {
		if f.Verdict == coord.Fail {
			fmt.Printf("%s %s, %s and %s: %.3f s %s %.3f s at %s %s %s\n", f.Verdict, f.Check, f.Device, f.Other,
				f.Measured, f.Relation, f.Required, f.Fault.Kind, f.Fault.Case, f.Fault.Place)
		}
	}
	// Output:
	// R1 backs up R2
	// FAIL discrimination, R1 and R2: 0.141 s ≥ 0.300 s at LLL max L2, B end
	// FAIL grading margin, R2 and R1: 0.141 s ≥ 0.300 s at LLL max L2, B end
}
