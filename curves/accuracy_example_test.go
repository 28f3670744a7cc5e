package curves_test

import (
	"fmt"

	"tripgrade/curves"
)

func ExampleBanded() {
	law, _ := curves.ShapeIECVI.Law()
	stage, _ := curves.NewInverseTime(law, 100, 0.5)
	early, late := curves.Banded(stage, curves.Accuracy{ClassPct: 5, MinErrorS: 0.040})
	for _, currentA := range []float64{300, 700, 1500} {
		e, _ := early.Time(currentA)
		n, _ := stage.Time(currentA)
		l, _ := late.Time(currentA)
		fmt.Printf("%4.0f A: %.3f ≤ %.3f ≤ %.3f s\n", currentA, e, n, l)
	}
	// Output:
	//  300 A: 2.953 ≤ 3.375 ≤ 3.797 s
	//  700 A: 1.041 ≤ 1.125 ≤ 1.209 s
	// 1500 A: 0.442 ≤ 0.482 ≤ 0.522 s
}
