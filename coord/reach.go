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

// largest is the largest current a device sees over a set of faults.
type largest struct {
	a     float64
	found bool
	place faults.Place
	kind  faults.Kind
}

// stageKinds are the fault kinds whose current a stage measuring q sees:
// every kind drives phase current, only the earth faults drive residual
// current.
func stageKinds(q Quantity) []faults.Kind {
	if q == Residual {
		return []faults.Kind{faults.LG, faults.LLG}
	}
	return faults.Kinds[:]
}

// maxFault finds the largest current device i measures as q over the
// places, maximum case, for the kinds that drive that quantity; faults
// that drive none of it are left out.
func (c *checker) maxFault(i int, q Quantity, places []faults.Place) (largest, error) {
	var worst largest
	for _, pl := range places {
		for _, k := range stageKinds(q) {
			sol, err := c.sol.solve(pl, k, faults.Max)
			if err != nil {
				return worst, err
			}
			ph, res := c.effective(i, sol)
			a := ph
			if q == Residual {
				a = res
			}
			if a > 0 && (!worst.found || a > worst.a*(1+tieTolerance)) {
				worst = largest{a: a, found: true, place: pl, kind: k}
			}
		}
	}
	return worst, nil
}

// instantaneousReach: an instantaneous stage, or a definite-time stage of
// at most short_delay_s, has a pickup of at least instantaneous_factor ×
// the largest current of its own quantity (phase, or residual for a
// ground stage) that the device sees for a fault where its zone ends (at
// the next devices, or beyond a transformer), in the maximum case. When
// that required pickup exceeds the largest fault in the stage's own zone,
// no setting works and the finding says so.
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
		worst, err := c.maxFault(i, st.Measures, places)
		if err != nil {
			return nil, err
		}
		if !worst.found {
			f := Finding{Check: InstantaneousReach, Device: d.Name, Stage: st.Label, Verdict: Pass,
				Note: "no earth fault where the zone ends drives residual current through the device (beyond a delta winding, or fed with earth-fault current only from elsewhere): the stage cannot overreach"}
			if st.Measures == Phase {
				f = unchecked(InstantaneousReach, "no fault where the zone ends drives current through the device")
				f.Device, f.Stage = d.Name, st.Label
			}
			out = append(out, f)
			continue
		}
		required := crit.InstantaneousFactor * worst.a
		f := atLeast(InstantaneousReach, st.PickupA, required, "A")
		f.Device, f.Stage = d.Name, st.Label
		f.Fault = &FaultRef{Kind: worst.kind, Case: faults.Max, Place: PlaceName(c.s.Network, worst.place), DeviceA: worst.a, DeviceQty: st.Measures}
		f.Note = fmt.Sprintf("maximum through-fault %s A × %g", fmtA(worst.a), crit.InstantaneousFactor)
		own, err := c.maxFault(i, st.Measures, c.places[i])
		if err != nil {
			return nil, err
		}
		ownText := fmt.Sprintf("%s A (%s max @ %s)", fmtA(own.a), own.kind, PlaceName(c.s.Network, own.place))
		switch {
		case !own.found:
		case f.Verdict == Fail && required >= own.a:
			f.Note += fmt.Sprintf("; no setting works: the pickup must be at least %s A to stay inside the zone, but the largest fault in the stage's own zone is %s, so the stage cannot operate for any fault of its zone without overreaching; remove it, or give it a delay and grade it",
				fmtA(required), ownText)
		case st.PickupA >= own.a:
			f.Verdict = Warn
			f.Note += fmt.Sprintf("; the stage operates for no fault of its own zone either (the largest is %s): it adds no protection", ownText)
		}
		out = append(out, f)
	}
	return out, nil
}
