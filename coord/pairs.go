package coord

import "sort"

// derivePairs gives every device's backup pairs from the zones (a device
// backs up the next devices at its zone's far end), then applies the
// study's own additions and exclusions.
func derivePairs(s *Study, t *Topology) (pairs, excluded []Pair) {
	index := map[string]int{}
	for i, d := range s.Devices {
		index[d.Name] = i
	}
	type key struct{ u, d int }
	drop := map[key]bool{}
	for _, r := range s.Pairs {
		if r.Exclude {
			drop[key{index[r.Upstream], index[r.Downstream]}] = true
		}
	}
	have := map[key]bool{}
	for u, z := range t.Zones {
		for _, d := range z.Next {
			k := key{u, d}
			if drop[k] {
				excluded = append(excluded, Pair{Upstream: u, Downstream: d})
				continue
			}
			have[k] = true
			pairs = append(pairs, Pair{Upstream: u, Downstream: d})
		}
	}
	for _, r := range s.Pairs {
		k := key{index[r.Upstream], index[r.Downstream]}
		if !r.Exclude && !have[k] {
			have[k] = true
			pairs = append(pairs, Pair{Upstream: k.u, Downstream: k.d, Manual: true})
		}
	}
	order := func(p []Pair) {
		sort.SliceStable(p, func(i, j int) bool {
			if p[i].Upstream != p[j].Upstream {
				return p[i].Upstream < p[j].Upstream
			}
			return p[i].Downstream < p[j].Downstream
		})
	}
	order(pairs)
	order(excluded)
	return pairs, excluded
}
