package study

import (
	"math"

	"tripgrade/faults"
)

// windingKeys are the key suffixes of a three-winding transformer's
// windings and pairs, in the engine's order.
var (
	windingKeys = [3]string{faults.HV: "hv", faults.MV: "mv", faults.LV: "lv"}
	pairKeys    = [3]string{faults.HVMV: "hv_mv", faults.HVLV: "hv_lv", faults.MVLV: "mv_lv"}
)

// starRef names the three-winding transformer and winding of a star
// branch, for messages.
type starRef struct{ unit, winding string }

// buildTransformers3 reads the three-winding transformers. Each becomes
// three star branches after the two-winding transformers, and an internal
// star-point bus; devices name the transformer and the bus of the winding
// they sit on.
func (b *builder) buildTransformers3() {
	for i, r := range b.raw.Transf3 {
		w := b.at("transformer3", i, r.Name)
		named := b.branchName(w, r.Name)
		t := faults.Transformer3{Name: r.Name}
		buses := [3]string{r.HV, r.MV, r.LV}
		kvs := [3]*float64{r.KVHV, r.KVMV, r.KVLV}
		good := true
		for wd, key := range windingKeys {
			bus, ok := b.busRef(w, key, buses[wd])
			t.Buses[wd] = bus
			t.KV[wd] = b.positive(w, "kv_"+key, kvs[wd])
			if ok && t.KV[wd] > 0 {
				b.matchKV(w, "kv_"+key, t.KV[wd], bus)
			}
			good = good && ok
		}
		if good && (t.Buses[0] == t.Buses[1] || t.Buses[0] == t.Buses[2] || t.Buses[1] == t.Buses[2]) {
			b.fail(w, "lv", "two windings on the same bus: hv, mv and lv must be three different buses")
			b.badRef, good = true, false
		}
		if t.KV[faults.MV] > t.KV[faults.HV] || t.KV[faults.LV] > t.KV[faults.MV] {
			b.fail(w, "kv_hv", "give the windings from the highest rated voltage down: kv_hv ≥ kv_mv ≥ kv_lv (got %g, %g, %g kV)",
				t.KV[faults.HV], t.KV[faults.MV], t.KV[faults.LV])
		}
		t.Pairs = b.windingPairs(w, r)
		t.NotCorrected = boolOr(r.NoCorrection, false)
		if r.VectorGroup == "" {
			b.fail(w, "vector_group", "vector_group is missing (e.g. YNyn0d5)")
		} else if g, err := faults.ParseVectorGroup3(r.VectorGroup); err != nil {
			b.fail(w, "vector_group", "%v", err)
		} else {
			t.Group = g
			t.Neutral = b.neutrals3(w, r, g)
		}
		k := b.net.AddTransformer3(t)
		b.windingNames = append(b.windingNames, buses)
		for wd := range windingKeys {
			br := b.net.StarBranch(k, wd)
			if !good {
				b.branchBad[br] = true
			}
			b.st.Equipment = append(b.st.Equipment, nil)
			b.starPath[b.net.BranchName(br)] = w.path
			b.starOf[b.net.BranchName(br)] = starRef{unit: r.Name, winding: faults.WindingName(wd)}
		}
		if named {
			b.unit3[r.Name] = k
		}
	}
}

// windingPairs reads the short-circuit test of each winding pair:
// mva_*, z_*_pct and r_*_pct, and optionally z0_*_pct with r0_*_pct.
func (b *builder) windingPairs(w where, r rawTransf3) [3]faults.WindingPair {
	mva := [3]*float64{r.MVAHVMV, r.MVAHVLV, r.MVAMVLV}
	z := [3]*float64{r.ZHVMV, r.ZHVLV, r.ZMVLV}
	rr := [3]*float64{r.RHVMV, r.RHVLV, r.RMVLV}
	z0 := [3]*float64{r.Z0HVMV, r.Z0HVLV, r.Z0MVLV}
	r0 := [3]*float64{r.R0HVMV, r.R0HVLV, r.R0MVLV}
	var out [3]faults.WindingPair
	for p, key := range pairKeys {
		pr := &out[p]
		pr.MVA = b.positive(w, "mva_"+key, mva[p])
		zk, rk := "z_"+key+"_pct", "r_"+key+"_pct"
		pr.ZPct = b.positive(w, zk, z[p])
		if pr.ZPct > 50 {
			b.fail(w, zk, "%s = %g %% is not a plausible short-circuit impedance", zk, pr.ZPct)
		}
		if rr[p] == nil {
			b.fail(w, rk, "%s is missing (the resistive part u_Rr of the pair's impedance, from its load losses)", rk)
		}
		pr.RPct = b.optional(w, rk, rr[p], 0, 0, math.Inf(1), false)
		if pr.RPct >= pr.ZPct {
			b.fail(w, rk, "%s = %g %% must be less than %s = %g %%", rk, pr.RPct, zk, pr.ZPct)
		}
		z0k, r0k := "z0_"+key+"_pct", "r0_"+key+"_pct"
		if z0[p] == nil {
			if r0[p] != nil {
				b.fail(w, r0k, "%s needs %s too", r0k, z0k)
			}
			continue
		}
		pr.Z0Pct = b.positive(w, z0k, z0[p])
		// Without r0, the zero sequence keeps the positive sequence's R/Z.
		pr.R0Pct = b.optional(w, r0k, r0[p], pr.Z0Pct*pr.RPct/pr.ZPct, 0, math.Inf(1), false)
		if pr.R0Pct >= pr.Z0Pct {
			b.fail(w, r0k, "%s = %g %% must be less than %s = %g %%", r0k, pr.R0Pct, z0k, pr.Z0Pct)
		}
	}
	return out
}

// neutrals3 reads the neutral earthing of each winding; it is only
// meaningful on a YN winding.
func (b *builder) neutrals3(w where, r rawTransf3, g faults.VectorGroup3) [3]faults.Neutral {
	rs := [3]*float64{r.NeutralOhmHV, r.NeutralOhmMV, r.NeutralOhmLV}
	xs := [3]*float64{r.NeutralXHV, r.NeutralXMV, r.NeutralXLV}
	var out [3]faults.Neutral
	for wd, key := range windingKeys {
		rk, xk := "neutral_ohm_"+key, "neutral_x_ohm_"+key
		if g.W[wd] != faults.EarthedStar {
			if rs[wd] != nil || xs[wd] != nil {
				b.fail(w, rk, "%s is given but the %s winding of a %s transformer has no earthed star point", rk, faults.WindingName(wd), g)
			}
			continue
		}
		out[wd] = faults.Neutral{ZOhm: complex(
			b.optional(w, rk, rs[wd], 0, 0, math.Inf(1), false),
			b.optional(w, xk, xs[wd], 0, 0, math.Inf(1), false))}
	}
	return out
}

// point3 resolves a device on a three-winding transformer: the winding
// whose terminal is at bus at.
func (b *builder) point3(w where, name, at string, k int) (faults.Point, bool) {
	names := b.windingNames[k]
	if at == "" {
		b.fail(w, "at", "at is missing: the bus of the winding the device sits on (%q, %q or %q)", names[0], names[1], names[2])
		return faults.Point{}, false
	}
	for wd := range names {
		if names[wd] == at {
			br := b.net.StarBranch(k, wd)
			if b.branchBad[br] {
				return faults.Point{}, false // its buses are reported with the transformer
			}
			return faults.Point{Branch: br, End: faults.From}, true
		}
	}
	b.fail(w, "at", "at = %q is not a terminal of %q (its windings are on %q, %q and %q)", at, name, names[0], names[1], names[2])
	return faults.Point{}, false
}
