package coord

import "tripgrade/faults"

// islands answers, without solving, whether opening one branch end cuts a
// fault off from every infeed: the question a fault fed from one side
// asks when the device on that side opens. A branch whose removal splits
// the network is a bridge (found by the lowest-reachable-discovery-time
// test of Tarjan, "Depth-first search and linear graph algorithms", SIAM
// J. Comput. 1(2), 1972, over branches, so parallel branches are never
// bridges); each bus knows how many infeeds lie below it in the search
// tree, per case, so either side of a bridge is counted at once.
type islands struct {
	n          *faults.Network
	adj        [][]int
	tin, tout  []int
	root       []int    // the search tree's root of each bus's component
	bridge     []bool   // per branch
	child      []int    // per bridge: its end below the other in the search tree
	below      [2][]int // per case, per bus: infeeds in its search subtree
	components int
}

func newIslands(n *faults.Network, adj [][]int) *islands {
	nb := len(n.Buses)
	is := &islands{n: n, adj: adj, tin: make([]int, nb), tout: make([]int, nb), root: make([]int, nb),
		bridge: make([]bool, n.BranchCount()), child: make([]int, n.BranchCount())}
	var here [2][]int
	for cs := range here {
		here[cs] = make([]int, nb)
		is.below[cs] = make([]int, nb)
	}
	for _, s := range n.Sources {
		here[faults.Max][s.Bus]++
		here[faults.Min][s.Bus]++
	}
	for _, g := range n.Generators {
		if g.InMax {
			here[faults.Max][g.Bus]++
		}
		if g.InMin {
			here[faults.Min][g.Bus]++
		}
	}
	for _, m := range n.Motors {
		here[faults.Max][m.Bus]++ // motors feed faults in the maximum case only
	}
	for i := range is.tin {
		is.tin[i] = -1
	}
	low := make([]int, nb)
	type frame struct{ bus, via, next int }
	clock := 0
	for r := 0; r < nb; r++ {
		if is.tin[r] >= 0 {
			continue
		}
		is.components++
		stack := []frame{{bus: r, via: -1}}
		is.tin[r], low[r], is.root[r] = clock, clock, r
		clock++
		for len(stack) > 0 {
			f := &stack[len(stack)-1]
			v := f.bus
			if f.next < len(adj[v]) {
				b := adj[v][f.next]
				f.next++
				if b == f.via {
					continue
				}
				w := farBus(n, b, v)
				if is.tin[w] < 0 {
					is.tin[w], low[w], is.root[w] = clock, clock, r
					clock++
					stack = append(stack, frame{bus: w, via: b})
				} else {
					low[v] = min(low[v], is.tin[w])
				}
				continue
			}
			is.tout[v] = clock - 1
			for cs := range here {
				is.below[cs][v] += here[cs][v]
			}
			stack = stack[:len(stack)-1]
			if len(stack) > 0 {
				p := stack[len(stack)-1].bus
				low[p] = min(low[p], low[v])
				for cs := range here {
					is.below[cs][p] += is.below[cs][v]
				}
				if low[v] > is.tin[p] {
					is.bridge[f.via], is.child[f.via] = true, v
				}
			}
		}
	}
	return is
}

// under reports whether bus k lies in the search subtree of bus v.
func (is *islands) under(k, v int) bool { return is.tin[v] <= is.tin[k] && is.tin[k] <= is.tout[v] }

// fedAfter reports whether the fault at pl is still connected to an infeed
// of case cs once branch end pt opens.
func (is *islands) fedAfter(pt faults.Point, pl faults.Place, cs faults.Case) bool {
	b := pt.Branch
	var at []int // the buses the fault stays attached to
	switch {
	case pl.IsBus():
		at = []int{pl.Bus}
	case pl.Branch == b:
		// On the opened branch: it stays attached to the far end only.
		f, t := is.n.BranchEnds(b)
		if pt.End == faults.From {
			at = []int{t}
		} else {
			at = []int{f}
		}
	default:
		f, t := is.n.BranchEnds(pl.Branch)
		at = []int{f, t}
	}
	for _, k := range at {
		total := is.below[cs][is.root[k]]
		if !is.bridge[b] {
			if total > 0 {
				return true
			}
			continue
		}
		c := is.child[b]
		if is.root[c] != is.root[k] {
			if total > 0 {
				return true
			}
			continue
		}
		side := total - is.below[cs][c]
		if is.under(k, c) {
			side = is.below[cs][c]
		}
		if side > 0 {
			return true
		}
	}
	return false
}
