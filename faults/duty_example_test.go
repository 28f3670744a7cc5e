package faults_test

import (
	"fmt"

	"tripgrade/faults"
)

// An 11 kV busbar fed by a 250 MVA grid equivalent and carrying a group
// of three 1.5 MW motors: what its switchgear must make and break for a
// three-phase fault there, with t_min = 0.1 s.
func ExampleEngine_Duty() {
	net := &faults.Network{
		Buses: []faults.Bus{{Name: "A", KV: 11}},
		Sources: []faults.Source{{Name: "grid", Bus: 0, Earthed: true, Z0Z1: 1,
			Max: faults.Strength{SCMVA: 250, XR: 14}, Min: faults.Strength{SCMVA: 150, XR: 10}}},
		Motors: []faults.Motor{{Name: "pumps", Bus: 0, MW: 1.5, KV: 11, PF: 0.87, Eff: 0.955,
			LockedRotor: 6, PolePairs: 2, Count: 3}},
	}
	eng, err := faults.New(net, faults.Settings{MinTimeDelayS: 0.1})
	if err != nil {
		fmt.Println(err)
		return
	}
	d, err := eng.Duty(0)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("I\"k %.0f A, κ %.3f, i_p %.0f A, I_b %.0f A, I_k %.0f A\n", d.IkA, d.Kappa, d.PeakA, d.BreakingA, d.SteadyA)
	// Output:
	// I"k 14993 A, κ 1.790, i_p 37948 A, I_b 13840 A, I_k 13122 A
}
