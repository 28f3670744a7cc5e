package curves_test

import (
	"fmt"

	"tripgrade/curves"
)

func ExampleFastest() {
	law, _ := curves.ShapeIECSI.Law()
	inverse, _ := curves.NewInverseTime(law, 400, 0.2)
	definite, _ := curves.NewDefiniteTime(2400, 0.3)
	instant, _ := curves.NewInstantaneous(8000, 0)
	relay := curves.Fastest{inverse, definite, instant}
	for _, currentA := range []float64{350, 1200, 3000, 9000} {
		t, st := relay.Time(currentA)
		if st != curves.Operates {
			fmt.Printf("%5.0f A: %v\n", currentA, st)
			continue
		}
		fmt.Printf("%5.0f A: %.3f s\n", currentA, t)
	}
	// Output:
	//   350 A: does not operate
	//  1200 A: 1.260 s
	//  3000 A: 0.300 s
	//  9000 A: 0.000 s
}
