package study

import (
	"math"

	"tripgrade/coord"
	"tripgrade/curves"
	"tripgrade/faults"
)

func (b *builder) buildLines() {
	for i, r := range b.raw.Lines {
		w := b.at("line", i, r.Name)
		ok := b.branchName(w, r.Name)
		from, okF := b.busRef(w, "from", r.From)
		to, okT := b.busRef(w, "to", r.To)
		l := faults.Line{Name: r.Name, From: from, To: to}
		if okF && okT {
			if from == to {
				b.sameBus(w, "line", r.From, r.To)
				b.badRef = true
			} else if kf, kt := b.net.Buses[from].KV, b.net.Buses[to].KV; kf > 0 && kt > 0 && kf != kt {
				b.fail(w, "to", "joins bus %q at %g kV to bus %q at %g kV; a line joins buses of one voltage (use a transformer)", r.From, kf, r.To, kt)
			}
		}
		var cable bool
		switch r.Type {
		case "overhead":
		case "cable":
			cable = true
		case "":
			b.fail(w, "type", "type is missing (overhead or cable)")
		default:
			b.fail(w, "type", "type = %q: want overhead or cable", r.Type)
		}
		if !okF || !okT || from == to {
			b.branchBad[len(b.net.Lines)] = true
		}
		l.Z1Ohm, l.Z0Ohm = b.lineImpedance(w, r)
		l.EndTempC = b.optional(w, "end_temp_c", r.EndTempC, 0, 20, 400, false)
		eq := &coord.Equipment{Cable: b.cableWithstand(w, r, cable)}
		if ok {
			b.branch[r.Name] = len(b.net.Lines)
			b.branchPaths[r.Name] = w.path
		}
		b.endNames = append(b.endNames, [2]string{r.From, r.To})
		b.net.Lines = append(b.net.Lines, l)
		b.st.Equipment = append(b.st.Equipment, eq)
	}
}

// lineImpedance reads either per-km values with a length or totals.
func (b *builder) lineImpedance(w where, r rawLine) (z1, z0 complex128) {
	perKM := r.R1OhmPerKM != nil || r.X1OhmPerKM != nil || r.R0OhmPerKM != nil || r.X0OhmPerKM != nil
	total := r.R1Ohm != nil || r.X1Ohm != nil || r.R0Ohm != nil || r.X0Ohm != nil
	switch {
	case perKM && total:
		b.fail(w, "r1_ohm", "give impedances either per km (with length_km) or as totals, not both")
	case perKM:
		length := b.positive(w, "length_km", r.LengthKM)
		z1 = b.ohms(w, "r1_ohm_per_km", "x1_ohm_per_km", r.R1OhmPerKM, r.X1OhmPerKM) * complex(length, 0)
		z0 = b.ohms(w, "r0_ohm_per_km", "x0_ohm_per_km", r.R0OhmPerKM, r.X0OhmPerKM) * complex(length, 0)
	case total:
		if r.LengthKM != nil {
			b.optional(w, "length_km", r.LengthKM, 0, 0, math.Inf(1), true)
		}
		z1 = b.ohms(w, "r1_ohm", "x1_ohm", r.R1Ohm, r.X1Ohm)
		z0 = b.ohms(w, "r0_ohm", "x0_ohm", r.R0Ohm, r.X0Ohm)
	default:
		b.fail(w, "name", "impedance is missing: give r1/x1/r0/x0_ohm_per_km with length_km, or r1/x1/r0/x0_ohm")
	}
	return z1, z0
}

// branchName checks a line or transformer name: unique among branches.
func (b *builder) branchName(w where, name string) bool {
	if b.branchSeen == nil {
		b.branchSeen = map[string]int{}
	}
	return b.named(w, name, b.branchSeen, "line or transformer")
}

func (b *builder) buildTransformers() {
	for i, r := range b.raw.Transformer {
		w := b.at("transformer", i, r.Name)
		ok := b.branchName(w, r.Name)
		from, okF := b.busRef(w, "from", r.From)
		to, okT := b.busRef(w, "to", r.To)
		t := faults.Transformer{Name: r.Name, From: from, To: to}
		if okF && okT && from == to {
			b.sameBus(w, "transformer", r.From, r.To)
			b.badRef = true
		}
		k := len(b.net.Lines) + len(b.net.Transformers)
		if !okF || !okT || from == to {
			b.branchBad[k] = true
		}
		t.MVA = b.positive(w, "mva", r.MVA)
		t.KVFrom = b.positive(w, "kv_from", r.KVFrom)
		t.KVTo = b.positive(w, "kv_to", r.KVTo)
		if okF && t.KVFrom > 0 {
			b.matchKV(w, "kv_from", t.KVFrom, from)
		}
		if okT && t.KVTo > 0 {
			b.matchKV(w, "kv_to", t.KVTo, to)
		}
		t.ZPct = b.positive(w, "z_pct", r.ZPct)
		if t.ZPct > 50 {
			b.fail(w, "z_pct", "z_pct = %g %% is not a plausible short-circuit impedance", t.ZPct)
		}
		t.XR = b.transformerXR(w, r, t.ZPct)
		t.Z0Pct = b.optional(w, "z0_pct", r.Z0Pct, 0, 0, 100, true)
		t.X0R0 = b.optional(w, "x0_r0", r.X0R0, 0, 0, math.Inf(1), true)
		t.NotCorrected = boolOr(r.NoCorrection, false)
		if r.VectorGroup == "" {
			b.fail(w, "vector_group", "vector_group is missing (e.g. Dyn11)")
		} else if g, err := faults.ParseVectorGroup(r.VectorGroup); err != nil {
			b.fail(w, "vector_group", "%v", err)
		} else {
			t.Group = g
			t.NeutralFrom, t.NeutralTo = b.neutrals(w, r, g)
		}
		if ok {
			b.branch[r.Name] = k
			b.branchPaths[r.Name] = w.path
		}
		b.endNames = append(b.endNames, [2]string{r.From, r.To})
		b.net.Transformers = append(b.net.Transformers, t)
		b.st.Equipment = append(b.st.Equipment, b.transformerEquipment(w, r, t))
	}
}

// neutrals reads the neutral earthing of each side; it is only meaningful
// on a YN winding.
func (b *builder) neutrals(w where, r rawTransformer, g faults.VectorGroup) (from, to faults.Neutral) {
	fromHV := true
	if r.KVFrom != nil && r.KVTo != nil && *r.KVFrom < *r.KVTo {
		fromHV = false
	}
	wFrom, wTo := g.HV, g.LV
	if !fromHV {
		wFrom, wTo = wTo, wFrom
	}
	side := func(wd faults.Winding, rk, xk string, rp, xp *float64) faults.Neutral {
		if wd != faults.EarthedStar {
			if rp != nil || xp != nil {
				b.fail(w, rk, "%s is given but that side of a %s transformer has no earthed star point", rk, g)
			}
			return faults.Neutral{}
		}
		return faults.Neutral{ZOhm: complex(
			b.optional(w, rk, rp, 0, 0, math.Inf(1), false),
			b.optional(w, xk, xp, 0, 0, math.Inf(1), false))}
	}
	from = side(wFrom, "neutral_ohm_from", "neutral_x_ohm_from", r.NeutralOhmFrom, r.NeutralXFrom)
	to = side(wTo, "neutral_ohm_to", "neutral_x_ohm_to", r.NeutralOhmTo, r.NeutralXTo)
	return from, to
}

// transformerEquipment builds the IEEE C57.109 through-fault withstand of
// a transformer on both sides, and its rated currents.
func (b *builder) transformerEquipment(w where, r rawTransformer, t faults.Transformer) *coord.Equipment {
	eq := &coord.Equipment{}
	if !(t.MVA > 0 && t.KVFrom > 0 && t.KVTo > 0 && t.ZPct > 0 && t.ZPct <= 50) {
		return eq
	}
	eq.RatedA = [2]float64{ratedA(t.MVA, t.KVFrom), ratedA(t.MVA, t.KVTo)}
	cat, err := curves.CategoryForKVA(t.MVA * 1000)
	if r.Category != nil {
		c := *r.Category
		if c != math.Trunc(c) || c < 1 || c > 4 {
			b.fail(w, "damage_category", "damage_category must be 1, 2, 3 or 4 (IEEE C57.109 category; got %g)", c)
			return eq
		}
		cat, err = curves.Category(c), nil
	}
	if err != nil {
		b.fail(w, "mva", "through-fault withstand: %v", err)
		return eq
	}
	eq.Category = cat
	for side, ia := range eq.RatedA {
		dmg, err := curves.NewThroughFault(curves.ThroughFaultSettings{
			Category:       cat,
			RatedA:         ia,
			ZPct:           t.ZPct,
			FrequentFaults: boolOr(r.FrequentFaults, true),
		})
		if err != nil {
			b.fail(w, "z_pct", "through-fault withstand: %v", err)
			return eq
		}
		eq.Damage[side] = dmg
	}
	return eq
}

// ratedA is the rated current of a three-phase winding.
func ratedA(mva, kv float64) float64 { return mva * 1000 / (math.Sqrt(3) * kv) }

// transformerXR reads a transformer's X/R, or derives it from its
// resistive part r_pct (u_Rr, from the load losses): X/R = √(z² − r²)/r.
func (b *builder) transformerXR(w where, r rawTransformer, zPct float64) float64 {
	if r.RPct == nil {
		if r.XR == nil {
			b.fail(w, "x_r", "x_r is missing (or give r_pct, the resistive part of z_pct)")
			return math.NaN()
		}
		return b.positive(w, "x_r", r.XR)
	}
	if r.XR != nil {
		b.fail(w, "r_pct", "give x_r or r_pct, not both")
		return math.NaN()
	}
	rPct := b.positive(w, "r_pct", r.RPct)
	if !(rPct < zPct) {
		if rPct > 0 && zPct > 0 {
			b.fail(w, "r_pct", "r_pct = %g %% must be less than z_pct = %g %%", rPct, zPct)
		}
		return math.NaN()
	}
	xr := math.Sqrt(zPct*zPct-rPct*rPct) / rPct
	if xr > xrLimit.max {
		b.fail(w, "r_pct", "r_pct = %g %% gives X/R = %s, beyond any real transformer (at most %s: %s)", rPct, verbatim(gText(xr)), verbatim(gText(xrLimit.max)), verbatim(xrLimit.why))
		return math.NaN()
	}
	return xr
}
