package curves_test

import (
	"fmt"

	"tripgrade/curves"
)

func ExampleNewThroughFault() {
	// An invented 11 kV, 1.5 MVA unit: 78.7 A rated on the HV side, 6 % impedance.
	cat, _ := curves.CategoryForKVA(1500)
	tf, err := curves.NewThroughFault(curves.ThroughFaultSettings{
		Category: cat, RatedA: 78.7, ZPct: 6, FrequentFaults: true,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, hi := tf.Span()
	fmt.Printf("category %v, defined from %.0f A to %.0f A\n", cat, lo, hi)
	for _, currentA := range []float64{400, 1000, 1300} {
		t, _ := tf.Time(currentA)
		fmt.Printf("%4.0f A: withstands %.2f s\n", currentA, t)
	}
	// Output:
	// category II, defined from 157 A to 1312 A
	//  400 A: withstands 50.82 s
	// 1000 A: withstands 3.44 s
	// 1300 A: withstands 2.04 s
}

func ExampleNewCableWithstand() {
	cable, err := curves.NewCableWithstand(curves.Copper, curves.XLPE, 240)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("I²t = %.4g A²s\n", cable.I2tA2S)
	t, _ := cable.Time(20000)
	fmt.Printf("20 kA: %.3f s\n", t)
	_, st := cable.Time(5000)
	fmt.Printf("5 kA: %v (beyond the 5 s of the adiabatic equation)\n", st)
	// Output:
	// I²t = 1.178e+09 A²s
	// 20 kA: 2.945 s
	// 5 kA: not defined (beyond the 5 s of the adiabatic equation)
}
