package sparse

import (
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// tolDense bounds the relative difference from the dense oracle. The test
// matrices have a positive definite real part, so LDLᵀ needs no pivoting
// and its growth stays small; their condition numbers κ∞ run from 1 to
// about 5e3 (the shuffled 300-bus star), and the worst difference seen is
// 2e-13 there, about κ∞·ε/5. 1e-10 leaves a factor of 500 for other seeds
// while any wrong entry shows as an O(1) difference.
const tolDense = 1e-10

type testCase struct {
	name string
	n    int
	// edges returns the network's branches; nodes without one are isolated
	// and have only their shunt.
	edges func(rng *rand.Rand) []edge
	split bool // enter every value through several Add calls
}

var testCases = []testCase{
	{name: "single", n: 1, edges: func(*rand.Rand) []edge { return nil }},
	{name: "pair", n: 2, edges: func(*rand.Rand) []edge { return pathEdges(2) }},
	{name: "path-50", n: 50, edges: func(*rand.Rand) []edge { return pathEdges(50) }},
	{name: "path-300-shuffled", n: 300, edges: func(r *rand.Rand) []edge { return relabel(pathEdges(300), 300, r) }},
	{name: "star-40", n: 40, edges: func(*rand.Rand) []edge { return starEdges(40) }},
	{name: "star-300-shuffled", n: 300, edges: func(r *rand.Rand) []edge { return relabel(starEdges(300), 300, r) }},
	{name: "tree-200", n: 200, edges: func(r *rand.Rand) []edge { return relabel(treeEdges(200, r), 200, r) }},
	{name: "grid-12x15-shuffled", n: 180, edges: func(r *rand.Rand) []edge { return relabel(gridEdges(12, 15), 180, r) }},
	{name: "mesh-250-duplicates", n: 250, edges: func(r *rand.Rand) []edge { return meshEdges(250, 60, r) }, split: true},
	{name: "mesh-dense-30", n: 30, edges: func(r *rand.Rand) []edge { return meshEdges(30, 200, r) }, split: true},
	{name: "isolated-60", n: 60, edges: func(r *rand.Rand) []edge { return relabel(treeEdges(40, r), 60, r) }},
	{name: "forest-120", n: 120, edges: func(r *rand.Rand) []edge {
		es := treeEdges(50, r)
		for _, e := range treeEdges(70, r) {
			es = append(es, edge{e.i + 50, e.j + 50})
		}
		return relabel(es, 120, r)
	}},
}

// build returns the case's Builder, its dense copy and its Factor.
func (tc testCase) build(t testing.TB, seed uint64) (*Factor, [][]complex128) {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 1))
	b, d := network(tc.n, tc.edges(rng), tc.split, rng)
	f, err := b.Factor()
	if err != nil {
		t.Fatalf("%s: Factor: %v", tc.name, err)
	}
	return f, d
}

// Oracle: dense Gaussian elimination with partial pivoting (newDenseLU,
// after Golub & Van Loan Alg. 3.4.1), on the same entries entered densely.
func TestSolveMatchesDense(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, d := tc.build(t, 1)
			rng := rand.New(rand.NewPCG(2, 2))
			b := make([]complex128, tc.n)
			for i := range b {
				b[i] = complex(rng.NormFloat64(), rng.NormFloat64())
			}
			want := newDenseLU(d).solve(b)
			got := append([]complex128(nil), b...)
			f.Solve(got)
			if e := relErr(got, want); e > tolDense {
				t.Errorf("Solve: relative error %.3g, want ≤ %g", e, tolDense)
			}
		})
	}
}

// Oracle: dense Gaussian elimination with partial pivoting (newDenseLU,
// after Golub & Van Loan Alg. 3.4.1), on the same entries entered densely.
func TestColumnMatchesDense(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, d := tc.build(t, 3)
			inv := newDenseLU(d).inverse()
			got := make([]complex128, tc.n)
			for k := 0; k < tc.n; k++ {
				f.Column(got, k)
				if e := relErr(got, inv[k]); e > tolDense {
					t.Fatalf("Column(%d): relative error %.3g, want ≤ %g", k, e, tolDense)
				}
			}
		})
	}
}

// Oracle: dense Gaussian elimination with partial pivoting (newDenseLU,
// after Golub & Van Loan Alg. 3.4.1), on the same entries entered densely.
func TestEntryAndDotMatchDense(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, d := tc.build(t, 4)
			inv := newDenseLU(d).inverse()
			scale := 0.0
			for _, col := range inv {
				for _, v := range col {
					scale = math.Max(scale, cmplx.Abs(v))
				}
			}
			ws := f.NewWorkspace()
			paths := make([]Path, tc.n)
			for k := range paths {
				paths[k] = f.Path(k, ws)
			}
			rng := rand.New(rand.NewPCG(5, 5))
			for range 400 {
				i, k := rng.IntN(tc.n), rng.IntN(tc.n)
				want := inv[k][i]
				if e := cmplx.Abs(f.Dot(paths[i], paths[k])-want) / scale; e > tolDense {
					t.Fatalf("Dot(Path(%d), Path(%d)) = %v, want %v", i, k, f.Dot(paths[i], paths[k]), want)
				}
				if e := cmplx.Abs(f.Entry(i, k)-want) / scale; e > tolDense {
					t.Fatalf("Entry(%d, %d) = %v, want %v", i, k, f.Entry(i, k), want)
				}
			}
		})
	}
}

// Oracle: dense Gaussian elimination with partial pivoting (newDenseLU,
// after Golub & Van Loan Alg. 3.4.1), on the same entries entered densely.
func TestDiagonalMatchesDense(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, d := tc.build(t, 6)
			inv := newDenseLU(d).inverse()
			want := make([]complex128, tc.n)
			for k := range want {
				want[k] = inv[k][k]
			}
			got := make([]complex128, tc.n)
			f.Diagonal(got)
			if e := relErr(got, want); e > tolDense {
				t.Errorf("Diagonal: relative error %.3g, want ≤ %g", e, tolDense)
			}
		})
	}
}

// Oracle: the same dense inverse. Every pair whose entry of the matrix is
// a nonzero (a branch's two ends) lies on the pattern of L and is found;
// the diagonal is Diagonal's, bit for bit.
func TestDiagonalAndPairsMatchDense(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, d := tc.build(t, 7)
			inv := newDenseLU(d).inverse()
			var pairs [][2]int
			for i := range d {
				for k := range d[i] {
					if i != k && d[i][k] != 0 {
						pairs = append(pairs, [2]int{i, k})
					}
				}
			}
			diag := make([]complex128, tc.n)
			got := make([]complex128, len(pairs))
			found := make([]bool, len(pairs))
			f.DiagonalAndPairs(diag, pairs, got, found)
			only := make([]complex128, tc.n)
			f.Diagonal(only)
			for k := range diag {
				if diag[k] != only[k] {
					t.Fatalf("diagonal %d: %v, Diagonal gives %v", k, diag[k], only[k])
				}
			}
			want := make([]complex128, len(pairs))
			for p, pr := range pairs {
				if !found[p] {
					t.Fatalf("pair %v of a nonzero entry not found on the pattern", pr)
				}
				want[p] = inv[pr[0]][pr[1]]
			}
			if e := relErr(got, want); e > tolDense {
				t.Errorf("pairs: relative error %.3g, want ≤ %g", e, tolDense)
			}
		})
	}
}

func TestSingular(t *testing.T) {
	const y = 4 - 12i // a series admittance
	// healthy puts a shunted path on nodes [0, m).
	healthy := func(b *Builder, m int) {
		for i := 0; i < m; i++ {
			b.Add(i, i, 2+1i)
			if i > 0 {
				b.Add(i-1, i, -y)
				b.Add(i-1, i-1, y)
				b.Add(i, i, y)
			}
		}
	}
	series := func(b *Builder, i, j int) {
		b.Add(i, j, -y)
		b.Add(i, i, y)
		b.Add(j, j, y)
	}
	tests := []struct {
		name  string
		n     int
		fill  func(b *Builder)
		index []int // any of these may be named
	}{
		{name: "untouched-row", n: 6, fill: func(b *Builder) { healthy(b, 5) }, index: []int{5}},
		{name: "explicit-zero-row", n: 6, fill: func(b *Builder) {
			healthy(b, 6)
			b.Add(5, 5, -(2+1i)-y) // cancels node 5's diagonal ...
			b.Add(4, 5, y)         // ... and its branch, leaving structural zeros
			b.Add(4, 4, -y)
		}, index: []int{5}},
		{name: "floating-pair", n: 6, fill: func(b *Builder) {
			healthy(b, 4)
			series(b, 4, 5)
		}, index: []int{4, 5}},
		{name: "floating-triangle", n: 7, fill: func(b *Builder) {
			healthy(b, 4)
			series(b, 4, 5)
			series(b, 5, 6)
			series(b, 6, 4)
		}, index: []int{4, 5, 6}},
		{name: "floating-mesh-island", n: 80, fill: func(b *Builder) {
			healthy(b, 30)
			rng := rand.New(rand.NewPCG(31, 31))
			for _, e := range meshEdges(50, 20, rng) {
				series(b, 30+e.i, 30+e.j)
			}
		}, index: islandIndices(30, 80)},
		{name: "no-reference-at-all", n: 5, fill: func(b *Builder) {
			for i := 1; i < 5; i++ {
				series(b, i-1, i)
			}
		}, index: []int{0, 1, 2, 3, 4}},
		{name: "not-a-number", n: 4, fill: func(b *Builder) {
			healthy(b, 4)
			b.Add(2, 2, complex(math.NaN(), 0))
		}, index: []int{0, 1, 2, 3}},
		{name: "zero-diagonal-needs-pivoting", n: 2, fill: func(b *Builder) {
			b.Add(0, 1, 1) // nonsingular, but no symmetric order has a nonzero first pivot
		}, index: []int{0, 1}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			b := NewBuilder(tt.n)
			tt.fill(b)
			f, err := b.Factor()
			var se *SingularError
			if !errors.As(err, &se) {
				t.Fatalf("Factor() = %v, %v; want a *SingularError", f, err)
			}
			ok := false
			for _, i := range tt.index {
				ok = ok || se.Index == i
			}
			if !ok {
				t.Errorf("SingularError.Index = %d, want one of %v", se.Index, tt.index)
			}
			if msg := se.Error(); !strings.Contains(msg, "index "+strconv.Itoa(se.Index)) {
				t.Errorf("Error() = %q, want it to name index %d", msg, se.Index)
			}
		})
	}
}

// tolResidual bounds ‖Ax − b‖∞ / (‖A‖∞ ‖x‖∞): a backward stable solve
// leaves a few ε times the number of terms per row, about 1e-15 here.
const tolResidual = 1e-13

// A hub past denseDegree is ordered last, outside the quotient graph; the
// factor must still be right. Too large for the dense oracle, it is checked
// by the residual, computed from the Builder's triplets without the
// package's assembly.
func TestDenseHubResidual(t *testing.T) {
	const n, hub = 1500, 1200
	rng := rand.New(rand.NewPCG(41, 41))
	es := relabel(append(hubTreeEdges(n, hub, rng), meshEdges(n, 100, rng)[n-1:]...), n, rng)
	b, _ := network(n, es, true, rng)
	f, err := b.Factor()
	if err != nil {
		t.Fatal(err)
	}
	x := make([]complex128, n)
	rhs := make([]complex128, n)
	for i := range rhs {
		rhs[i] = complex(rng.NormFloat64(), rng.NormFloat64())
	}
	copy(x, rhs)
	f.Solve(x)
	ax := make([]complex128, n)
	rowSum := make([]float64, n)
	for t, v := range b.vals {
		i, j := b.rows[t], b.cols[t]
		ax[i] += v * x[j]
		rowSum[i] += cmplx.Abs(v)
		if i != j {
			ax[j] += v * x[i]
			rowSum[j] += cmplx.Abs(v)
		}
	}
	normA, normX, res := 0.0, 0.0, 0.0
	for i := range ax {
		normA = math.Max(normA, rowSum[i])
		normX = math.Max(normX, cmplx.Abs(x[i]))
		res = math.Max(res, cmplx.Abs(ax[i]-rhs[i]))
	}
	if r := res / (normA * normX); r > tolResidual {
		t.Errorf("relative residual %.3g, want ≤ %g", r, tolResidual)
	}
	// Entries through Paths must agree with a column through Column.
	col := make([]complex128, n)
	for _, k := range []int{0, n / 2, n - 1} {
		f.Column(col, k)
		for _, i := range []int{0, 1, n / 3, n - 1} {
			if e := cmplx.Abs(f.Entry(i, k)-col[i]) / cmplx.Abs(col[k]); e > tolDense {
				t.Errorf("Entry(%d, %d) = %v, Column gives %v", i, k, f.Entry(i, k), col[i])
			}
		}
	}
}

// islandIndices returns lo, lo+1, …, hi−1.
func islandIndices(lo, hi int) []int {
	var is []int
	for i := lo; i < hi; i++ {
		is = append(is, i)
	}
	return is
}

func TestAddPanicsOutOfRange(t *testing.T) {
	tests := []struct {
		name string
		i, j int
	}{
		{"negative-row", -1, 0},
		{"row-past-end", 3, 0},
		{"column-past-end", 0, 3},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			defer func() {
				if recover() == nil {
					t.Errorf("Add(%d, %d) on a 3×3 Builder did not panic", tt.i, tt.j)
				}
			}()
			NewBuilder(3).Add(tt.i, tt.j, 1)
		})
	}
}

func TestAssembleSumsDuplicates(t *testing.T) {
	b := NewBuilder(3)
	b.Add(0, 1, 1)
	b.Add(1, 0, 2i) // the same entry, entered from the other side
	b.Add(2, 2, 5)
	b.Add(2, 2, -1)
	b.Add(1, 1, 0) // structural zero
	a := b.assemble()
	want := map[[2]int]complex128{{0, 1}: 1 + 2i, {1, 0}: 1 + 2i, {2, 2}: 4, {1, 1}: 0}
	got := map[[2]int]complex128{}
	for j := 0; j < a.n; j++ {
		for p := a.colptr[j]; p < a.colptr[j+1]; p++ {
			key := [2]int{int(a.rowind[p]), j}
			if _, dup := got[key]; dup {
				t.Errorf("entry %v stored twice", key)
			}
			got[key] = a.val[p]
		}
	}
	if len(got) != len(want) {
		t.Errorf("assembled %d entries %v, want %d %v", len(got), got, len(want), want)
	}
	for k, v := range want {
		if got[k] != v {
			t.Errorf("A%v = %v, want %v", k, got[k], v)
		}
	}
}

func TestEmptyMatrix(t *testing.T) {
	f, err := NewBuilder(0).Factor()
	if err != nil {
		t.Fatalf("Factor of a 0×0 matrix: %v", err)
	}
	if f.Size() != 0 || f.NonZeros() != 0 {
		t.Errorf("Size, NonZeros = %d, %d; want 0, 0", f.Size(), f.NonZeros())
	}
	f.Solve(nil)
	f.Diagonal(nil)
}
