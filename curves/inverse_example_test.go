package curves_test

import (
	"fmt"

	"tripgrade/curves"
)

func ExampleNewInverseTime() {
	law, _ := curves.ShapeIECSI.Law()
	stage, err := curves.NewInverseTime(law, 400, 0.1) // pickup 400 A, TMS 0.1
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, currentA := range []float64{300, 800, 4000} {
		t, st := stage.Time(currentA)
		if st != curves.Operates {
			fmt.Printf("%5.0f A: %v\n", currentA, st)
			continue
		}
		fmt.Printf("%5.0f A: %.3f s\n", currentA, t)
	}
	_, err = curves.NewInverseTime(law, -5, 0.1)
	fmt.Println(err)
	// Output:
	//   300 A: does not operate
	//   800 A: 1.003 s
	//  4000 A: 0.297 s
	// pickup must be > 0 A (got -5)
}

func ExampleInverseTime_MultiplierFor() {
	law, _ := curves.ShapeIEEEVI.Law()
	stage, _ := curves.NewInverseTime(law, 600, 1)
	// The TD that makes this stage operate in 0.5 s at 6000 A.
	td, err := stage.MultiplierFor(6000, 0.5)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("TD %.3f\n", td)
	// Output:
	// TD 0.726
}

func ExampleInverseTime_CurrentFor() {
	law, _ := curves.ShapeIECEI.Law()
	stage, _ := curves.NewInverseTime(law, 200, 0.5)
	i, st := stage.CurrentFor(1.0)
	fmt.Printf("%.1f A (%v)\n", i, st)
	// Output:
	// 1280.6 A (operates)
}

func ExampleInverseTime_ResetTime() {
	law, _ := curves.ShapeIEEEMI.Law()
	stage, _ := curves.NewInverseTime(law, 100, 2)
	t, st := stage.ResetTime(50) // 2·4.85/(1 − 0.5²)
	fmt.Printf("%.3f s (%v)\n", t, st)
	// Output:
	// 12.933 s (operates)
}
