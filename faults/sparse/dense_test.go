package sparse

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
)

// This file holds what the tests compare against: an independent dense
// oracle, Gaussian elimination with partial row pivoting (Golub & Van Loan,
// "Matrix Computations", 4th ed., Alg. 3.4.1), which neither exploits
// symmetry nor shares code with the package, and generators of test
// networks with the shapes the fault engine meets.

// denseLU is P A = L U with row pivoting, L and U packed in a.
type denseLU struct {
	a   [][]complex128
	piv []int
}

func newDenseLU(m [][]complex128) *denseLU {
	n := len(m)
	a := make([][]complex128, n)
	for i := range m {
		a[i] = append([]complex128(nil), m[i]...)
	}
	piv := make([]int, n)
	for k := 0; k < n; k++ {
		p := k
		for i := k + 1; i < n; i++ {
			if cmplx.Abs(a[i][k]) > cmplx.Abs(a[p][k]) {
				p = i
			}
		}
		piv[k] = p
		a[k], a[p] = a[p], a[k]
		for i := k + 1; i < n; i++ {
			a[i][k] /= a[k][k]
			for j := k + 1; j < n; j++ {
				a[i][j] -= a[i][k] * a[k][j]
			}
		}
	}
	return &denseLU{a: a, piv: piv}
}

// solve returns A⁻¹ b.
func (lu *denseLU) solve(b []complex128) []complex128 {
	n := len(b)
	x := append([]complex128(nil), b...)
	for k := 0; k < n; k++ {
		x[k], x[lu.piv[k]] = x[lu.piv[k]], x[k]
	}
	for i := 0; i < n; i++ {
		for j := 0; j < i; j++ {
			x[i] -= lu.a[i][j] * x[j]
		}
	}
	for i := n - 1; i >= 0; i-- {
		for j := i + 1; j < n; j++ {
			x[i] -= lu.a[i][j] * x[j]
		}
		x[i] /= lu.a[i][i]
	}
	return x
}

// inverse returns A⁻¹ by columns: inv[k] is column k.
func (lu *denseLU) inverse() [][]complex128 {
	n := len(lu.a)
	inv := make([][]complex128, n)
	for k := range inv {
		e := make([]complex128, n)
		e[k] = 1
		inv[k] = lu.solve(e)
	}
	return inv
}

// relErr returns max|got−want| / max|want|.
func relErr(got, want []complex128) float64 {
	var num, den float64
	for i := range want {
		num = math.Max(num, cmplx.Abs(got[i]-want[i]))
		den = math.Max(den, cmplx.Abs(want[i]))
	}
	if den == 0 {
		return num
	}
	return num / den
}

type edge struct{ i, j int }

func pathEdges(n int) []edge {
	var es []edge
	for i := 1; i < n; i++ {
		es = append(es, edge{i - 1, i})
	}
	return es
}

func starEdges(n int) []edge {
	var es []edge
	for i := 1; i < n; i++ {
		es = append(es, edge{0, i})
	}
	return es
}

// treeEdges is a random recursive tree: node t hangs off a node before it.
func treeEdges(n int, rng *rand.Rand) []edge {
	var es []edge
	for t := 1; t < n; t++ {
		es = append(es, edge{rng.IntN(t), t})
	}
	return es
}

func gridEdges(rows, cols int) []edge {
	var es []edge
	for r := 0; r < rows; r++ {
		for c := 0; c < cols; c++ {
			i := r*cols + c
			if c+1 < cols {
				es = append(es, edge{i, i + 1})
			}
			if r+1 < rows {
				es = append(es, edge{i, i + cols})
			}
		}
	}
	return es
}

// meshEdges is a random tree with extra random chords, so loops of every
// length.
func meshEdges(n, chords int, rng *rand.Rand) []edge {
	es := treeEdges(n, rng)
	for range chords {
		i, j := rng.IntN(n), rng.IntN(n)
		if i != j {
			es = append(es, edge{i, j})
		}
	}
	return es
}

// hubTreeEdges is a tree whose node 0 has degree hub, with random subtrees
// hanging off its neighbours.
func hubTreeEdges(n, hub int, rng *rand.Rand) []edge {
	es := starEdges(hub + 1)
	for t := hub + 1; t < n; t++ {
		es = append(es, edge{1 + rng.IntN(t-1), t})
	}
	return es
}

// relabel renumbers the nodes by a random permutation, so no test leans on
// a friendly numbering.
func relabel(es []edge, n int, rng *rand.Rand) []edge {
	p := rng.Perm(n)
	out := make([]edge, len(es))
	for k, e := range es {
		out[k] = edge{p[e.i], p[e.j]}
	}
	return out
}

// network fills a Builder and a dense copy with an admittance matrix on the
// edges: series admittances 1/(r+jx) of lines and, at every node, a shunt
// whose real part is at least a tenth of the node's total series
// admittance, so that the real part of A is positive definite and A is
// well conditioned. With split, every entry arrives as several Add calls,
// in both (i, j) and (j, i) order.
func network(n int, es []edge, split bool, rng *rand.Rand) (*Builder, [][]complex128) {
	b := NewBuilder(n)
	d := make([][]complex128, n)
	for i := range d {
		d[i] = make([]complex128, n)
	}
	add := func(i, j int, v complex128) {
		if split {
			part := v * complex(rng.Float64(), 0)
			b.Add(j, i, part)
			v -= part
		}
		b.Add(i, j, v)
	}
	total := make([]float64, n)
	for _, e := range es {
		y := 1 / complex(0.01+0.2*rng.Float64(), 0.05+0.5*rng.Float64())
		add(e.i, e.j, -y)
		add(e.i, e.i, y)
		add(e.j, e.j, y)
		d[e.i][e.j] -= y
		d[e.j][e.i] -= y
		d[e.i][e.i] += y
		d[e.j][e.j] += y
		total[e.i] += cmplx.Abs(y)
		total[e.j] += cmplx.Abs(y)
	}
	for i := 0; i < n; i++ {
		s := complex((0.1+rng.Float64())*total[i]+0.5*rng.Float64()+0.01, rng.NormFloat64())
		add(i, i, s)
		d[i][i] += s
	}
	return b, d
}
