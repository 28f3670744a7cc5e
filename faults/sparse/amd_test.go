package sparse

import (
	"math/rand/v2"
	"testing"
)

// patternOf assembles the pattern of a network on the edges (values do not
// matter to the ordering).
func patternOf(n int, es []edge) *csc {
	b := NewBuilder(n)
	for i := 0; i < n; i++ {
		b.Add(i, i, 1)
	}
	for _, e := range es {
		b.Add(e.i, e.j, -1)
	}
	return b.assemble()
}

// fillIn returns nnz(L) strictly below the diagonal when a is factored in
// the order perm.
func fillIn(a *csc, perm []int32) int {
	pinv := make([]int32, a.n)
	for k, i := range perm {
		pinv[i] = int32(k)
	}
	_, count := etree(permuteUpper(a, pinv))
	nnz := 0
	for _, c := range count {
		nnz += int(c)
	}
	return nnz
}

func natural(n int) []int32 {
	p := make([]int32, n)
	for i := range p {
		p[i] = int32(i)
	}
	return p
}

func TestOrderingIsPermutation(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(7, 7))
			perm := minimumDegree(patternOf(tc.n, tc.edges(rng)))
			seen := make([]bool, tc.n)
			for _, i := range perm {
				if i < 0 || int(i) >= tc.n || seen[i] {
					t.Fatalf("perm %v is not a permutation of [0, %d)", perm, tc.n)
				}
				seen[i] = true
			}
			if len(perm) != tc.n {
				t.Fatalf("len(perm) = %d, want %d", len(perm), tc.n)
			}
		})
	}
}

// A forest factors without fill in a minimum degree order, whatever its
// labelling: a leaf always has the least degree, and eliminating a leaf
// joins nothing. So nnz(L) equals the number of branches, n − components.
func TestTreeHasNoFill(t *testing.T) {
	tests := []struct {
		name  string
		n     int
		edges func(rng *rand.Rand) []edge
	}{
		{"path-2000", 2000, func(*rand.Rand) []edge { return pathEdges(2000) }},
		{"path-2000-shuffled", 2000, func(r *rand.Rand) []edge { return relabel(pathEdges(2000), 2000, r) }},
		{"star-500-shuffled", 500, func(r *rand.Rand) []edge { return relabel(starEdges(500), 500, r) }},
		{"random-tree-1", 1, func(r *rand.Rand) []edge { return nil }},
		{"random-tree-300", 300, func(r *rand.Rand) []edge { return relabel(treeEdges(300, r), 300, r) }},
		{"random-tree-5000", 5000, func(r *rand.Rand) []edge { return relabel(treeEdges(5000, r), 5000, r) }},
		// The hub's degree is past denseDegree, so it is ordered last.
		{"hub-tree-4000", 4000, func(r *rand.Rand) []edge { return relabel(hubTreeEdges(4000, 1500, r), 4000, r) }},
		{"forest-isolated", 900, func(r *rand.Rand) []edge { return relabel(treeEdges(600, r), 900, r) }},
	}
	for _, tt := range tests {
		for seed := uint64(0); seed < 3; seed++ {
			rng := rand.New(rand.NewPCG(seed, 11))
			es := tt.edges(rng)
			a := patternOf(tt.n, es)
			got := fillIn(a, minimumDegree(a))
			if got > tt.n-1 || got != len(es) {
				t.Errorf("%s seed %d: nnz(L) = %d, want %d branches (≤ n−1 = %d)", tt.name, seed, got, len(es), tt.n-1)
			}
		}
	}
}

func TestOrderingReducesFill(t *testing.T) {
	const rows, cols = 40, 40
	n := rows * cols
	rng := rand.New(rand.NewPCG(13, 13))
	grid := patternOf(n, gridEdges(rows, cols))
	banded := fillIn(grid, natural(n)) // the row-by-row order: a band of width 40
	tests := []struct {
		name string
		a    *csc
		// most is the largest acceptable ratio nnz(L, minimum degree) /
		// nnz(L, natural order).
		most float64
	}{
		// A grid in random labels: the natural order fills most of L.
		{"shuffled-grid", patternOf(n, relabel(gridEdges(rows, cols), n, rng)), 0.15},
		{"shuffled-tree", patternOf(n, relabel(treeEdges(n, rng), n, rng)), 0.1},
		{"shuffled-mesh", patternOf(n, relabel(meshEdges(n, n/10, rng), n, rng)), 0.5},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			md, nat := fillIn(tt.a, minimumDegree(tt.a)), fillIn(tt.a, natural(n))
			t.Logf("nnz(L): minimum degree %d, natural %d", md, nat)
			if float64(md) > tt.most*float64(nat) {
				t.Errorf("nnz(L) = %d in minimum degree order, want ≤ %.2f × %d (natural order)", md, tt.most, nat)
			}
		})
	}
	// On the unshuffled grid the band order is a fair opponent; minimum
	// degree should still beat it.
	if md := fillIn(grid, minimumDegree(grid)); md >= banded {
		t.Errorf("grid %d×%d: nnz(L) = %d in minimum degree order, want < %d (band order)", rows, cols, md, banded)
	}
}

// The factor's column counts must be those the ordering predicted: without
// supervariables, |Lₚ| at p's elimination is exactly column p of L.
func TestPredictedFillMatchesSymbolic(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(17, 17))
			a := patternOf(tc.n, tc.edges(rng))
			g := newQuotientGraph(a)
			predicted := 0
			var perm []int32
			for g.left > 0 {
				p := g.popMin()
				perm = append(perm, p)
				g.eliminate(p)
				predicted += len(g.members(p))
			}
			if len(perm) != tc.n {
				t.Fatalf("%d nodes left out of the graph as dense", tc.n-len(perm))
			}
			if got := fillIn(a, perm); got != predicted {
				t.Errorf("nnz(L) = %d, ordering predicted Σ|Lₚ| = %d", got, predicted)
			}
		})
	}
}
