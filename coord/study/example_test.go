package study_test

import (
	"fmt"

	"tripgrade/coord/study"
)

// Parse reports every problem of a study at once, each with its line.
func ExampleParse() {
	src := `
[study]
name = "typo"

[[bus]]
name = "A"
kv = 11

[[source]]
name = "grid"
bus = "AA"
sc_mva_max = 250
sc_mva_min = 100
z0_z1 = 1
colour = "red"
`
	_, err := study.Parse("typo.toml", []byte(src), nil)
	fmt.Println(err)
	// Output:
	// typo.toml:11: source "grid": bus = "AA": no bus of that name (did you mean "A"?)
	// typo.toml:15: source "grid": unknown key "colour"
}
