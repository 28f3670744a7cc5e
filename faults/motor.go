package faults

import (
	"fmt"
	"math"
)

// Motor is an asynchronous motor, or a group of identical motors in
// parallel, at a bus. Motors feed short circuits in the maximum case only
// (IEC 60909-0 leaves them out of the minimum case) and have no
// zero-sequence path (their star points are not earthed).
type Motor struct {
	Name string
	Bus  int
	MW   float64 // rated active power P_rM of one motor
	KV   float64 // rated voltage U_rM
	PF   float64 // rated power factor cos φ_rM
	Eff  float64 // rated efficiency η_rM, as a fraction
	// LockedRotor is the ratio of locked-rotor to rated current, I_LR/I_rM.
	LockedRotor float64
	PolePairs   int // pairs of poles p
	// RX is R_M/X_M; zero means the standard's value for the motor's
	// voltage and power per pair of poles (see DefaultMotorRX).
	RX    float64
	Count int // identical motors in parallel; zero means one
}

// count returns the number of motors in the group.
func (m *Motor) count() float64 {
	if m.Count > 0 {
		return float64(m.Count)
	}
	return 1
}

// RatedMVA returns the rated apparent power of one motor, S_rM =
// P_rM/(η_rM·cos φ_rM).
func (m *Motor) RatedMVA() float64 { return m.MW / (m.Eff * m.PF) }

// RatedA returns the rated current of one motor, I_rM = S_rM/(√3·U_rM).
func (m *Motor) RatedA() float64 { return m.RatedMVA() * 1000 / (math.Sqrt(3) * m.KV) }

// MWPerPolePair returns m = P_rM/p, the active power per pair of poles that
// the standard's R_M/X_M and q factors depend on.
func (m *Motor) MWPerPolePair() float64 { return m.MW / float64(m.PolePairs) }

// DefaultMotorRX returns R_M/X_M by IEC 60909-0 (from memory of its clause
// on asynchronous motors; the values reproduce the motor impedances of
// IEC TR 60909-4): 0.10 for motors above 1 kV with at least 1 MW per pair
// of poles, 0.15 below 1 MW per pair of poles, 0.42 for low-voltage motors
// and motor groups with their connection cables.
func DefaultMotorRX(kv, mwPerPolePair float64) float64 {
	switch {
	case kv <= lowVoltageKV:
		return 0.42
	case mwPerPolePair >= 1:
		return 0.10
	}
	return 0.15
}

// ZOhm returns the short-circuit impedance of the motor or group in ohms
// at its rated voltage: Z_M = (1/(I_LR/I_rM))·U_rM²/S_rM, X_M =
// Z_M/√(1 + (R_M/X_M)²), divided by the number of motors (IEC 60909-0).
func (m *Motor) ZOhm() complex128 {
	rx := m.RX
	if rx == 0 {
		rx = DefaultMotorRX(m.KV, m.MWPerPolePair())
	}
	z := m.KV * m.KV / (m.LockedRotor * m.RatedMVA()) / m.count()
	x := z / math.Sqrt(1+rx*rx)
	return complex(rx*x, x)
}

// checkMotor reports the first problem of a motor the engine cannot use.
func (n *Network) checkMotor(m *Motor) error {
	if m.Bus < 0 || m.Bus >= len(n.Buses) {
		return fmt.Errorf("motor %q: bus index %d out of range", m.Name, m.Bus)
	}
	ok := m.MW > 0 && m.KV > 0 && m.PF > 0 && m.PF <= 1 && m.Eff > 0 && m.Eff <= 1 &&
		m.LockedRotor > 1 && m.PolePairs > 0 && m.RX >= 0 && m.Count >= 0 &&
		!math.IsInf(m.MW, 0) && !math.IsInf(m.KV, 0) && !math.IsInf(m.LockedRotor, 0) && !math.IsInf(m.RX, 0)
	if !ok {
		return fmt.Errorf("motor %q: needs mw, kv, pf (≤ 1), efficiency (≤ 1), pole pairs > 0 and a locked-rotor ratio > 1", m.Name)
	}
	return nil
}
