package propose

import "sort"

// order lists the pickup variables in grading order: devices with
// fewer grading steps below them first (devices that grade over each
// other both ways, as in a ring, share a level), then in study order.
func (sr *search) order() []int {
	nd := len(sr.s.Devices)
	below := make([][]int, nd)
	for _, g := range sr.groups {
		if g.up >= 0 && g.up != g.down {
			below[g.up] = append(below[g.up], g.down)
		}
	}
	level := levels(below)
	out := make([]int, len(sr.pv))
	for k := range out {
		out[k] = k
	}
	sort.SliceStable(out, func(a, b int) bool {
		da, db := sr.pv[out[a]].Device, sr.pv[out[b]].Device
		if level[da] != level[db] {
			return level[da] < level[db]
		}
		return da < db
	})
	return out
}

// levels returns, per node of a graph whose edges lead from each node to
// those below it, the length of the longest path down from it, nodes on
// one cycle taken together (Tarjan's strongly connected components,
// which it finds in reverse topological order).
func levels(below [][]int) []int {
	n := len(below)
	index, low, comp := make([]int, n), make([]int, n), make([]int, n)
	onStack := make([]bool, n)
	for i := range index {
		index[i], comp[i] = -1, -1
	}
	var stack []int
	var compLevel []int
	next := 0
	var visit func(v int)
	visit = func(v int) {
		index[v], low[v] = next, next
		next++
		stack = append(stack, v)
		onStack[v] = true
		for _, w := range below[v] {
			if index[w] < 0 {
				visit(w)
				low[v] = min(low[v], low[w])
			} else if onStack[w] {
				low[v] = min(low[v], index[w])
			}
		}
		if low[v] != index[v] {
			return
		}
		// A component is complete; every component below it already has
		// its level.
		c := len(compLevel)
		var members []int
		for {
			w := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			onStack[w] = false
			comp[w] = c
			members = append(members, w)
			if w == v {
				break
			}
		}
		lv := 0
		for _, m := range members {
			for _, w := range below[m] {
				if comp[w] != c {
					lv = max(lv, compLevel[comp[w]]+1)
				}
			}
		}
		compLevel = append(compLevel, lv)
	}
	for v := 0; v < n; v++ {
		if index[v] < 0 {
			visit(v)
		}
	}
	out := make([]int, n)
	for v := range out {
		out[v] = compLevel[comp[v]]
	}
	return out
}
