package tcc_test

import (
	"bytes"
	"fmt"
	"log"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/tcc"
)

// The charts of a 33/11 kV study: one path, drawn on an 11 kV axis, where
// the 33 kV relay's curve is referred by the transformer's winding ratio
// 33/11, and its earth-fault chart, which holds the 11 kV relay alone (the
// 33 kV relay has no ground stage, and the Dyn11 transformer's delta
// winding would stop residual current anyway).
func ExampleAtlas() {
	s, err := study.Load("testdata/two-voltage.toml")
	if err != nil {
		log.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		log.Fatal(err)
	}
	res, err := coord.Check(s, eng, topo)
	if err != nil {
		log.Fatal(err)
	}
	levels, err := coord.FaultLevels(s, eng, topo)
	if err != nil {
		log.Fatal(err)
	}
	a, err := tcc.NewAtlas(tcc.Input{Study: s, Topology: topo, Result: res, Levels: levels})
	if err != nil {
		log.Fatal(err)
	}
	for _, c := range a.Charts() {
		var buf bytes.Buffer
		if err := c.Render(&buf, tcc.PNG, tcc.Settings{}); err != nil {
			log.Fatal(err)
		}
		kind := "phase"
		if c.Kind == coord.Residual {
			kind = "earth"
		}
		fmt.Printf("%s.png: %s faults, currents at %g kV, %d failing pairs\n", c.Name, kind, c.RefKV(), c.Failing())
		for _, tr := range c.Traces() {
			if tr.Kind != tcc.PhaseCurve {
				continue
			}
			// Each relay at 10× its pickup, on the 11 kV axis.
			at := map[string]float64{"R11": 2000, "R33": 3000}[s.Devices[tr.Device].Name]
			t, _ := tr.TimeAt(at)
			fmt.Printf("%s at %g A: %.2f s\n", s.Devices[tr.Device].Name, at, t)
		}
	}
	// Output:
	// path-R11--R33.png: phase faults, currents at 11 kV, 0 failing pairs
	// R11 at 2000 A: 0.30 s
	// R33 at 3000 A: 1.49 s
	// path-R11-earth.png: earth faults, currents at 11 kV, 0 failing pairs
}
