package coord

import (
	"math"
	"math/cmplx"

	"tripgrade/faults"
)

// Direction is the direction in which a stage trips.
type Direction uint8

// Directions. Forward is current flowing from the device's bus into its
// branch (the device's measuring direction); Reverse the opposite.
const (
	NonDirectional Direction = iota
	Forward
	Reverse
)

// String returns "non-directional", "forward" or "reverse".
func (d Direction) String() string {
	return [...]string{"non-directional", "forward", "reverse"}[d]
}

// Directional holds a relay's directional element settings, shared by its
// directional stages (67 for phase, 67N for ground). The zero value is not
// the default: use DefaultDirectional.
type Directional struct {
	// PhaseAngleDeg is the characteristic angle of the phase elements:
	// the angle by which the operating phase current leads its quadrature
	// polarising voltage (Ia with Vbc, Ib with Vca, Ic with Vab: the 90°
	// connection) at maximum sensitivity. 45° suits most feeders and
	// transformer feeders; 30° plain feeders (Network Protection &
	// Automation Guide ch. 9, from memory).
	PhaseAngleDeg float64
	// GroundAngleDeg is the characteristic angle of the ground element:
	// the angle by which 3I0 leads −3V0 (or the polarising current). −45°
	// covers both solidly earthed (3I0 lags −3V0 by the zero-sequence
	// source angle, 60–85°) and resistance-earthed systems (close to 0°)
	// within a ±90° sector (from memory: Network Protection & Automation
	// Guide ch. 9 gives −45° for solidly earthed distribution, 0° for
	// resistance earthing); 0° for neutral-current polarisation.
	GroundAngleDeg float64
	// SectorDeg is the half-width of the operating sector around the
	// characteristic angle: 90° is the classic torque-sign boundary, and
	// the reverse sector mirrors the forward one. Between the two there is
	// no decision (the stage does not operate).
	SectorDeg float64
	// PhaseMinV is the smallest polarising (line-to-line) voltage a phase
	// element decides with, in volts; GroundMinV the smallest |3V0| of the
	// ground element. The study gives them in % of the nominal voltage of
	// the relay's bus (DefaultPhaseMinPct, DefaultGroundMinPct).
	PhaseMinV, GroundMinV float64
	// NoMemory switches off voltage memory: by default a phase element
	// whose polarising voltage has collapsed below PhaseMinPct (a close-in
	// three-phase fault) decides with the pre-fault voltage, as numerical
	// relays do with their voltage memory, and holds that decision for the
	// whole fault (an assumption: real memory lasts a few cycles, after
	// which relays latch the decision). With NoMemory the element does not
	// operate.
	NoMemory bool
	// ByCurrent polarises the ground element by the neutral current of a
	// transformer's earthed star winding (PolarisingPoint: that
	// transformer's branch end on the star side) instead of by −3V0;
	// PolarisingMinA is the smallest neutral current it decides with.
	ByCurrent       bool
	PolarisingPoint faults.Point
	PolarisingMinA  float64
}

// Default minimum polarising voltages: about 1 % of the nominal
// line-to-line voltage for a phase element (a volt or so on a 110 V
// secondary) and 2 % of the nominal line-to-neutral voltage for |3V0|
// (common practice: 1–5 %).
const (
	DefaultPhaseMinPct  = 1
	DefaultGroundMinPct = 2
)

// DefaultDirectional returns the documented defaults for a relay at a bus
// of nominal voltage kv: phase 45°, ground −45°, a ±90° sector, the
// default minimum polarising voltages and voltage memory on.
func DefaultDirectional(kv float64) Directional {
	return Directional{PhaseAngleDeg: 45, GroundAngleDeg: -45, SectorDeg: 90,
		PhaseMinV: DefaultPhaseMinPct / 100 * kv * 1000, GroundMinV: DefaultGroundMinPct / 100 * kv * 1000 / math.Sqrt(3)}
}

// Seen is what one device measures for one fault.
type Seen struct {
	// I are the phase currents Ia, Ib, Ic in amperes, positive from the
	// device's bus into its branch.
	I [3]complex128
	// V and Pre are the phase-to-neutral voltages at the device's bus
	// during the fault and before it, in volts.
	V, Pre [3]complex128
	// Pol is the neutral polarising current (amperes, flowing from earth
	// into the star point) for a ground element polarised by current.
	Pol complex128
	// Neutral is the neutral current a relay with a neutral CT measures
	// (amperes, from earth into the star point).
	Neutral complex128
}

// NewSeen builds what a device sees from the engine's figures.
func NewSeen(c faults.Currents, v, pre faults.Voltages) Seen {
	return Seen{I: c.Phases(), V: v.Phases(), Pre: pre.Phases()}
}

// PhaseA returns the largest phase current.
func (s *Seen) PhaseA() float64 {
	return math.Sqrt(math.Max(abs2(s.I[0]), math.Max(abs2(s.I[1]), abs2(s.I[2]))))
}

// Residual returns 3I0 = Ia+Ib+Ic.
func (s *Seen) Residual() complex128 { return s.I[0] + s.I[1] + s.I[2] }

// ResidualA returns |3I0|.
func (s *Seen) ResidualA() float64 { return abs(s.Residual()) }

// abs2 is |z|², and abs |z|, without math.Hypot's guard against overflow,
// which currents in amperes and voltages in volts never come near.
func abs2(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }

func abs(z complex128) float64 { return math.Sqrt(abs2(z)) }

// groundA returns the current a device's ground stages measure: the
// neutral current for a relay with a neutral CT, else |3I0|.
func (s *Seen) groundA(d *Device) float64 {
	if d.NeutralCT != nil {
		return cmplx.Abs(s.Neutral)
	}
	return s.ResidualA()
}

// decide returns the direction of an operating quantity against its
// polarising quantity for a characteristic angle and sector: Forward when
// the operating quantity lies within ±sector of the polarising quantity
// turned by the characteristic angle, Reverse within ±sector of the
// opposite, NonDirectional (no decision) otherwise or when either is zero.
func decide(op, pol complex128, charDeg, sectorDeg float64) Direction {
	if op == 0 || pol == 0 {
		return NonDirectional
	}
	theta := (cmplx.Phase(op) - cmplx.Phase(pol)) * 180 / math.Pi
	theta = math.Mod(theta-charDeg+540, 360) - 180 // in [−180, 180)
	switch a := math.Abs(theta); {
	case a < sectorDeg:
		return Forward
	case a > 180-sectorDeg:
		return Reverse
	}
	return NonDirectional
}

// quadrature lists each phase element's polarising voltage: Ia with Vbc,
// Ib with Vca, Ic with Vab.
var quadrature = [3][2]int{{1, 2}, {2, 0}, {0, 1}}

// PhaseDirections returns the decision of each phase element (a, b, c).
func (d *Directional) PhaseDirections(s *Seen) [3]Direction {
	var out [3]Direction
	for p, q := range quadrature {
		pol := s.V[q[0]] - s.V[q[1]]
		if cmplx.Abs(pol) < d.PhaseMinV {
			if d.NoMemory {
				continue
			}
			pol = s.Pre[q[0]] - s.Pre[q[1]]
		}
		out[p] = decide(s.I[p], pol, d.PhaseAngleDeg, d.SectorDeg)
	}
	return out
}

// GroundDirection returns the ground element's decision: 3I0 against −3V0
// (at least GroundMinV), or against the neutral polarising current (at
// least PolarisingMinA).
func (d *Directional) GroundDirection(s *Seen) Direction {
	if d.ByCurrent {
		if cmplx.Abs(s.Pol) < d.PolarisingMinA {
			return NonDirectional
		}
		return decide(s.Residual(), s.Pol, d.GroundAngleDeg, d.SectorDeg)
	}
	v0 := -(s.V[0] + s.V[1] + s.V[2])
	if cmplx.Abs(v0) < d.GroundMinV {
		return NonDirectional
	}
	return decide(s.Residual(), v0, d.GroundAngleDeg, d.SectorDeg)
}
