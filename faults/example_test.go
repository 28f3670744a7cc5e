package faults_test

import (
	"fmt"

	"tripgrade/faults"
)

// A grid equivalent of 250 MVA at 11 kV feeding a cable: the fault
// currents at the cable's far end and what the relay at its near end
// sees, in both IEC 60909-0 cases.
func ExampleEngine_Solve() {
	net := &faults.Network{
		Buses: []faults.Bus{{Name: "A", KV: 11}, {Name: "B", KV: 11}},
		Sources: []faults.Source{{Name: "grid", Bus: 0, Earthed: true, Z0Z1: 1.2,
			Max: faults.Strength{SCMVA: 250, XR: 10}, Min: faults.Strength{SCMVA: 120, XR: 8}}},
		Lines: []faults.Line{{Name: "cable", From: 0, To: 1, Z1Ohm: complex(0.25, 0.2), Z0Ohm: complex(1, 0.7)}},
	}
	eng, err := faults.New(net, faults.Settings{EarthFaultOhm: 10})
	if err != nil {
		fmt.Println(err)
		return
	}
	relay := faults.Point{Branch: 0, End: faults.From}
	for _, cs := range faults.Cases {
		for _, k := range []faults.Kind{faults.LLL, faults.LG} {
			sol, err := eng.Solve(eng.CaseFault(faults.AtBus(1), k, cs))
			if err != nil {
				fmt.Println(err)
				return
			}
			at := sol.At(relay)
			fmt.Printf("%s %-3s at B: phase %5.0f A, residual %5.0f A\n", cs, k, at.PhaseMaxA(), at.ResidualA())
		}
	}
	// Output:
	// max LLL at B: phase  8841 A, residual     0 A
	// max LG  at B: phase  6437 A, residual  6437 A
	// min LLL at B: phase  5049 A, residual     0 A
	// min LG  at B: phase   592 A, residual   592 A
}
