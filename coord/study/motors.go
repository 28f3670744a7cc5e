package study

import (
	"fmt"
	"math"

	"tripgrade/faults"
)

// buildMotors reads the asynchronous motors and groups of identical
// motors.
func (b *builder) buildMotors() {
	seen := map[string]int{}
	for i, r := range b.raw.Motors {
		w := where{path: fmt.Sprintf("motor[%d]", i), element: fmt.Sprintf("motor %q", r.Name)}
		b.named(w, r.Name, seen, "motor")
		bus, ok := b.busRef(w, "bus", r.Bus)
		m := faults.Motor{Name: r.Name, Bus: bus}
		m.MW = b.positive(w, "mw", r.MW)
		m.KV = b.positive(w, "kv", r.KV)
		if ok && m.KV > 0 {
			b.matchKV(w, "kv", m.KV, bus)
		}
		m.PF = b.positive(w, "pf", r.PF)
		if m.PF > 1 {
			b.fail(w, "pf", "pf must be ≤ 1 (got %g)", m.PF)
		}
		eff := b.positive(w, "efficiency_pct", r.EfficiencyPct)
		if eff > 100 {
			b.fail(w, "efficiency_pct", "efficiency_pct must be ≤ 100 (got %g)", eff)
		}
		m.Eff = eff / 100
		m.LockedRotor = b.positive(w, "ilr_irm", r.ILRIrM)
		if m.LockedRotor > 0 && (m.LockedRotor <= 1 || m.LockedRotor > 20) {
			b.fail(w, "ilr_irm", "ilr_irm = %g is not a plausible locked-rotor current ratio (I_LR/I_rM, typically 4 to 8)", m.LockedRotor)
		}
		m.PolePairs = b.whole(w, "pole_pairs", r.PolePairs, 0, true)
		m.RX = b.optional(w, "r_x", r.RX, 0, 0, 10, true)
		m.Count = b.whole(w, "count", r.Count, 1, false)
		b.net.Motors = append(b.net.Motors, m)
	}
}

// whole reads a positive whole number; def is used when it is not given
// and required is false.
func (b *builder) whole(w where, key string, p *float64, def int, required bool) int {
	if p == nil {
		if required {
			b.fail(w, key, "%s is missing", key)
		}
		return def
	}
	v := *p
	if v != math.Trunc(v) || v < 1 || v > 1e6 {
		b.fail(w, key, "%s must be a whole number ≥ 1 (got %g)", key, v)
		return def
	}
	return int(v)
}

// buildUnits joins each generator that names a unit transformer to it: a
// power station unit, corrected by K_S (with an on-load tap changer) or
// K_SO (without).
func (b *builder) buildUnits() {
	for i, r := range b.raw.Generators {
		w := b.unitRaw[i]
		g := &b.net.Generators[i]
		if r.UnitTransformer == "" {
			for _, k := range []struct {
				key   string
				given bool
			}{{"on_load_tap_changer", r.OnLoadTaps != nil}, {"tap_pct", r.TapPct != nil}, {"pg_pct", r.PGPct != nil}} {
				if k.given {
					b.fail(w, k.key, "%s belongs to a power station unit: give unit_transformer too", k.key)
				}
			}
			continue
		}
		k, ok := b.branch[r.UnitTransformer]
		nl := len(b.net.Lines)
		_, three := b.unit3[r.UnitTransformer]
		switch {
		case ok && k < nl:
			b.fail(w, "unit_transformer", "unit_transformer = %q is a line: name the generator's two-winding unit transformer", r.UnitTransformer)
			continue
		case three:
			b.fail(w, "unit_transformer", "unit_transformer = %q is a three-winding transformer: a unit transformer has two windings here", r.UnitTransformer)
			continue
		case !ok && b.unread("transformer"):
			continue // the transformer may be in the table that could not be read
		case !ok:
			names := map[string]int{}
			for i, t := range b.net.Transformers {
				names[t.Name] = i
			}
			b.fail(w, "unit_transformer", "unit_transformer = %q: no two-winding transformer of that name%s", r.UnitTransformer, b.closest(r.UnitTransformer, names))
			continue
		}
		u := &faults.StationUnit{Transformer: k - nl}
		if r.OnLoadTaps == nil {
			b.fail(w, "unit_transformer", "on_load_tap_changer is missing (true or false): it chooses between the unit's correction factors K_S and K_SO")
		} else {
			u.OnLoadTapChanger = *r.OnLoadTaps
		}
		if u.OnLoadTapChanger && (r.TapPct != nil || r.PGPct != nil) {
			b.fail(w, "tap_pct", "tap_pct and pg_pct apply only to a unit without an on-load tap changer (K_SO)")
		}
		u.TapPct = b.optional(w, "tap_pct", r.TapPct, 0, -50, 50, false)
		u.PGPct = b.optional(w, "pg_pct", r.PGPct, 0, 0, 50, false)
		t := &b.net.Transformers[u.Transformer]
		if !b.branchBad[k] {
			lv := t.To
			if t.KVFrom < t.KVTo {
				lv = t.From
			}
			if g.Bus != lv {
				b.fail(w, "unit_transformer", "the generator's bus %q is not the generator-side (lower-voltage) terminal of its unit transformer %q", r.Bus, t.Name)
				continue
			}
		}
		for j := range b.net.Generators[:i] {
			if o := b.net.Generators[j].Unit; o != nil && o.Transformer == u.Transformer {
				b.fail(w, "unit_transformer", "transformer %q is already the unit transformer of generator %q", t.Name, b.net.Generators[j].Name)
			}
		}
		g.Unit = u
	}
}
