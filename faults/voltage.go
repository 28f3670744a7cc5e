package faults

import (
	"math"
	"math/cmplx"
)

// Voltages are the sequence voltages V0, V1, V2 (index 0, 1, 2) at a bus,
// line to neutral, in volts, in the bus's own phase frame (angles as for
// currents: see the package documentation).
//
// The pre-fault voltage is the equivalent voltage source method's: every
// bus at c·Un/√3 with the fault location's voltage factor c, in phase with
// the fault location's phase a across every transformer's phase shift, and
// no load flow. A bus's voltage during the fault is that plus the change
// −Z_kf·I_f the fault currents cause in each sequence (bus impedance
// method, Grainger & Stevenson ch. 12).
type Voltages struct {
	Seq [3]complex128
}

// Phases returns Va, Vb, Vc to neutral.
func (v Voltages) Phases() [3]complex128 { return Currents(v).Phases() }

// LineToLine returns Vab, Vbc and Vca.
func (v Voltages) LineToLine() [3]complex128 {
	p := v.Phases()
	return [3]complex128{p[0] - p[1], p[1] - p[2], p[2] - p[0]}
}

// Residual returns Va+Vb+Vc = 3V0.
func (v Voltages) Residual() complex128 { return 3 * v.Seq[zero] }

// VoltageAt returns the voltages at bus k during the fault. A bus with no
// source in the solution's case, and every bus of a fault that is not
// energised, gives the pre-fault voltage of an energised network or zero.
func (s Solution) VoltageAt(k int) Voltages {
	return s.voltageResponse(k).voltages(s)
}

// Prefault returns the pre-fault voltage at bus k that the solution
// assumes (zero for a bus with no source in the case).
func (s Solution) Prefault(k int) Voltages {
	r := s.voltageResponse(k)
	return Voltages{Seq: [3]complex128{pos: r.pre}}
}

// voltageResponse is how a bus's voltage follows the fault's sequence
// currents: pre + dv[q]·I_q, in volts, in the bus's frame.
type voltageResponse struct {
	pre complex128
	dv  [3]complex128
}

func (r voltageResponse) voltages(s Solution) Voltages {
	v := Voltages{Seq: [3]complex128{pos: r.pre}}
	for q := range v.Seq {
		v.Seq[q] += r.dv[q] * s.iseq[q]
	}
	return v
}

func (s Solution) voltageResponse(k int) voltageResponse {
	var r voltageResponse
	e := s.e
	if !e.Energised(s.fault.Case, k) {
		return r
	}
	vbase := complex(e.net.Buses[k].KV*1000/math.Sqrt(3), 0)
	rot := e.rot[k] * cmplx.Conj(e.rot[s.fbus])
	c := e.set.VoltageFactor(e.net.Buses[s.fbus].KV, s.fault.Case)
	r.pre = complex(c, 0) * rot * vbase
	if !s.live {
		return r
	}
	nets := &e.cases[s.fault.Case]
	for q := range r.dv {
		if s.open[q] || nets[q].row[k] < 0 {
			continue
		}
		r.dv[q] = -s.transfer(q, k) * vbase
	}
	r.dv[pos] *= rot
	r.dv[neg] *= cmplx.Conj(rot)
	return r
}
