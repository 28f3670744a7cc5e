package coord

import (
	"math/cmplx"

	"tripgrade/faults"
)

// measure returns what device i measures for a solved fault: its largest
// phase current, the current its ground stages measure (the residual 3I0,
// or a neutral CT's current), and, for a relay with directional stages,
// how its elements decided (from the fault voltages at its bus).
func (c *checker) measure(i int, sol faults.Solution) (phaseA, groundA float64, d Dirs) {
	dev := &c.s.Devices[i]
	cur := sol.At(dev.Point)
	phaseA, groundA = cur.PhaseMaxA(), cur.ResidualA()
	t := c.timers[i]
	if dev.NeutralCT == nil && !t.Directional() {
		return phaseA, groundA, d
	}
	bus := DeviceBus(c.s.Network, *dev)
	s := NewSeen(cur, sol.VoltageAt(bus), sol.Prefault(bus))
	if dev.NeutralCT != nil {
		s.Neutral = neutralCurrent(sol, sol.At(*dev.NeutralCT), *dev.NeutralCT)
		groundA = cmplx.Abs(s.Neutral)
	}
	if dev.Dir.ByCurrent {
		s.Pol = neutralCurrent(sol, sol.At(dev.Dir.PolarisingPoint), dev.Dir.PolarisingPoint)
	}
	if !t.Directional() {
		return phaseA, groundA, d
	}
	return phaseA, groundA, t.dirs(&s, phaseA)
}

// effective returns the phase and ground currents device i's stage groups
// respond to for a solved fault, in the directions they look.
func (c *checker) effective(i int, sol faults.Solution) (phaseA, groundA float64) {
	ph, gr, d := c.measure(i, sol)
	return c.timers[i].effective(ph, gr, d)
}

// neutralCurrent returns the current flowing from earth into the star
// point of the transformer whose star-side end is pt, given the currents
// at that point: the residual current its winding sends out of that
// terminal. For a fault close in at that terminal (between the current
// transformer and the winding) the fault's own residual current is part
// of it.
func neutralCurrent(sol faults.Solution, at faults.Currents, pt faults.Point) complex128 {
	n := -at.Residual()
	if pl := sol.Fault().Place; !pl.IsBus() && pl.Branch == pt.Branch &&
		((pl.Frac == 0 && pt.End == faults.From) || (pl.Frac == 1 && pt.End == faults.To)) {
		n += sol.FaultCurrents().Residual()
	}
	return n
}
