package curves_test

import (
	"fmt"

	"tripgrade/curves"
)

func ExampleNewStage() {
	shape, err := curves.ParseShape("ieee-mi")
	if err != nil {
		fmt.Println(err)
		return
	}
	stage, err := curves.NewStage(curves.StageSettings{Shape: shape, PickupA: 300, Multiplier: 2})
	if err != nil {
		fmt.Println(err)
		return
	}
	t, _ := stage.Time(3000)
	fmt.Printf("%s, TD 2, at 10×: %.3f s\n", shape.Description(), t)

	_, err = curves.NewStage(curves.StageSettings{Shape: shape, PickupA: -5, Multiplier: -1})
	fmt.Println(err)
	// Output:
	// IEEE C37.112 moderately inverse, TD 2, at 10×: 2.414 s
	// pickup must be > 0 A (got -5); TD must be > 0 (got -1)
}

func ExampleParseShape() {
	_, err := curves.ParseShape("iec-normal")
	fmt.Println(err)
	// Output:
	// unknown shape "iec-normal" (accepted: iec-si, iec-vi, iec-ei, iec-lti, ieee-mi, ieee-vi, ieee-ei, definite, instantaneous, iec-user, ieee-user)
}
