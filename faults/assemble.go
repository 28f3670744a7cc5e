package faults

import (
	"fmt"
	"math/cmplx"
)

// Sequence indices.
const (
	zero = 0
	pos  = 1
	neg  = 2
)

// block is the 2×2 admittance of a branch in one sequence, symmetric: the
// current into the branch at its From end is ff·V_from + ft·V_to, at its To
// end ft·V_from + tt·V_to (per unit, each on its own bus's base).
type block struct{ ff, ft, tt complex128 }

// seriesBlock is a series admittance 1/z behind an ideal transformer of
// real ratio tap:1 on the From side (tap 1 for a line).
func seriesBlock(z complex128, tap float64) block {
	y := 1 / z
	t := complex(tap, 0)
	return block{ff: y / (t * t), ft: -y / t, tt: y}
}

// seqData is one sequence network of one case in per unit, before
// factorization: a shunt admittance per bus and a block per branch.
type seqData struct {
	shunt  []complex128
	branch []block
	series []complex128 // series impedance of each line (0 for transformers)
	shunts []elementY   // each element's part of shunt, to explain a singular matrix
	// srcY and genY are each source's and generator's own shunt
	// admittance (already in shunt), for taking one out (SolveOpen).
	srcY, genY []complex128
}

// addShunt adds an element's shunt admittance y at bus.
func (d *seqData) addShunt(bus int, ref ElementRef, y complex128) {
	d.shunt[bus] += y
	d.shunts = append(d.shunts, elementY{bus: bus, ref: ref, y: cmplx.Abs(y)})
}

func newSeqData(nb, nbr int) *seqData {
	return &seqData{
		shunt:  make([]complex128, nb),
		branch: make([]block, nbr),
		series: make([]complex128, nbr),
	}
}

// caseData holds the three sequence networks of one case.
type caseData [3]*seqData

// assemble builds the per-unit sequence networks of case cs.
func assemble(n *Network, set Settings, cs Case) (caseData, error) {
	return assembleView(n, set, cs, view{})
}

// view selects a variant of a case's networks: those of the fault study
// (the zero value), or the variants of the positive sequence that the peak
// and steady-state currents need (duty.go).
type view struct {
	// xScale multiplies every reactance (0: unchanged): the network at the
	// equivalent frequency of κ method C.
	xScale float64
	// fictitiousR gives every generator its fictitious resistance R_Gf,
	// which IEC 60909-0 prescribes for the peak current.
	fictitiousR bool
	// noMotors leaves the asynchronous motors out.
	noMotors bool
}

// z applies the view's reactance scale to an impedance.
func (v view) z(z complex128) complex128 {
	if v.xScale == 0 {
		return z
	}
	return complex(real(z), v.xScale*imag(z))
}

// assembleView builds the per-unit sequence networks of case cs as view v
// sees them.
func assembleView(n *Network, set Settings, cs Case, v view) (caseData, error) {
	nb, nbr := len(n.Buses), n.BranchCount()
	var d caseData
	for s := range d {
		d[s] = newSeqData(nb, nbr)
		d[s].srcY = make([]complex128, len(n.Sources))
		d[s].genY = make([]complex128, len(n.Generators))
	}
	base := n.baseMVA()
	zb := func(bus int) float64 { kv := n.Buses[bus].KV; return kv * kv / base }

	for si, s := range n.Sources {
		st := s.Max
		if cs == Min {
			st = s.Min
		}
		kv := n.Buses[s.Bus].KV
		z1 := st.Z1Ohm
		if z1 == 0 {
			if !(st.SCMVA > 0) {
				return d, fmt.Errorf("source %q: no %s-case strength (short-circuit power or impedance)", s.Name, cs)
			}
			z1 = zFromPower(set.VoltageFactor(kv, cs), kv, st.SCMVA, st.XR)
		}
		z1pu := v.z(z1) / complex(zb(s.Bus), 0)
		ref := ElementRef{"source", s.Name}
		d[pos].addShunt(s.Bus, ref, 1/z1pu)
		d[neg].addShunt(s.Bus, ref, 1/z1pu)
		d[pos].srcY[si], d[neg].srcY[si] = 1/z1pu, 1/z1pu
		if s.Earthed {
			z0 := st.Z0Ohm
			if z0 == 0 {
				xr0 := s.X0R0
				if xr0 == 0 {
					xr0 = xrOf(z1)
				}
				z0 = polarXR(s.Z0Z1*cmplx.Abs(z1), xr0)
			}
			if z0 == 0 {
				return d, fmt.Errorf("source %q: earthed but has no zero-sequence impedance", s.Name)
			}
			d[zero].addShunt(s.Bus, ref, complex(zb(s.Bus), 0)/z0)
			d[zero].srcY[si] = complex(zb(s.Bus), 0) / z0
		}
	}

	for i := range n.Generators {
		g := &n.Generators[i]
		if (cs == Max && !g.InMax) || (cs == Min && !g.InMin) {
			continue
		}
		z1, z2, z0 := generatorPU(n, set, g, cs, v)
		ref := ElementRef{"generator", g.Name}
		d[pos].addShunt(g.Bus, ref, 1/z1)
		d[neg].addShunt(g.Bus, ref, 1/z2)
		d[pos].genY[i], d[neg].genY[i] = 1/z1, 1/z2
		if !g.Earth.Isolated {
			z0 += 3 * g.Earth.ZOhm / complex(zb(g.Bus), 0)
			if z0 == 0 {
				return d, fmt.Errorf("generator %q: earthed star point with zero zero-sequence impedance", g.Name)
			}
			d[zero].addShunt(g.Bus, ref, 1/z0)
			d[zero].genY[i] = 1 / z0
		}
	}

	for b, l := range n.Lines {
		zbase := complex(zb(l.From), 0)
		z1, z0 := l.Z1Ohm, l.Z0Ohm
		if cs == Min {
			endC := l.EndTempC
			if endC == 0 {
				endC = set.EndTempC
			}
			h := heatFactor(endC)
			z1 = complex(real(z1)*h, imag(z1))
			z0 = complex(real(z0)*h, imag(z0))
		}
		z1, z0 = v.z(z1)/zbase, z0/zbase
		d[pos].branch[b] = seriesBlock(z1, 1)
		d[neg].branch[b] = seriesBlock(z1, 1)
		d[pos].series[b], d[neg].series[b] = z1, z1
		d[zero].branch[b] = seriesBlock(z0, 1)
		d[zero].series[b] = z0
	}

	units := n.unitTransformers()
	for i := range n.Transformers {
		t := &n.Transformers[i]
		b := len(n.Lines) + i
		unitK := 0.0
		if gi, ok := units[i]; ok && cs == Max {
			unitK = n.unitFactor(set, &n.Generators[gi])
		}
		blk, err := transformerBlocks(n, set, cs, t, unitK, v)
		if err != nil {
			return d, err
		}
		for s := range d {
			d[s].branch[b] = blk[s]
		}
	}

	for i := range n.Transformers3 {
		blk, err := transformer3Blocks(n, set, cs, &n.Transformers3[i], v)
		if err != nil {
			return d, err
		}
		for w := range blk {
			for s := range d {
				d[s].branch[n.StarBranch(i, w)] = blk[w][s]
			}
		}
	}

	if cs == Max && !v.noMotors {
		for i := range n.Motors {
			m := &n.Motors[i]
			z := v.z(m.ZOhm()) / complex(zb(m.Bus), 0)
			ref := ElementRef{"motor", m.Name}
			d[pos].addShunt(m.Bus, ref, 1/z)
			d[neg].addShunt(m.Bus, ref, 1/z)
		}
	}

	for _, e := range n.Earthings {
		z := e.Z0Ohm + 3*e.NeutralZ
		if z == 0 {
			return d, fmt.Errorf("earthing %q: zero-sequence impedance Z0 + 3Zn must not be zero", e.Name)
		}
		d[zero].addShunt(e.Bus, ElementRef{"earthing", e.Name}, complex(zb(e.Bus), 0)/z)
	}
	return d, nil
}

// generatorPU returns a generator's positive-, negative- and zero-sequence
// impedance in per unit of its bus in case cs, as view v sees it: on its
// rating with the correction factor of the maximum case (K_G, or K_S/K_SO
// of its power station unit), without the neutral's 3Zn.
func generatorPU(n *Network, set Settings, g *Generator, cs Case, v view) (z1, z2, z0 complex128) {
	un := n.Buses[g.Bus].KV
	zr := g.KV * g.KV / g.MVA // ohms per unit of the machine rating
	k := 1.0
	switch {
	case cs == Max && g.Unit != nil:
		k = n.unitFactor(set, g)
	case cs == Max && g.PF > 0:
		k = GeneratorCorrection(un, g.KV, set.VoltageFactor(un, Max), g.XdPct, g.PF)
	}
	r := g.RPct
	if r == 0 || v.fictitiousR {
		r = fictitiousGeneratorR(*g)
	}
	x2 := g.X2Pct
	if x2 == 0 {
		x2 = g.XdPct
	}
	scale := complex(k*zr/100/(un*un/n.baseMVA()), 0)
	return v.z(complex(r, g.XdPct) * scale), v.z(complex(r, x2) * scale), complex(r, g.X0Pct) * scale
}

// xrOf returns X/R of an impedance (+Inf for a pure reactance).
func xrOf(z complex128) float64 {
	if real(z) == 0 {
		return inf
	}
	return imag(z) / real(z)
}

// fictitiousGeneratorR returns the IEC 60909-0 fictitious stator resistance
// in % (from memory of the standard's clause on generators): 0.05·x"d for
// U_rG > 1 kV and S_rG ≥ 100 MVA, 0.07·x"d for U_rG > 1 kV and S_rG < 100
// MVA, 0.15·x"d for U_rG ≤ 1 kV.
func fictitiousGeneratorR(g Generator) float64 {
	switch {
	case g.KV <= lowVoltageKV:
		return 0.15 * g.XdPct
	case g.MVA >= 100:
		return 0.05 * g.XdPct
	}
	return 0.07 * g.XdPct
}

// transformerBlocks returns the zero, positive and negative sequence
// blocks of a transformer in case cs. The short-circuit impedance sits on
// the To side, behind an ideal transformer of off-nominal ratio
// tap = (kV_from/Un_from)/(kV_to/Un_to) on the From side. unitK, when not
// zero, is the correction factor of the power station unit the transformer
// belongs to, used instead of K_T.
func transformerBlocks(n *Network, set Settings, cs Case, t *Transformer, unitK float64, v view) ([3]block, error) {
	var blk [3]block
	base := n.baseMVA()
	unF, unT := n.Buses[t.From].KV, n.Buses[t.To].KV
	zbT := unT * unT / base
	zbF := unF * unF / base
	tap := (t.KVFrom / unF) / (t.KVTo / unT)
	zr := t.KVTo * t.KVTo / t.MVA // ohms per unit of rating, To side

	k := 1.0
	switch {
	case unitK != 0:
		k = unitK
	case cs == Max && !t.NotCorrected:
		k = TransformerCorrection(set.VoltageFactor(minf(unF, unT), Max), t.ZPct, t.XR)
	}
	z1 := v.z(polarXR(k*t.ZPct/100*zr/zbT, t.XR))
	blk[pos] = seriesBlock(z1, tap)
	blk[neg] = blk[pos]

	z0pct, x0r0 := t.Z0Pct, t.X0R0
	if z0pct == 0 {
		z0pct = t.ZPct
	}
	if x0r0 == 0 {
		x0r0 = t.XR
	}
	z0 := polarXR(k*z0pct/100*zr/zbT, x0r0)

	wF, wT := t.Group.HV, t.Group.LV
	if t.KVFrom < t.KVTo {
		wF, wT = wT, wF
	}
	if wF == EarthedStar && t.NeutralFrom.Isolated {
		wF = Star
	}
	if wT == EarthedStar && t.NeutralTo.Isolated {
		wT = Star
	}
	// Neutral impedances appear as 3Zn in the zero-sequence path, each in
	// per unit of its own side; the From side's is referred to the To side
	// through the ideal transformer (divide by tap²).
	znF := 3 * t.NeutralFrom.ZOhm / complex(zbF, 0)
	znT := 3 * t.NeutralTo.ZOhm / complex(zbT, 0)
	tap2 := complex(tap*tap, 0)
	switch {
	case wF == EarthedStar && wT == EarthedStar:
		blk[zero] = seriesBlock(z0+znT+znF/tap2, tap)
	case wF == EarthedStar && wT == Delta:
		blk[zero] = block{ff: 1 / (znF + tap2*z0)}
	case wF == Delta && wT == EarthedStar:
		blk[zero] = block{tt: 1 / (z0 + znT)}
	}
	return blk, nil
}

func minf(a, b float64) float64 {
	if a < b {
		return a
	}
	return b
}
