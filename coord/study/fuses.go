package study

import (
	"fmt"

	"tripgrade/coord"
	"tripgrade/curves"
)

func (b *builder) buildFuses() {
	for i, r := range b.raw.Fuses {
		w := b.at("fuse", i, r.Name)
		b.named(w, r.Name, b.deviceSeen, "relay or fuse")
		d := coord.Device{Name: r.Name, Kind: coord.Fuse}
		d.Point, _ = b.point(w, r.Branch, r.At)
		d.RatingA = b.positive(w, "rating_a", r.RatingA)
		d.EarthFaultsBy = b.declaration(w, r.EarthFaultsBy)
		d.Melt = b.table(w, "melt", r.Name+" minimum melt", r.Melt)
		d.Clear = b.table(w, "clear", r.Name+" total clearing", r.Clear)
		if d.Melt != nil && d.Clear != nil {
			b.meltBeforeClear(w, d.Melt, d.Clear)
		}
		b.st.Devices = append(b.st.Devices, d)
	}
}

// table reads a list of [current_a, time_s] points.
func (b *builder) table(w where, key, name string, pts [][2]float64) *curves.Table {
	if pts == nil {
		b.fail(w, key, "%s is missing: a list of [current_a, time_s] points", key)
		return nil
	}
	cp := make([]curves.Point, len(pts))
	for i, p := range pts {
		cp[i] = curves.Point{CurrentA: p[0], TimeS: p[1]}
	}
	t, err := curves.NewTable(name, cp)
	if err != nil {
		b.fail(w, key, "%s: %v", key, err)
		return nil
	}
	return t
}

// meltBeforeClear checks that the total clearing curve never lies below
// the minimum melting curve where both are defined: a fuse cannot clear
// before it melts.
func (b *builder) meltBeforeClear(w where, melt, clear *curves.Table) {
	for _, p := range clear.Points() {
		if tm, st := melt.Time(p.CurrentA); st == curves.Operates && p.TimeS < tm {
			b.fail(w, "clear", "total clearing time %g s at %g A is below the minimum melting time %g s", p.TimeS, p.CurrentA, tm)
			return
		}
	}
}

// isFuse reports whether the device of that name is a fuse.
func (b *builder) isFuse(name string) bool {
	for _, d := range b.st.Devices {
		if d.Name == name {
			return d.Kind == coord.Fuse
		}
	}
	return false
}

func (b *builder) buildPairs() {
	for i, r := range b.raw.Pairs {
		w := where{path: fmt.Sprintf("pair[%d]", b.orig("pair", i)), element: fmt.Sprintf("pair %d", b.orig("pair", i)+1)}
		ok := true
		for _, k := range []struct{ key, name string }{{"upstream", r.Upstream}, {"downstream", r.Downstream}} {
			if k.name == "" {
				b.fail(w, k.key, "%s is missing (a relay or fuse name)", k.key)
				ok = false
			} else if _, found := b.deviceSeen[k.name]; !found {
				if !b.unread("relay", "fuse") {
					b.fail(w, k.key, "%s = %q: no relay or fuse of that name%s", k.key, k.name, b.closest(k.name, b.deviceSeen))
				}
				ok = false
			}
		}
		if ok && r.Upstream == r.Downstream {
			b.fail(w, "downstream", "a device cannot back itself up")
			ok = false
		}
		rule := coord.PairRule{Upstream: r.Upstream, Downstream: r.Downstream, Exclude: boolOr(r.Exclude, false)}
		rule.MarginS = b.optional(w, "margin_s", r.MarginS, 0, 0, 5, true)
		switch {
		case r.MarginS == nil:
		case rule.Exclude:
			b.fail(w, "margin_s", "an excluded pair is not graded, so it takes no margin_s")
			ok = false
		case ok && b.isFuse(r.Upstream):
			b.fail(w, "margin_s", "upstream %q is a fuse: a fuse over another device is graded by the criteria's fuse_melt_ratio, not by a margin", r.Upstream)
			ok = false
		}
		if ok {
			b.st.Pairs = append(b.st.Pairs, rule)
		}
	}
}
