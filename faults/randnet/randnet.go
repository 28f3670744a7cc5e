// Package randnet builds random networks for fuzzing the fault engine and
// the checker: seeded, of any size, with element values drawn over the
// whole range a study file may give (coord/study/limits.go), typical
// values and extremes alike. The networks are meshed: a tree of lines
// (same voltage) and transformers (different voltages, random vector
// groups and earthing) with extra lines closing loops, sources,
// generators and earthing transformers at random buses.
//
// It is a test helper: the networks are not realistic, and some cannot be
// solved (an island with no source, transformers in parallel with
// different clock numbers, admittances too far apart for the arithmetic);
// the engine must say so with an error, never return a wrong number.
package randnet

import (
	"fmt"
	"math"
	"math/rand/v2"

	"tripgrade/faults"
)

// Options say what to build.
type Options struct {
	Buses int
	Seed  uint64
	// Extreme draws values over the full range a study file accepts;
	// otherwise over typical ranges.
	Extreme bool
}

// voltages are the nominal voltages buses take.
var voltages = []float64{0.4, 11, 33, 132}

// groups are the vector groups transformers take.
var groups = []string{"Dyn11", "Dyn1", "YNd11", "YNyn0", "Yy0", "Dd0", "Yd1", "Dy11"}

// Network returns a random network and fault settings.
func Network(o Options) (*faults.Network, faults.Settings) {
	r := &rng{Rand: rand.New(rand.NewPCG(o.Seed, 0x7a1e)), extreme: o.Extreme}
	nb := max(2, o.Buses)
	n := &faults.Network{BaseMVA: r.pick(100, 1e-3, 1e5)}
	for i := range nb {
		n.Buses = append(n.Buses, faults.Bus{Name: fmt.Sprintf("B%d", i), KV: voltages[r.IntN(len(voltages))]})
	}
	for i := 1; i < nb; i++ { // a spanning tree
		r.branch(n, r.IntN(i), i)
	}
	for range r.IntN(nb/2 + 1) { // loops, mostly where the phase shifts agree
		a, b := r.IntN(nb), r.IntN(nb)
		if a == b {
			continue
		}
		nl, nt := len(n.Lines), len(n.Transformers)
		r.branch(n, a, b)
		if _, err := n.ZoneAngles(); err != nil && r.Float64() < 0.9 {
			n.Lines, n.Transformers = n.Lines[:nl], n.Transformers[:nt]
		}
	}
	for k := range 1 + r.IntN(3) {
		r.source(n, fmt.Sprintf("S%d", k), r.IntN(nb))
	}
	if r.Float64() < 0.3 {
		r.generator(n, r.IntN(nb))
	}
	if r.Float64() < 0.3 {
		n.Earthings = append(n.Earthings, faults.Earthing{Name: "E", Bus: r.IntN(nb),
			Z0Ohm: r.z(1e-3, 1e6), NeutralZ: complex(r.pick(10, 0, 1e6), 0)})
	}
	set := faults.Settings{
		LVTolerance10: r.Float64() < 0.5,
		EarthFaultOhm: r.pick(10, 0, 1e4), EarthFaultOhmLV: r.pick(0.5, 0, 1e4), PhaseFaultOhm: r.pick(0, 0, 1e4),
		EndTempC: r.pick(80, 20, 400),
	}
	return n, set
}

type rng struct {
	*rand.Rand
	extreme bool
}

// logUniform draws from lo to hi evenly in the logarithm.
func (r *rng) logUniform(lo, hi float64) float64 {
	return math.Exp(math.Log(lo) + (math.Log(hi)-math.Log(lo))*r.Float64())
}

// pick returns a value near typical, or, for extreme networks, anything
// from lo to hi (lo itself now and then).
func (r *rng) pick(typical, lo, hi float64) float64 {
	if !r.extreme {
		return typical * (0.5 + r.Float64())
	}
	switch x := r.Float64(); {
	case x < 0.1:
		return lo
	case x < 0.2:
		return hi
	}
	return r.logUniform(math.Max(lo, 1e-9), hi)
}

// z draws an impedance of magnitude from lo to hi ohms with a random
// X/R, now and then purely resistive or reactive.
func (r *rng) z(lo, hi float64) complex128 {
	mag := r.logUniform(lo, hi)
	if !r.extreme {
		mag = r.logUniform(math.Max(lo, 0.01), math.Min(hi, 100))
	}
	switch x := r.Float64(); {
	case x < 0.1:
		return complex(0, mag)
	case x < 0.15:
		return complex(mag, 0)
	}
	a := r.Float64() * math.Pi / 2
	return complex(mag*math.Cos(a), mag*math.Sin(a))
}

func (r *rng) branch(n *faults.Network, a, b int) {
	ka, kb := n.Buses[a].KV, n.Buses[b].KV
	if ka == kb {
		n.Lines = append(n.Lines, faults.Line{Name: fmt.Sprintf("L%d", len(n.Lines)), From: a, To: b,
			Z1Ohm: r.z(1e-6, 1e6), Z0Ohm: r.z(1e-6, 1e6), EndTempC: r.pick(0, 20, 400)})
		return
	}
	g, err := faults.ParseVectorGroup(groups[r.IntN(len(groups))])
	if err != nil {
		panic(err) // the list above is valid
	}
	t := faults.Transformer{Name: fmt.Sprintf("T%d", len(n.Transformers)), From: a, To: b,
		MVA: r.pick(10, 0.01, 5000), KVFrom: ka * (0.9 + 0.2*r.Float64()), KVTo: kb * (0.9 + 0.2*r.Float64()),
		ZPct: r.pick(8, 0.1, 50), XR: r.pick(10, 0.1, 1000), Z0Pct: r.pick(7, 0.1, 100), X0R0: r.pick(8, 0.1, 1000),
		Group: g, NotCorrected: r.Float64() < 0.2}
	t.NeutralFrom.ZOhm = complex(r.pick(1, 0, 1e6), r.pick(0, 0, 1e6))
	t.NeutralTo.ZOhm = complex(r.pick(10, 0, 1e6), 0)
	n.Transformers = append(n.Transformers, t)
}

func (r *rng) source(n *faults.Network, name string, bus int) {
	s := faults.Source{Name: name, Bus: bus, Earthed: r.Float64() < 0.8, Z0Z1: r.pick(1.2, 1e-3, 1e4), X0R0: r.pick(8, 0.1, 1000)}
	maxMVA := r.pick(500, 1e-3, 1e6)
	s.Max = faults.Strength{SCMVA: maxMVA, XR: r.pick(10, 0.1, 1000)}
	s.Min = faults.Strength{SCMVA: maxMVA * (0.1 + 0.9*r.Float64()), XR: r.pick(10, 0.1, 1000)}
	if r.Float64() < 0.2 {
		s.Max = faults.Strength{Z1Ohm: r.z(1e-6, 1e6), Z0Ohm: r.z(1e-6, 1e6)}
		s.Min = s.Max
	}
	n.Sources = append(n.Sources, s)
}

func (r *rng) generator(n *faults.Network, bus int) {
	g := faults.Generator{Name: "G", Bus: bus, MVA: r.pick(20, 0.01, 5000), KV: n.Buses[bus].KV,
		XdPct: r.pick(15, 1, 99), X0Pct: r.pick(5, 0.1, 100), PF: 0.8, InMax: true, InMin: r.Float64() < 0.5}
	g.Earth = faults.Neutral{Isolated: r.Float64() < 0.5, ZOhm: complex(r.pick(5, 0, 1e6), 0)}
	n.Generators = append(n.Generators, g)
}
