package faults

import (
	"fmt"
	"math"
)

// StationUnit is a generator's unit transformer and its tap changer: the
// two form a power station unit of IEC 60909-0, whose impedance seen from
// the network, Z_S = K_S·(t_r²·Z_G + Z_THV), carries one correction factor
// for both. The generator sits on the unit transformer's generator-side
// bus; the unit transformer gets no K_T of its own and the generator no K_G.
type StationUnit struct {
	// Transformer is the index of the unit transformer in
	// Network.Transformers.
	Transformer int
	// OnLoadTapChanger: the unit transformer has one (K_S); without one
	// the factor is K_SO.
	OnLoadTapChanger bool
	// TapPct is p_T, an off-load tap in permanent use, in % (signed, +
	// raising the HV winding's turns); without an on-load tap changer only.
	TapPct float64
	// PGPct is p_G, the generator's terminal voltage permanently above its
	// rated voltage, in %; without an on-load tap changer only.
	PGPct float64
}

// UnitCorrection returns the IEC 60909-0 correction factor of a power
// station unit (IEC 60909-0:2016 6.7, from memory; both forms reproduce
// the factors printed in IEC TR 60909-4):
//
//	with an on-load tap changer:    K_S  = (U_nQ/U_rG)²·(U_rTLV/U_rTHV)²·c_max/(1 + |x"d − x_T|·sin φ_rG)
//	without one:                    K_SO = U_nQ/(U_rG·(1 + p_G))·(U_rTLV/U_rTHV)·(1 + p_T)·c_max/(1 + x"d·sin φ_rG)
//
// with U_nQ the nominal voltage of the network at the unit transformer's
// HV side, x"d and x_T the relative reactances of generator and unit
// transformer and p_T the signed off-load tap in permanent use.
func UnitCorrection(u StationUnit, unQKV, urGKV, urTHVKV, urTLVKV, cmax, xdPct, xTPct, pf float64) float64 {
	sin := math.Sqrt(1 - pf*pf)
	if u.OnLoadTapChanger {
		q := unQKV / urGKV * urTLVKV / urTHVKV
		return q * q * cmax / (1 + math.Abs(xdPct-xTPct)/100*sin)
	}
	return unQKV / (urGKV * (1 + u.PGPct/100)) * urTLVKV / urTHVKV * (1 + u.TapPct/100) * cmax / (1 + xdPct/100*sin)
}

// unitFactor returns K_S or K_SO of generator g, which must have a Unit.
func (n *Network) unitFactor(set Settings, g *Generator) float64 {
	t := &n.Transformers[g.Unit.Transformer]
	hv, kvHV, kvLV := t.To, t.KVTo, t.KVFrom
	if t.To == g.Bus {
		hv, kvHV, kvLV = t.From, t.KVFrom, t.KVTo
	}
	unQ := n.Buses[hv].KV
	xT := t.ZPct * t.XR / math.Sqrt(1+t.XR*t.XR)
	if math.IsInf(t.XR, 1) {
		xT = t.ZPct
	}
	pf := g.PF
	if pf == 0 {
		pf = 1
	}
	return UnitCorrection(*g.Unit, unQ, g.KV, kvHV, kvLV, set.VoltageFactor(unQ, Max), g.XdPct, xT, pf)
}

// unitTransformers maps each unit transformer's index to its generator's.
func (n *Network) unitTransformers() map[int]int {
	m := make(map[int]int)
	for i := range n.Generators {
		if u := n.Generators[i].Unit; u != nil {
			m[u.Transformer] = i
		}
	}
	return m
}

// checkUnit reports the first problem of a power station unit.
func (n *Network) checkUnit(g *Generator, seen map[int]string) error {
	u := g.Unit
	if u.Transformer < 0 || u.Transformer >= len(n.Transformers) {
		return fmt.Errorf("generator %q: unit transformer index %d out of range", g.Name, u.Transformer)
	}
	t := &n.Transformers[u.Transformer]
	if t.From != g.Bus && t.To != g.Bus {
		return fmt.Errorf("generator %q: its unit transformer %q does not connect to the generator's bus", g.Name, t.Name)
	}
	if other, dup := seen[u.Transformer]; dup {
		return fmt.Errorf("generator %q: transformer %q is already the unit transformer of generator %q", g.Name, t.Name, other)
	}
	seen[u.Transformer] = g.Name
	if u.OnLoadTapChanger && (u.TapPct != 0 || u.PGPct != 0) {
		return fmt.Errorf("generator %q: p_T and p_G apply to a unit without an on-load tap changer", g.Name)
	}
	if !(u.PGPct > -100) || !(u.TapPct > -100) || math.IsInf(u.PGPct, 0) || math.IsInf(u.TapPct, 0) {
		return fmt.Errorf("generator %q: p_T and p_G must lie above −100 %%", g.Name)
	}
	return nil
}
