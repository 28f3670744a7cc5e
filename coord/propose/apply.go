package propose

import (
	"tripgrade/coord"
	"tripgrade/curves"
)

// Apply returns a copy of the study with the multipliers x of vars (the
// devices and their stages copied, everything else shared).
func Apply(s *coord.Study, vars []Variable, x []float64) *coord.Study {
	out := copyStages(s)
	for i, v := range vars {
		st := &out.Devices[v.Device].Stages[v.Stage]
		c := st.Curve.(curves.InverseTime)
		c.Multiplier = x[i]
		st.Multiplier, st.Curve = x[i], c
	}
	return out
}

// copyStages returns a copy of the study whose devices and stages are
// its own (everything else shared).
func copyStages(s *coord.Study) *coord.Study {
	out := *s
	out.Devices = make([]coord.Device, len(s.Devices))
	copy(out.Devices, s.Devices)
	for i := range out.Devices {
		out.Devices[i].Stages = append([]coord.Stage(nil), s.Devices[i].Stages...)
	}
	return &out
}

// multipliers returns the study's multiplier of every variable.
func multipliers(s *coord.Study, vars []Variable) []float64 {
	x := make([]float64, len(vars))
	for i, v := range vars {
		x[i] = s.Devices[v.Device].Stages[v.Stage].Multiplier
	}
	return x
}
