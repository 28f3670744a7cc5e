package curves_test

import (
	"fmt"

	"tripgrade/curves"
)

func ExampleNewTable() {
	// An invented minimum-melt curve read off a graph.
	melt, err := curves.NewTable("fuse 100 A melt", []curves.Point{
		{CurrentA: 200, TimeS: 300},
		{CurrentA: 400, TimeS: 10},
		{CurrentA: 1000, TimeS: 0.5},
		{CurrentA: 3000, TimeS: 0.01},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, currentA := range []float64{150, 400, 600, 5000} {
		t, st := melt.Time(currentA)
		if st != curves.Operates {
			fmt.Printf("%4.0f A: %v\n", currentA, st)
			continue
		}
		fmt.Printf("%4.0f A: %.3g s\n", currentA, t)
	}
	_, err = curves.NewTable("bad", []curves.Point{{100, 5}, {90, 1}})
	fmt.Println(err)
	// Output:
	//  150 A: not defined
	//  400 A: 10 s
	//  600 A: 2.66 s
	// 5000 A: not defined
	// table "bad": point index 1 (90 A, 1 s): current must be above the previous point's 100 A (points sorted by increasing current, no repeats)
}
