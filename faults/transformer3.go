package faults

import (
	"fmt"
	"math"
	"math/cmplx"
)

// Windings of a three-winding transformer, in the order of its vector
// group: the high-voltage winding first.
const (
	HV = iota // high-voltage winding (A in IEC 60909-0)
	MV        // medium-voltage winding (B)
	LV        // low-voltage winding (C)
)

// WindingName returns "HV", "MV" or "LV".
func WindingName(w int) string { return [...]string{"HV", "MV", "LV"}[w] }

// Winding pairs of a three-winding transformer, each with its own
// short-circuit impedance from its own test.
const (
	HVMV = iota // A–B
	HVLV        // A–C
	MVLV        // B–C
)

// PairName returns "HV–MV", "HV–LV" or "MV–LV".
func PairName(p int) string { return [...]string{"HV–MV", "HV–LV", "MV–LV"}[p] }

// pairWindings lists the two windings of each pair.
var pairWindings = [3][2]int{HVMV: {HV, MV}, HVLV: {HV, LV}, MVLV: {MV, LV}}

// Transformer3 is a three-winding transformer. Its windings' terminals sit
// on Buses; its equivalent circuit is a star of three branches meeting at
// an internal node, StarBus, with the star impedances referred to the HV
// winding's rated voltage. Network.AddTransformer3 adds it with its star
// node.
type Transformer3 struct {
	Name    string
	Buses   [3]int     // terminal bus of the HV, MV and LV winding
	StarBus int        // the internal star point (a Bus with Internal set)
	KV      [3]float64 // rated winding voltages U_r
	// Pairs holds the short-circuit impedance of each winding pair
	// (HVMV, HVLV, MVLV), each on its own rated power.
	Pairs   [3]WindingPair
	Group   VectorGroup3
	Neutral [3]Neutral // earthing of each star winding's star point
	// NotCorrected: do not apply the IEC 60909-0 correction K_T to the
	// pairs in the maximum case.
	NotCorrected bool
}

// WindingPair is the short-circuit test of one pair of windings, with the
// third open: u_kr and u_Rr in % on the pair's rated power.
type WindingPair struct {
	MVA   float64 // rated power the percentages refer to (S_rTAB, …)
	ZPct  float64 // u_kr
	RPct  float64 // u_Rr, the resistive part
	Z0Pct float64 // zero-sequence impedance seen through this pair; 0: ZPct
	R0Pct float64 // its resistive part (used when Z0Pct is given)
}

// AddTransformer3 appends t and its internal star-point bus, named after
// it, to the network and returns its index in Transformers3. The star
// point takes the nominal voltage of the HV winding's bus (its per-unit
// base; no fault is placed there).
func (n *Network) AddTransformer3(t Transformer3) int {
	kv := t.KV[HV]
	if hv := t.Buses[HV]; hv >= 0 && hv < len(n.Buses) && n.Buses[hv].KV > 0 {
		kv = n.Buses[hv].KV
	}
	n.Buses = append(n.Buses, Bus{Name: t.Name + " (star point)", KV: kv, Internal: true})
	t.StarBus = len(n.Buses) - 1
	n.Transformers3 = append(n.Transformers3, t)
	return len(n.Transformers3) - 1
}

// WindingMVA returns the rating of winding w: the largest rated power of
// the two pairs it belongs to.
func (t *Transformer3) WindingMVA(w int) float64 {
	m := 0.0
	for p, ws := range pairWindings {
		if ws[0] == w || ws[1] == w {
			m = math.Max(m, t.Pairs[p].MVA)
		}
	}
	return m
}

// PairOhm returns the positive- and zero-sequence short-circuit impedance
// of pair p in ohms referred to the HV winding's rated voltage:
// Z = u_kr/100·U_rHV²/S_rp, R = u_Rr/100·U_rHV²/S_rp (IEC 60909-0, three-
// winding transformers).
func (t *Transformer3) PairOhm(p int) (z1, z0 complex128) {
	pr := t.Pairs[p]
	zr := t.KV[HV] * t.KV[HV] / pr.MVA
	z1 = fromZR(pr.ZPct, pr.RPct, zr)
	z0 = z1
	if pr.Z0Pct > 0 {
		z0 = fromZR(pr.Z0Pct, pr.R0Pct, zr)
	}
	return z1, z0
}

// fromZR returns the impedance of magnitude zPct and resistance rPct (% of
// the reference impedance zr), with a positive reactance.
func fromZR(zPct, rPct, zr float64) complex128 {
	return complex(rPct, math.Sqrt(zPct*zPct-rPct*rPct)) * complex(zr/100, 0)
}

// PairCorrection returns the IEC 60909-0 correction factor of pair p,
// K_T = 0.95·c_max/(1 + 0.6·x_T) with x_T the pair's relative reactance on
// its own rated power: each pair of a three-winding transformer has its
// own factor (K_TAB, K_TAC, K_TBC), applied to that pair's impedance
// before the conversion to a star.
func (t *Transformer3) PairCorrection(p int, cmax float64) float64 {
	pr := t.Pairs[p]
	xT := math.Sqrt(pr.ZPct*pr.ZPct-pr.RPct*pr.RPct) / 100
	return 0.95 * cmax / (1 + 0.6*xT)
}

// StarOhm returns the star equivalent in ohms referred to the HV winding's
// rated voltage, positive and zero sequence, with pair p's impedances
// multiplied by k[p] first:
//
//	Z_HV = ½(Z_HVMV + Z_HVLV − Z_MVLV)
//	Z_MV = ½(Z_HVMV + Z_MVLV − Z_HVLV)
//	Z_LV = ½(Z_HVLV + Z_MVLV − Z_HVMV)
//
// A star branch is fictitious: its resistance or reactance may come out
// negative, and it is kept as computed.
func (t *Transformer3) StarOhm(k [3]float64) (z1, z0 [3]complex128) {
	var p1, p0 [3]complex128
	for p := range t.Pairs {
		a, b := t.PairOhm(p)
		p1[p], p0[p] = a*complex(k[p], 0), b*complex(k[p], 0)
	}
	star := func(z [3]complex128) [3]complex128 {
		return [3]complex128{
			HV: (z[HVMV] + z[HVLV] - z[MVLV]) / 2,
			MV: (z[HVMV] + z[MVLV] - z[HVLV]) / 2,
			LV: (z[HVLV] + z[MVLV] - z[HVMV]) / 2,
		}
	}
	return star(p1), star(p0)
}

// corrections returns the factors applied to each pair in case cs: K_T of
// each pair in the maximum case (c_max of the lower of the pair's two bus
// voltages), 1 otherwise.
func (t *Transformer3) corrections(n *Network, set Settings, cs Case) [3]float64 {
	k := [3]float64{1, 1, 1}
	if cs != Max || t.NotCorrected {
		return k
	}
	for p, ws := range pairWindings {
		un := minf(n.Buses[t.Buses[ws[0]]].KV, n.Buses[t.Buses[ws[1]]].KV)
		k[p] = t.PairCorrection(p, set.VoltageFactor(un, Max))
	}
	return k
}

// zeroStarShare is the size, relative to the pair impedances, below which
// a star branch counts as zero: the engine cannot represent a branch of no
// impedance, and rounding leaves a residue where the pairs add up exactly.
const zeroStarShare = 1e-9

// transformer3Blocks returns the zero, positive and negative sequence
// blocks of the three star branches of t in case cs, indexed
// [winding][sequence]. Each star branch runs from its winding's terminal
// (From) to the star point (To), with the winding's rated ratio as an
// ideal transformer on the From side and the star impedance on the star
// side. In the zero sequence an earthed star winding is a series branch
// with 3Zn of its neutral, a delta winding connects the star point to
// earth through its star impedance (the delta closes the zero-sequence
// current), and an unearthed star winding is open (textbook three-winding
// equivalents, e.g. Grainger & Stevenson ch. 11).
func transformer3Blocks(n *Network, set Settings, cs Case, t *Transformer3, v view) ([3][3]block, error) {
	var blk [3][3]block
	base := n.baseMVA()
	unStar := n.Buses[t.StarBus].KV
	zbStar := unStar * unStar / base
	z1, z0 := t.StarOhm(t.corrections(n, set, cs))
	var scale float64
	for p := range t.Pairs {
		a, _ := t.PairOhm(p)
		scale += cmplx.Abs(a)
	}
	for w := range blk {
		un := n.Buses[t.Buses[w]].KV
		tap := (t.KV[w] / un) / (t.KV[HV] / unStar)
		if cmplx.Abs(z1[w]) < zeroStarShare*scale {
			return blk, fmt.Errorf("three-winding transformer %q: the star branch of its %s winding has no impedance (the pair impedances add up exactly); the engine cannot represent it: check u_k of the three pairs", t.Name, WindingName(w))
		}
		blk[w][pos] = seriesBlock(complex(1/zbStar, 0)*v.z(z1[w]), tap)
		blk[w][neg] = blk[w][pos]
		wd := t.Group.W[w]
		if wd == EarthedStar && t.Neutral[w].Isolated {
			wd = Star
		}
		ref := t.KV[HV] / t.KV[w] // refers the winding's neutral to the star side
		switch wd {
		case EarthedStar:
			z := z0[w] + 3*t.Neutral[w].ZOhm*complex(ref*ref, 0)
			if cmplx.Abs(z) < zeroStarShare*scale {
				return blk, fmt.Errorf("three-winding transformer %q: the zero-sequence star branch of its %s winding has no impedance; check the zero-sequence data of the pairs", t.Name, WindingName(w))
			}
			blk[w][zero] = seriesBlock(z/complex(zbStar, 0), tap)
		case Delta:
			if cmplx.Abs(z0[w]) < zeroStarShare*scale {
				return blk, fmt.Errorf("three-winding transformer %q: the zero-sequence star branch of its %s (delta) winding has no impedance; check the zero-sequence data of the pairs", t.Name, WindingName(w))
			}
			blk[w][zero] = block{tt: complex(zbStar, 0) / z0[w]}
		}
	}
	return blk, nil
}

// checkTransformer3 reports the first structural problem of a
// three-winding transformer.
func (n *Network) checkTransformer3(t *Transformer3) error {
	nb := len(n.Buses)
	for w, b := range t.Buses {
		if b < 0 || b >= nb {
			return fmt.Errorf("transformer %q: %s bus index %d out of range", t.Name, WindingName(w), b)
		}
		if n.Buses[b].Internal {
			return fmt.Errorf("transformer %q: %s winding on an internal node", t.Name, WindingName(w))
		}
		if !(t.KV[w] > 0) || math.IsInf(t.KV[w], 0) {
			return fmt.Errorf("transformer %q: rated voltage of the %s winding must be > 0", t.Name, WindingName(w))
		}
	}
	if t.Buses[HV] == t.Buses[MV] || t.Buses[HV] == t.Buses[LV] || t.Buses[MV] == t.Buses[LV] {
		return fmt.Errorf("transformer %q: two windings on the same bus", t.Name)
	}
	if t.StarBus < 0 || t.StarBus >= nb || !n.Buses[t.StarBus].Internal {
		return fmt.Errorf("transformer %q: its star point must be an internal bus (use Network.AddTransformer3)", t.Name)
	}
	for p, pr := range t.Pairs {
		if !(pr.MVA > 0) || !(pr.ZPct > 0) || !(pr.RPct >= 0) || !(pr.RPct < pr.ZPct) {
			return fmt.Errorf("transformer %q: pair %s needs mva > 0 and 0 ≤ r_pct < z_pct", t.Name, PairName(p))
		}
		if pr.Z0Pct != 0 && (!(pr.Z0Pct > 0) || !(pr.R0Pct >= 0) || !(pr.R0Pct < pr.Z0Pct)) {
			return fmt.Errorf("transformer %q: pair %s needs 0 ≤ r0_pct < z0_pct", t.Name, PairName(p))
		}
	}
	return nil
}

// checkInternal reports an internal bus that is not the star point of
// exactly one three-winding transformer, or that another element uses.
func (n *Network) checkInternal() error {
	owner := make(map[int]int)
	for i := range n.Transformers3 {
		s := n.Transformers3[i].StarBus
		if _, dup := owner[s]; dup {
			return fmt.Errorf("transformer %q: shares its star point with another transformer", n.Transformers3[i].Name)
		}
		owner[s] = i
	}
	for i, b := range n.Buses {
		if _, ok := owner[i]; b.Internal && !ok {
			return fmt.Errorf("bus %q is internal but no three-winding transformer has it as its star point", b.Name)
		}
	}
	uses := func(kind, name string, bus int) error {
		if bus >= 0 && bus < len(n.Buses) && n.Buses[bus].Internal {
			return fmt.Errorf("%s %q: connected to the internal node %q", kind, name, n.Buses[bus].Name)
		}
		return nil
	}
	var err error
	for _, s := range n.Sources {
		err = firstErr(err, uses("source", s.Name, s.Bus))
	}
	for _, g := range n.Generators {
		err = firstErr(err, uses("generator", g.Name, g.Bus))
	}
	for _, m := range n.Motors {
		err = firstErr(err, uses("motor", m.Name, m.Bus))
	}
	for _, e := range n.Earthings {
		err = firstErr(err, uses("earthing", e.Name, e.Bus))
	}
	for _, l := range n.Lines {
		err = firstErr(err, uses("line", l.Name, l.From), uses("line", l.Name, l.To))
	}
	for _, t := range n.Transformers {
		err = firstErr(err, uses("transformer", t.Name, t.From), uses("transformer", t.Name, t.To))
	}
	return err
}

// firstErr returns the first non-nil error.
func firstErr(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}
