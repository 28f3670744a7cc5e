package propose

import (
	"tripgrade/coord"
	"tripgrade/curves"
)

// The inrush check asks that a relay's phase stages take longer than
// inrush_time_s at inrush_multiple × the full-load current of the
// transformers it energises (coord.InrushA). For an inverse-time stage
// that is a lower bound on its multiplier, x·g(I_inrush) > t_inrush, which
// a lower pickup raises: the search keeps it with the margins.

// inrushMargin is the relative step above t_inrush/g at which the bound
// sits: the check fails a time equal to the inrush time, so the bound
// must lie strictly above it, clear of the multiplier grid's tolerance
// (onStep counts 1e-9 of a step as on it).
const inrushMargin = 1e-6

// inrushCurrents returns the inrush current at every device (0 for one
// that energises no transformer, and for fuses).
func inrushCurrents(s *coord.Study, topo *coord.Topology) []float64 {
	ia := make([]float64, len(s.Devices))
	for i, d := range s.Devices {
		if d.Kind == coord.Relay {
			ia[i], _ = coord.InrushA(s, topo, i)
		}
	}
	return ia
}

// inrushBound returns the least multiplier of an inverse-time phase
// stage that keeps it from operating within tS at the inrush current ia,
// and false when no bound applies (it does not operate at that current,
// or its minimum time alone exceeds tS).
func inrushBound(st coord.Stage, ia, tS float64) (float64, bool) {
	if st.Measures != coord.Phase || ia <= 0 {
		return 0, false
	}
	g, ok := unit(st, ia)
	if !ok || st.Curve.(curves.InverseTime).MinTimeS > tS {
		return 0, false
	}
	return tS / g * (1 + inrushMargin), true
}

// inrush adds the inrush bound of every variable to the collector, at
// the pickups of study s.
func (c *collector) inrush(s *coord.Study, ia []float64) {
	crit := s.Criteria
	for i, v := range c.vars {
		st := s.Devices[v.Device].Stages[v.Stage]
		x, ok := inrushBound(st, ia[v.Device], crit.InrushTimeS)
		if !ok || x <= c.lower[i].v {
			continue
		}
		c.lower[i] = bound{x, &Source{Check: coord.Inrush, Up: -1, Down: v.Device, UpStage: -1, Scale: 1,
			RequiredS: crit.InrushTimeS, CurrentA: ia[v.Device]}}
	}
}

// isInrush reports whether a source is an inrush bound.
func isInrush(src *Source) bool { return src != nil && src.Check == coord.Inrush }
