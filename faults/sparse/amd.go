package sparse

import "math"

// The ordering is approximate minimum degree on a quotient graph, after
// Amestoy, Davis & Duff, "An approximate minimum degree ordering
// algorithm", SIAM J. Matrix Anal. Appl. 17(4), 1996, with the quotient
// graph of George & Liu, "Computer Solution of Large Sparse Positive
// Definite Systems", 1981, and the minimum degree idea of Tinney & Walker,
// "Direct solutions of sparse network equations by optimally ordered
// triangular factorization", Proc. IEEE 55(11), 1967.
//
// Eliminated nodes become elements: an element e stands for the clique on
// its variables Lₑ, so fill is never stored. Each variable i keeps, in one
// list that only ever shrinks, its adjacent elements Eᵢ followed by its
// adjacent variables Aᵢ. Degrees are the paper's approximate degrees, an
// upper bound on the true degree that is exact on trees. Element absorption
// and the paper's aggressive absorption keep the lists short.
// Supervariables (indistinguishable nodes) are not detected: on power
// networks the cliques of the filled graph stay small, so merging saves
// little, and without it every degree is that of a single node and the
// predicted fill Σ|Lₚ| equals nnz(L) exactly.

const (
	isVariable = iota
	isElement
	isAbsorbed // an element merged into a later one
	isDense    // left out of the graph and ordered last
)

// quotientGraph is the state of the elimination.
type quotientGraph struct {
	// Offsets rather than slices keep the graph free of pointers, which
	// the garbage collector would otherwise scan.
	store    []int32 // variable i: store[adjStart[i]:][:adjLen[i]] is Eᵢ then Aᵢ
	adjStart []int
	adjLen   []int32
	nelem    []int32 // |Eᵢ|, at the front of i's list
	arena    []int32 // element e: arena[memStart[e]:][:memLen[e]] is Lₑ
	memStart []int
	memLen   []int32
	state    []uint8
	left     int32 // variables not yet eliminated

	deg              []int32
	ndense           []int32 // edges to dense nodes, counted in the degree
	head, next, prev []int32 // degree buckets, doubly linked
	mindeg           int32

	mark  []int32 // mark[i] == stamp: i is in the current Lₚ
	stamp int32
	wmark []int32 // wmark[e] == stamp: w[e] = |Lₑ \ Lₚ| is current
	w     []int32
}

// denseDegree is the degree above which a node is left out of the graph and
// ordered last, as AMD does, so that a hub of degree d does not cost d²
// in list pruning. AMD's own threshold is 10√n; ours is at least 1000,
// far above any bus of a power network, because a hub ordered last can
// cost fill that minimum degree would have avoided (two hubs joined by a
// path in a tree, say). A node's edges to dense nodes still count in its
// degree, so one hub in a tree costs no fill.
func denseDegree(n int) int {
	return int(math.Max(1000, 10*math.Sqrt(float64(n))))
}

// minimumDegree returns perm, where perm[k] is the original index of the
// k-th node eliminated, for the pattern of a (the diagonal is ignored).
func minimumDegree(a *csc) []int32 {
	g := newQuotientGraph(a)
	perm := make([]int32, 0, a.n)
	for g.left > 0 {
		p := g.popMin()
		perm = append(perm, p)
		g.eliminate(p)
	}
	for i := 0; i < a.n; i++ {
		if g.state[i] == isDense {
			perm = append(perm, int32(i))
		}
	}
	return perm
}

// newQuotientGraph returns the graph of a before any elimination, every
// non-dense node a variable linked into the bucket of its degree.
func newQuotientGraph(a *csc) *quotientGraph {
	n := a.n
	g := &quotientGraph{
		adjStart: make([]int, n),
		adjLen:   make([]int32, n),
		nelem:    make([]int32, n),
		arena:    make([]int32, 0, len(a.rowind)/2+n),
		memStart: make([]int, n),
		memLen:   make([]int32, n),
		state:    make([]uint8, n),
		deg:      make([]int32, n),
		ndense:   make([]int32, n),
		head:     make([]int32, n),
		next:     make([]int32, n),
		prev:     make([]int32, n),
		mark:     make([]int32, n),
		wmark:    make([]int32, n),
		w:        make([]int32, n),
	}
	g.markDense(a)
	g.buildLists(a)
	for i := range g.head {
		g.head[i] = -1
	}
	g.mindeg = int32(n)
	// Linking from the top leaves the lowest index first in each bucket.
	for j := n - 1; j >= 0; j-- {
		if g.state[j] != isDense {
			g.deg[j] = g.adjLen[j] + g.ndense[j]
			g.link(int32(j))
		}
	}
	return g
}

// markDense marks the nodes of degree above denseDegree.
func (g *quotientGraph) markDense(a *csc) {
	dense := denseDegree(a.n)
	for j := 0; j < a.n; j++ {
		d := 0
		for _, i := range a.rowind[a.colptr[j]:a.colptr[j+1]] {
			if int(i) != j {
				d++
			}
		}
		if d > dense {
			g.state[j] = isDense
		}
	}
}

// buildLists gives every variable its initial list, Aᵢ without the
// diagonal and the dense nodes, and counts its edges to dense nodes.
func (g *quotientGraph) buildLists(a *csc) {
	g.store = make([]int32, 0, len(a.rowind))
	for j := 0; j < a.n; j++ {
		if g.state[j] == isDense {
			continue
		}
		start := len(g.store)
		for _, i := range a.rowind[a.colptr[j]:a.colptr[j+1]] {
			switch {
			case int(i) == j:
			case g.state[i] == isDense:
				g.ndense[j]++
			default:
				g.store = append(g.store, i)
			}
		}
		g.adjStart[j] = start
		g.adjLen[j] = int32(len(g.store) - start)
		g.left++
	}
}

// list returns variable i's list, Eᵢ then Aᵢ.
func (g *quotientGraph) list(i int32) []int32 {
	s := g.adjStart[i]
	return g.store[s : s+int(g.adjLen[i])]
}

// members returns Lₑ for element e.
func (g *quotientGraph) members(e int32) []int32 {
	s := g.memStart[e]
	return g.arena[s : s+int(g.memLen[e])]
}

// link puts variable i at the head of the bucket of its degree.
func (g *quotientGraph) link(i int32) {
	d := g.deg[i]
	g.prev[i] = -1
	g.next[i] = g.head[d]
	if h := g.head[d]; h >= 0 {
		g.prev[h] = i
	}
	g.head[d] = i
	if d < g.mindeg {
		g.mindeg = d
	}
}

// unlink takes variable i out of its bucket.
func (g *quotientGraph) unlink(i int32) {
	if p := g.prev[i]; p >= 0 {
		g.next[p] = g.next[i]
	} else {
		g.head[g.deg[i]] = g.next[i]
	}
	if q := g.next[i]; q >= 0 {
		g.prev[q] = g.prev[i]
	}
}

// popMin removes and returns a variable of least approximate degree.
func (g *quotientGraph) popMin() int32 {
	for g.head[g.mindeg] < 0 {
		g.mindeg++
	}
	p := g.head[g.mindeg]
	g.unlink(p)
	return p
}

// eliminate turns variable p into an element and updates its neighbours.
func (g *quotientGraph) eliminate(p int32) {
	g.state[p] = isElement
	g.left--
	g.stamp++
	lp := g.gatherPivotSet(p)
	g.adjLen[p] = 0
	for _, i := range lp {
		g.unlink(i)
	}
	g.outsideCounts(lp)
	for _, i := range lp {
		g.prune(i, p, int32(len(lp)))
		g.link(i)
	}
}

// gatherPivotSet forms Lₚ = (Aₚ ∪ ⋃_{e∈Eₚ} Lₑ) \ {p}, marks its members and
// absorbs every element of Eₚ into p.
func (g *quotientGraph) gatherPivotSet(p int32) []int32 {
	st := g.stamp
	g.mark[p] = st
	start := len(g.arena)
	ne := g.nelem[p]
	list := g.list(p)
	for _, e := range list[:ne] {
		if g.state[e] != isElement {
			continue
		}
		for _, i := range g.members(e) { // a copy of the slice header: safe while arena grows
			if g.mark[i] != st {
				g.mark[i] = st
				g.arena = append(g.arena, i)
			}
		}
		g.state[e] = isAbsorbed
		g.memLen[e] = 0
	}
	for _, j := range list[ne:] {
		if g.mark[j] != st {
			g.mark[j] = st
			g.arena = append(g.arena, j)
		}
	}
	end := len(g.arena)
	g.memStart[p], g.memLen[p] = start, int32(end-start)
	return g.arena[start:end:end]
}

// outsideCounts sets w[e] = |Lₑ \ Lₚ| for every live element e adjacent to
// a member of Lₚ: start from |Lₑ| and take one off for each member of Lₚ
// that lists e (the paper's first pass).
func (g *quotientGraph) outsideCounts(lp []int32) {
	st := g.stamp
	for _, i := range lp {
		for _, e := range g.list(i)[:g.nelem[i]] {
			if g.state[e] != isElement {
				continue
			}
			if g.wmark[e] != st {
				g.wmark[e] = st
				g.w[e] = g.memLen[e]
			}
			g.w[e]--
		}
	}
}

// prune rewrites i's list as [live elements…, p, variables outside Lₚ…]
// and sets its approximate degree. An element with w[e] = 0 lies inside Lₚ
// and is absorbed (aggressive absorption). The list has room for p: i is in
// Lₚ either through p ∈ Aᵢ or through an element of Eₚ ⊆ Eᵢ, and that
// entry is dropped here.
func (g *quotientGraph) prune(i, p, nlp int32) {
	st := g.stamp
	list := g.list(i)
	ne := g.nelem[i]
	ke, ext := int32(0), int32(0)
	for _, e := range list[:ne] {
		if g.state[e] != isElement {
			continue
		}
		if g.w[e] == 0 {
			g.state[e] = isAbsorbed
			g.memLen[e] = 0
			continue
		}
		list[ke] = e
		ke++
		ext += g.w[e]
	}
	kv := ne
	for _, j := range list[ne:] {
		if g.mark[j] != st {
			list[kv] = j
			kv++
		}
	}
	nv := kv - ne
	copy(list[ke+1:], list[ne:kv])
	list[ke] = p
	g.adjLen[i] = ke + 1 + nv
	g.nelem[i] = ke + 1
	nd := g.ndense[i]
	g.deg[i] = min(g.left-1+nd, g.deg[i]+nlp-1, nv+nlp-1+ext+nd)
}
