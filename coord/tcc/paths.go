package tcc

import (
	"slices"

	"tripgrade/coord"
)

// MaxPaths caps the coordination paths of one study. A meshed network
// with many parallel sources can have combinatorially many; past this
// number the later ones are left out (their pairs are still plotted when
// they fail).
const MaxPaths = 64

// Path is a coordination path: device indices from the most downstream
// device back towards a source, each backed up by the next.
type Path []int

// Contains reports whether device i lies on the path.
func (p Path) Contains(i int) bool { return slices.Contains(p, i) }

// findPaths returns the coordination paths of a set of pairs among n
// devices. A path starts at a device that backs up nobody (it is never the
// upstream device of a pair) and follows "is backed up by" links upwards
// (upward(u, d): device u sits nearer the grid sources than device d, or
// the pair is the study's own), so that a path reads from a load towards a
// source, as a time-current chart of series devices does; a backup at the
// same bus or away from the sources (the other incomer of a busbar, the
// feeder of an embedded generator) is a pair of its own but starts no
// chain through it;
// a device with several upstream devices (parallel incomers) gives a path
// through each. A device in no pair is a path of its own, and devices left
// over by a cycle of hand-made pairs start paths of their own too. Exact
// duplicates and paths lying wholly inside a longer one are dropped.
// Paths come in study order of their first device, then of the upstream
// devices taken.
func findPaths(pairs []coord.Pair, n, max int, upward func(p coord.Pair) bool) []Path {
	ups := make([][]int, n)
	isUp := make([]bool, n)
	for _, p := range pairs {
		if p.Upstream == p.Downstream || !p.Manual && upward != nil && !upward(p) {
			continue
		}
		ups[p.Downstream] = append(ups[p.Downstream], p.Upstream)
		isUp[p.Upstream] = true
	}
	for i := range ups {
		slices.Sort(ups[i])
		ups[i] = slices.Compact(ups[i])
	}
	var out []Path
	var walk func(chain Path)
	walk = func(chain Path) {
		if len(out) >= max {
			return
		}
		last := chain[len(chain)-1]
		extended := false
		for _, u := range ups[last] {
			if chain.Contains(u) {
				continue // a cycle of hand-made pairs
			}
			extended = true
			walk(append(slices.Clone(chain), u))
		}
		if !extended {
			out = append(out, chain)
		}
	}
	covered := make([]bool, n)
	start := func(i int) {
		walk(Path{i})
		for _, p := range out {
			for _, d := range p {
				covered[d] = true
			}
		}
	}
	for i := 0; i < n; i++ {
		if !isUp[i] {
			start(i)
		}
	}
	for i := 0; i < n; i++ {
		if !covered[i] {
			start(i)
		}
	}
	return dropContained(out)
}

// dropContained removes exact duplicates and paths that are a contiguous
// run of another, longer path: everything they would show is on that
// path's chart.
func dropContained(ps []Path) []Path {
	var out []Path
	for i, p := range ps {
		keep := true
		for j, q := range ps {
			if i == j {
				continue
			}
			if len(q) > len(p) && containsRun(q, p) || len(q) == len(p) && j < i && slices.Equal(p, q) {
				keep = false
				break
			}
		}
		if keep {
			out = append(out, p)
		}
	}
	return out
}

// containsRun reports whether run appears in p as consecutive elements.
func containsRun(p, run Path) bool {
	for k := 0; k+len(run) <= len(p); k++ {
		if slices.Equal(p[k:k+len(run)], run) {
			return true
		}
	}
	return false
}

// gradingFinding returns the grading finding of a pair, or nil.
func gradingFinding(res *coord.Result, s *coord.Study, p coord.Pair) *coord.Finding {
	d, u := s.Devices[p.Downstream].Name, s.Devices[p.Upstream].Name
	for k := range res.Findings {
		f := &res.Findings[k]
		if f.Check == coord.Grading && f.Device == d && f.Other == u {
			return f
		}
	}
	return nil
}

// failingPairs returns the pairs whose grading fails, in the result's
// order.
func failingPairs(res *coord.Result, s *coord.Study) []coord.Pair {
	var out []coord.Pair
	for _, p := range res.Pairs {
		if f := gradingFinding(res, s, p); f != nil && f.Verdict == coord.Fail {
			out = append(out, p)
		}
	}
	return out
}
