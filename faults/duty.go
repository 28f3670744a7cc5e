package faults

import (
	"fmt"
	"math"
	"math/cmplx"
	"sync"
)

// Duty is what a bus's switchgear must make and break for a three-phase
// fault at the bus in the maximum case, by IEC 60909-0.
type Duty struct {
	Bus int
	// IkA is the initial symmetrical short-circuit current I"k.
	IkA float64
	// RX is the ratio R/X that sets κ: the fault-point impedance at the
	// equivalent frequency, R_c/X_c, times f_c/f (method C).
	RX float64
	// Kappa is κ = 1.02 + 0.98·e^(−3R/X).
	Kappa float64
	// PeakA is the peak short-circuit current i_p = κ·√2·I"k.
	PeakA float64
	// BreakingA is the symmetrical short-circuit breaking current I_b at
	// the Settings' minimum time delay.
	BreakingA float64
	// SteadyA is the steady-state short-circuit current I_k.
	SteadyA float64
}

// equivalentFreqRatio is f_c/f of κ method C: 20 Hz for 50 Hz systems and
// 24 Hz for 60 Hz systems (IEC 60909-0, method C for meshed networks, from
// memory), both 0.4 of the system frequency.
const equivalentFreqRatio = 0.4

// kappa returns κ = 1.02 + 0.98·e^(−3R/X) (IEC 60909-0, the peak factor
// of a series R–X circuit). A ratio that is not a positive number (a
// network whose fault-point reactance is not positive) gives the largest
// κ, 2.0.
func kappa(rx float64) float64 {
	if !(rx >= 0) || math.IsInf(rx, 0) {
		return 2
	}
	return 1.02 + 0.98*math.Exp(-3*rx)
}

// dutyNets holds what the duties need beyond the fault study's networks,
// built once on first use: the maximum-case positive sequence at the
// equivalent frequency (method C, generators with R_Gf), the same without
// motors (for I_k), and the rotating machines whose share decays.
type dutyNets struct {
	once     sync.Once
	err      error
	peak     *seqNet
	steady   *seqNet
	machines []machine
	ratioKV  []float64
	tmin     float64 // the Settings' t_min, or its default
}

// machine is a generator or a motor group in service in the maximum case,
// as the breaking current sees it.
type machine struct {
	bus       int
	z         complex128 // impedance in per unit of the bus, maximum case (corrected)
	zAbs      float64    // |z|
	c         float64    // c_max of its bus's voltage level
	ratedA    float64    // rated current of all its machines together
	motor     bool
	mwPerPole float64 // P_rM/p of one motor
}

// prepareDuty builds the duty networks once.
func (e *Engine) prepareDuty() error {
	dn := &e.duty
	dn.once.Do(func() {
		n := e.net
		d, err := assembleView(n, e.set, Max, view{xScale: equivalentFreqRatio, fictitiousR: true})
		if err == nil {
			dn.peak, err = factorSeq(n, d[pos])
		}
		if err != nil {
			dn.err = fmt.Errorf("peak current network: %w", err)
			return
		}
		dn.steady = e.cases[Max][pos]
		if len(n.Motors) > 0 {
			d, err := assembleView(n, e.set, Max, view{noMotors: true})
			if err == nil {
				dn.steady, err = factorSeq(n, d[pos])
			}
			if err != nil {
				dn.err = fmt.Errorf("steady-state network: %w", err)
				return
			}
		}
		dn.ratioKV = n.RatioKV()
		dn.tmin = e.set.minTimeDelay()
		for i := range n.Generators {
			g := &n.Generators[i]
			if !g.InMax {
				continue
			}
			z, _, _ := generatorPU(n, e.set, g, Max, view{})
			dn.machines = append(dn.machines, machine{bus: g.Bus, z: z, ratedA: g.MVA * 1000 / (math.Sqrt(3) * g.KV)})
		}
		for i := range n.Motors {
			m := &n.Motors[i]
			dn.machines = append(dn.machines, machine{bus: m.Bus, z: m.ZOhm() / complex(e.zbase[m.Bus], 0),
				ratedA: m.RatedA() * m.count(), motor: true, mwPerPole: m.MWPerPolePair()})
		}
		for i := range dn.machines {
			m := &dn.machines[i]
			m.zAbs = cmplx.Abs(m.z)
			m.c = e.set.VoltageFactor(n.Buses[m.bus].KV, Max)
		}
	})
	return dn.err
}

// Duty returns the IEC 60909-0 figures of a three-phase fault at bus k in
// the maximum case:
//
//   - i_p by method C for meshed networks: κ from R/X = (R_c/X_c)·(f_c/f),
//     with Z_c the fault-point impedance of the network whose reactances are
//     taken at f_c = 0.4·f and whose generators carry R_Gf;
//   - I_b for meshed networks (IEC 60909-0:2016 eq. (75), from memory):
//     I_b = I"k − Σ (ΔU"_i/(c·U_n/√3))·(1 − μ_i·q_i)·I"k_i over the
//     generators and motors, with I"k_i each machine's share at its
//     terminals, ΔU"_i = X_i·I"k_i the drop across its (corrected)
//     reactance, μ from I"k_i/I_r and the Settings' t_min, q = 1 for
//     synchronous machines; a far fault (I"k_i ≤ 2·I_r) does not decay;
//   - I_k by the meshed-network rule, I"k without the motors.
//
// A bus not fed in the maximum case has a zero Duty.
func (e *Engine) Duty(k int) (Duty, error) {
	if err := e.prepareDuty(); err != nil {
		return Duty{}, err
	}
	if k < 0 || k >= len(e.net.Buses) {
		return Duty{Bus: k}, fmt.Errorf("duty bus %d out of range", k)
	}
	d, ifault := e.dutyBase(k)
	if d.IkA > 0 {
		sn := e.cases[Max][pos]
		d.BreakingA = math.Max(0, d.IkA-e.decay(k, ifault, func(g int) complex128 { return sn.z(g, k) }))
	}
	return d, nil
}

// dutyBase returns the duty of bus k without the breaking current, and the
// per-unit fault current.
func (e *Engine) dutyBase(k int) (Duty, complex128) {
	d := Duty{Bus: k}
	sn := e.cases[Max][pos]
	if sn.row[k] < 0 {
		return d, 0
	}
	c := e.set.VoltageFactor(e.net.Buses[k].KV, Max)
	ifault := complex(c, 0) / sn.z(k, k)
	d.IkA = cmplx.Abs(ifault) * e.ibase[k]
	d.BreakingA = d.IkA

	zc := e.duty.peak.z(k, k)
	d.RX = real(zc) / imag(zc) * equivalentFreqRatio
	d.Kappa = kappa(d.RX)
	d.PeakA = d.Kappa * math.Sqrt2 * d.IkA

	if st := e.duty.steady; st.row[k] >= 0 {
		d.SteadyA = c / cmplx.Abs(st.z(k, k)) * e.ibase[k]
	}
	return d, ifault
}

// decay returns the amperes by which the machines' shares of a fault at
// bus k, of per-unit current ifault, have decayed at t_min; zgk(g) is the
// transfer impedance between machine bus g and bus k.
func (e *Engine) decay(k int, ifault complex128, zgk func(g int) complex128) float64 {
	sn := e.cases[Max][pos]
	var sum float64
	for i := range e.duty.machines {
		if m := &e.duty.machines[i]; sn.row[m.bus] >= 0 {
			sum += e.decayOf(m, k, cmplx.Abs(zgk(m.bus)*ifault))
		}
	}
	return sum
}

// decayOf returns machine m's decay term, in amperes at bus k, for a fault
// that changes the voltage at its terminals by dv per unit (a magnitude).
func (e *Engine) decayOf(m *machine, k int, dv float64) float64 {
	// The machine's share: the voltage change at its terminals driven
	// through its own impedance.
	share := dv / m.zAbs // per unit of its bus
	shareA := share * e.ibase[m.bus]
	if !m.motor && shareA <= 2*m.ratedA {
		return 0 // a far fault: no decay (μ = 1)
	}
	tmin := e.duty.tmin
	mu := DecayMu(shareA/m.ratedA, tmin)
	q := 1.0
	if m.motor {
		q = DecayQ(m.mwPerPole, tmin)
	}
	drop := imag(m.z) * share / m.c // ΔU"/(c·U_n/√3) at the machine's terminals
	return drop * (1 - mu*q) * shareA * e.duty.ratioKV[m.bus] / e.duty.ratioKV[k]
}

// decayChunks is the number of fixed groups of machine buses whose decay
// terms are summed separately and then in order: a fixed grouping keeps
// the sums, and so the output, independent of the number of CPUs.
const decayChunks = 16

// allDecay returns, per bus, the decay of the machines' shares of a fault
// there. Each machine bus's column of the bus impedance matrix gives its
// transfer impedance to every bus at once.
func (e *Engine) allDecay() []float64 {
	n := e.net
	sn := e.cases[Max][pos]
	nb := len(n.Buses)
	ifault := make([]float64, nb) // |I"k| in per unit
	for k := range ifault {
		if r := sn.row[k]; r >= 0 && !n.Buses[k].Internal {
			ifault[k] = e.set.VoltageFactor(n.Buses[k].KV, Max) / cmplx.Abs(sn.diag[r])
		}
	}
	byBus := map[int][]int{}
	var buses []int
	for i, m := range e.duty.machines {
		if sn.row[m.bus] < 0 {
			continue
		}
		if _, seen := byBus[m.bus]; !seen {
			buses = append(buses, m.bus)
		}
		byBus[m.bus] = append(byBus[m.bus], i)
	}
	acc := make([][]float64, decayChunks)
	parallel(decayChunks, func(c int) error {
		lo, hi := c*len(buses)/decayChunks, (c+1)*len(buses)/decayChunks
		if lo == hi {
			return nil
		}
		sum := make([]float64, nb)
		col := make([]complex128, sn.fac.Size())
		for _, g := range buses[lo:hi] {
			sn.fac.Column(col, int(sn.row[g]))
			at := byBus[g]
			for k := range sum {
				r := sn.row[k]
				if r < 0 || ifault[k] == 0 {
					continue
				}
				dv := cmplx.Abs(col[r]) * ifault[k]
				for _, i := range at {
					sum[k] += e.decayOf(&e.duty.machines[i], k, dv)
				}
			}
		}
		acc[c] = sum
		return nil
	})
	total := make([]float64, nb)
	for _, sum := range acc {
		for k, v := range sum {
			total[k] += v
		}
	}
	return total
}

// AllDuties returns the Duty of every bus, using every CPU; buses that
// are internal nodes get a zero Duty. The figures equal Duty's up to
// rounding and do not depend on the number of CPUs.
func (e *Engine) AllDuties() ([]Duty, error) {
	if err := e.prepareDuty(); err != nil {
		return nil, err
	}
	decay := e.allDecay()
	out := make([]Duty, len(e.net.Buses))
	err := parallel(len(out), func(k int) error {
		if e.net.Buses[k].Internal {
			out[k] = Duty{Bus: k}
			return nil
		}
		out[k], _ = e.dutyBase(k)
		if out[k].IkA > 0 {
			out[k].BreakingA = math.Max(0, out[k].IkA-decay[k])
		}
		return nil
	})
	return out, err
}
