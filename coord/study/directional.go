package study

import (
	"fmt"
	"math"

	"tripgrade/coord"
	"tripgrade/faults"
)

// direction reads a stage's tripping direction.
func (b *builder) direction(w where, s string) coord.Direction {
	switch s {
	case "", "non-directional":
		return coord.NonDirectional
	case "forward":
		return coord.Forward
	case "reverse":
		return coord.Reverse
	}
	b.fail(w, "direction", "direction = %q: want forward (current from the relay's bus into its branch), reverse or non-directional", s)
	return coord.NonDirectional
}

// directional reads a relay's directional element settings and its
// neutral CT, after its stages.
func (b *builder) directional(w where, r rawRelay, d *coord.Device) {
	kv := 0.0
	if d.Point.Branch < b.net.BranchCount() {
		f, t := b.net.BranchEnds(d.Point.Branch)
		bus := f
		if d.Point.End == faults.To {
			bus = t
		}
		if bus >= 0 && bus < len(b.net.Buses) {
			kv = b.net.Buses[bus].KV
		}
	}
	dir := coord.DefaultDirectional(kv)
	dir.PhaseAngleDeg = b.optional(w, "phase_angle_deg", r.PhaseAngleDeg, dir.PhaseAngleDeg, -180, 180, false)
	dir.SectorDeg = b.optional(w, "sector_deg", r.SectorDeg, dir.SectorDeg, 0, 90, true)
	phasePct := b.optional(w, "phase_min_polarising_pct", r.PhaseMinPct, coord.DefaultPhaseMinPct, 0, 100, false)
	groundPct := b.optional(w, "ground_min_polarising_pct", r.GroundMinPct, coord.DefaultGroundMinPct, 0, 300, false)
	dir.PhaseMinV = phasePct / 100 * kv * 1000
	dir.GroundMinV = groundPct / 100 * kv * 1000 / math.Sqrt(3)
	dir.NoMemory = !boolOr(r.VoltageMemory, true)
	switch r.GroundPolarising {
	case "", "voltage":
		if r.PolarisingBranch != "" || r.PolarisingAt != "" || r.PolarisingMinA != nil {
			b.fail(w, "polarising_branch", "polarising_branch, polarising_at and polarising_min_a are for ground_polarising = \"current\"")
		}
	case "current":
		dir.ByCurrent = true
		dir.GroundAngleDeg = 0
		if pt, ok := b.starEnd(w, "polarising_branch", "polarising_at", r.PolarisingBranch, r.PolarisingAt); ok {
			dir.PolarisingPoint = pt
		}
		dir.PolarisingMinA = b.optional(w, "polarising_min_a", r.PolarisingMinA, 0.05*d.CT.PrimaryA, 0, math.Inf(1), false)
	default:
		b.fail(w, "ground_polarising", "ground_polarising = %q: want voltage (−3V0) or current (a transformer's neutral current)", r.GroundPolarising)
	}
	dir.GroundAngleDeg = b.optional(w, "ground_angle_deg", r.GroundAngleDeg, dir.GroundAngleDeg, -180, 180, false)
	d.Dir = dir
	if r.NeutralCT != "" {
		if pt, ok := b.starEnd(w, "neutral_ct", "neutral_ct_at", r.NeutralCT, r.NeutralCTAt); ok {
			d.NeutralCT = &pt
		}
		for _, st := range d.Stages {
			if st.Measures == coord.Residual && st.Direction != coord.NonDirectional {
				b.fail(w, "neutral_ct", "ground stages on a neutral CT measure the neutral current and cannot be directional")
				break
			}
		}
	} else if r.NeutralCTAt != "" {
		b.fail(w, "neutral_ct_at", "neutral_ct_at needs neutral_ct (the transformer whose neutral current the ground stages measure)")
	}
	directional := false
	for _, st := range d.Stages {
		directional = directional || st.Direction != coord.NonDirectional
	}
	if !directional && (r.PhaseAngleDeg != nil || r.GroundAngleDeg != nil || r.SectorDeg != nil || r.PhaseMinPct != nil ||
		r.GroundMinPct != nil || r.VoltageMemory != nil || r.GroundPolarising != "") {
		b.fail(w, "phase_angle_deg", "directional element settings are given but no stage has a direction (add direction = \"forward\" or \"reverse\" to a stage)")
	}
}

// starEnd resolves a transformer and the end of its earthed star winding:
// the only such end, or the one at bus at.
func (b *builder) starEnd(w where, key, atKey, branch, at string) (faults.Point, bool) {
	if branch == "" {
		b.fail(w, key, "%s is missing: the transformer whose neutral current is meant", key)
		return faults.Point{}, false
	}
	k, ok := b.branch[branch]
	if !ok {
		b.fail(w, key, "%s = %q: no transformer of that name%s", key, branch, b.closest(branch, b.branch))
		return faults.Point{}, false
	}
	if !b.net.IsTransformer(k) || b.branchBad[k] {
		if !b.branchBad[k] {
			b.fail(w, key, "%s = %q is a line; a neutral current belongs to a transformer", key, branch)
		}
		return faults.Point{}, false
	}
	t := b.net.Transformer(k)
	hvFrom := t.KVFrom >= t.KVTo
	wFrom, wTo := t.Group.HV, t.Group.LV
	if !hvFrom {
		wFrom, wTo = wTo, wFrom
	}
	var ends []faults.End
	if wFrom == faults.EarthedStar {
		ends = append(ends, faults.From)
	}
	if wTo == faults.EarthedStar {
		ends = append(ends, faults.To)
	}
	name := func(e faults.End) string { return b.endNames[k][e] }
	switch {
	case len(ends) == 0:
		b.fail(w, key, "%s = %q: a %s transformer has no earthed star point", key, branch, t.Group)
	case at != "":
		for _, e := range ends {
			if name(e) == at {
				return faults.Point{Branch: k, End: e}, true
			}
		}
		b.fail(w, atKey, "%s = %q is not the earthed star side of %q (%s)", atKey, at, branch, describeEnds(ends, name))
	case len(ends) == 2:
		b.fail(w, atKey, "both windings of %q are earthed stars: give %s (%q or %q)", branch, atKey, name(faults.From), name(faults.To))
	default:
		return faults.Point{Branch: k, End: ends[0]}, true
	}
	return faults.Point{}, false
}

func describeEnds(ends []faults.End, name func(faults.End) string) string {
	if len(ends) == 1 {
		return fmt.Sprintf("its star side is %q", name(ends[0]))
	}
	return fmt.Sprintf("%q or %q", name(ends[0]), name(ends[1]))
}

// ownProtection collects the sources and generators whose own protection
// the study declares: a grid equivalent has the supply's protection
// unless the study says own_protection = false; a generator only when
// the study says so.
func (b *builder) ownProtection() {
	for _, r := range b.raw.Sources {
		if boolOr(r.OwnProt, true) {
			b.st.OwnProtection = append(b.st.OwnProtection, r.Name)
		}
	}
	for _, r := range b.raw.Generators {
		if boolOr(r.OwnProt, false) {
			b.st.OwnProtection = append(b.st.OwnProtection, r.Name)
		}
	}
}
