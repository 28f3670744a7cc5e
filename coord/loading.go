package coord

import (
	"fmt"
	"math"
	"slices"
	"sort"

	"tripgrade/curves"
	"tripgrade/faults"
)

// LoadThrough returns the maximum load current through device i: its
// declared maximum, or the sum of the loads beyond it referred to its bus
// by the transformers' rated winding ratios.
func LoadThrough(s *Study, t *Topology, i int) (a float64, declared bool) {
	d := &s.Devices[i]
	if d.MaxLoadA > 0 {
		return d.MaxLoadA, true
	}
	n := s.Network
	bus := DeviceBus(n, *d)
	// The loads at the buses beyond, summed in the study's order (the
	// order of the figures decides the last bits of the sum).
	var loads []int
	for _, b := range t.Beyond(i) {
		loads = append(loads, t.loadsAt[b]...)
	}
	slices.Sort(loads)
	for _, l := range slices.Compact(loads) {
		a += t.ReferA(s.Loads[l].CurrentA, s.Loads[l].Bus, bus)
	}
	return a, false
}

// loadMargin: the lowest phase pickup (a fuse's rating) is at least
// load_factor × the maximum load current through the device.
func (c *checker) loadMargin(i int) (Finding, bool) {
	d := &c.s.Devices[i]
	setting, what := c.loadPickup(i), "phase pickup"
	if d.Kind == Fuse {
		setting, what = d.RatingA, "fuse rating"
	}
	if setting == 0 {
		return Finding{}, false
	}
	if d.Kind == Relay && setting != d.Pickup(Phase) {
		what = "lowest pickup of the phase stages that load current reaches (a directional stage looking against the load's flow does not see it)"
	}
	load, declared := LoadThrough(c.s, c.topo, i)
	if load == 0 {
		f := unchecked(LoadMargin, "no load lies beyond the device and it declares no max_load_a")
		f.Device = d.Name
		return f, true
	}
	f := atLeast(LoadMargin, setting, c.s.Criteria.LoadFactor*load, "A")
	f.Device, f.Stage = d.Name, "phase"
	src := "sum of the loads beyond"
	if declared {
		src = "declared max_load_a"
	}
	f.Note = fmt.Sprintf("%s; load %s A (%s) × %g", what, fmtA(load), src, c.s.Criteria.LoadFactor)
	return f, true
}

// loadPickup returns the lowest pickup of device i's phase stages that
// load current reaches: a directional stage looking against the direction
// load flows in (away from the grid sources) does not see it — an
// assumption that holds while embedded generation does not export through
// the device.
func (c *checker) loadPickup(i int) float64 {
	d := &c.s.Devices[i]
	loadDir := Forward // load flows from the bus into the branch
	if !c.topo.IntoBranch(d.Point) {
		loadDir = Reverse
	}
	p := 0.0
	for _, s := range d.Stages {
		if s.Measures != Phase || (s.Direction != NonDirectional && s.Direction != loadDir) {
			continue
		}
		if p == 0 || s.PickupA < p {
			p = s.PickupA
		}
	}
	return p
}

// TransformersEnergised returns the transformers that device i energises
// directly: its own transformer when it looks into one, and every
// transformer reached from it through lines alone. Transformers behind
// another transformer are left out: their inrush is limited by the
// transformer in front of them and they are not energised at the same
// instant in practice.
func TransformersEnergised(s *Study, t *Topology, i int) []int {
	n := s.Network
	d := &s.Devices[i]
	if t.IntoBranch(d.Point) && n.IsTransformer(d.Point.Branch) {
		return []int{d.Point.Branch}
	}
	start := DeviceBus(n, *d)
	if t.IntoBranch(d.Point) {
		start = pointBus(n, faults.Point{Branch: d.Point.Branch, End: t.Downstream[d.Point.Branch]})
	}
	seen := map[int]bool{start: true}
	queue := []int{start}
	var out []int
	for len(queue) > 0 {
		x := queue[0]
		queue = queue[1:]
		for _, b := range t.BranchesAt(x) {
			if b == d.Point.Branch {
				continue
			}
			up := otherEnd(t.Downstream[b])
			if pointBus(n, faults.Point{Branch: b, End: up}) != x {
				continue
			}
			if n.IsTransformer(b) {
				out = append(out, b)
				continue
			}
			if y := pointBus(n, faults.Point{Branch: b, End: t.Downstream[b]}); !seen[y] {
				seen[y] = true
				queue = append(queue, y)
			}
		}
	}
	sort.Ints(out)
	return out
}

// InrushA returns the inrush current at device i, InrushMultiple × the
// rated current of the energised winding of each transformer it energises,
// referred to the device's bus by winding ratios, and their total rating
// (0 when it energises none).
func InrushA(s *Study, t *Topology, i int) (a, mva float64) {
	n := s.Network
	bus := DeviceBus(n, s.Devices[i])
	for _, b := range TransformersEnergised(s, t, i) {
		tr := n.Transformer(b)
		mva += tr.MVA
		// The energised winding is the transformer's upstream end.
		kv, at := tr.KVFrom, tr.From
		if t.Downstream[b] == faults.From {
			kv, at = tr.KVTo, tr.To
		}
		a += t.ReferA(s.Criteria.InrushMultiple*tr.MVA*1000/(math.Sqrt(3)*kv), at, bus)
	}
	return a, mva
}

// inrush: the device's phase stages (a fuse's melting curve) do not
// operate within inrush_time_s at inrush_multiple × the full-load current
// of the transformers it energises.
func (c *checker) inrush(i int) (Finding, bool) {
	d := &c.s.Devices[i]
	if d.Kind == Relay && c.timers[i].Phase[Nominal] == nil {
		return Finding{}, false
	}
	ia, mva := InrushA(c.s, c.topo, i)
	if mva == 0 {
		return Finding{}, false
	}
	crit := c.s.Criteria
	t, st := c.timers[i].Melt(ia, 0, Nominal)
	note := fmt.Sprintf("%g × full-load current of %g MVA of transformers = %s A", crit.InrushMultiple, mva, fmtA(ia))
	switch st {
	case curves.NoTrip:
		return Finding{Check: Inrush, Device: d.Name, Stage: "phase", Verdict: Pass,
			Note: "does not operate at the inrush current; " + note}, true
	case curves.Undefined:
		f := unchecked(Inrush, "the curve is not defined at the inrush current; "+note)
		f.Device = d.Name
		return f, true
	}
	f := atLeast(Inrush, t, crit.InrushTimeS, "s")
	// Strictly: operating exactly at the inrush time still trips.
	if t <= crit.InrushTimeS {
		f.Verdict = Fail
	}
	f.Device, f.Stage, f.Note = d.Name, "phase", "operating time at "+note
	return f, true
}
