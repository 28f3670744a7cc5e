package coord

import (
	"fmt"

	"tripgrade/faults"
)

// reachPlaces are the places an instantaneous stage of device i must not
// reach: where the next devices sit, and the low-voltage side of every
// transformer in its zone.
func (c *checker) reachPlaces(i int) []faults.Place {
	z := c.topo.Zones[i]
	n := c.s.Network
	var ps placeSet
	add := func(p faults.Place) {
		if !Fictitious(n, p) {
			ps.add(p)
		}
	}
	for _, p := range z.Boundary {
		add(p)
	}
	for _, b := range z.Branches {
		if n.IsTransformer(b) {
			add(faults.AtBus(pointBus(n, faults.Point{Branch: b, End: c.topo.Downstream[b]})))
		}
	}
	return ps.list
}

// instantaneousReach: an instantaneous stage, or a definite-time stage of
// at most short_delay_s, has a pickup of at least instantaneous_factor ×
// the largest current the device sees for a fault where its zone ends (at
// the next devices, or beyond a transformer), in the maximum case.
func (c *checker) instantaneousReach(i int) ([]Finding, error) {
	d := &c.s.Devices[i]
	crit := c.s.Criteria
	var stages []Stage
	for _, s := range d.Stages {
		if s.Instantaneous(crit.ShortDelayS) {
			stages = append(stages, s)
		}
	}
	if len(stages) == 0 {
		return nil, nil
	}
	places := c.reachPlaces(i)
	var out []Finding
	for _, st := range stages {
		if len(places) == 0 {
			out = append(out, Finding{Check: InstantaneousReach, Device: d.Name, Stage: st.Label, Verdict: Pass,
				Note: "the zone ends only at open ends of the network and holds no transformer: there is nothing beyond it to overreach into"})
			continue
		}
		var worst minimum // the largest, in this use
		for _, pl := range places {
			for _, k := range faults.Kinds {
				sol, err := c.sol.solve(pl, k, faults.Max)
				if err != nil {
					return nil, err
				}
				ph, res := Measured(sol.At(d.Point))
				a := ph
				if st.Measures == Residual {
					a = res
				}
				if !worst.found || a > worst.a*(1+tieTolerance) {
					worst = minimum{a: a, found: true, ref: FaultRef{Kind: k, Case: faults.Max, Place: PlaceName(c.s.Network, pl), DeviceA: a, DeviceQty: st.Measures}}
				}
			}
		}
		f := atLeast(InstantaneousReach, st.PickupA, crit.InstantaneousFactor*worst.a, "A")
		f.Device, f.Stage = d.Name, st.Label
		ref := worst.ref
		f.Fault = &ref
		f.Note = fmt.Sprintf("maximum through-fault %s A × %g", fmtA(worst.a), crit.InstantaneousFactor)
		out = append(out, f)
	}
	return out, nil
}
