package sparse

import (
	"math"
	"math/cmplx"
)

// Factor is A = Pᵀ L D Lᵀ P for a complex symmetric A. It is read-only
// after Builder.Factor returns it and safe for concurrent use by many
// goroutines; Path needs a Workspace per goroutine.
type Factor struct {
	n      int
	perm   []int32 // perm[k]: original index at position k
	pinv   []int32 // pinv[i]: position of original index i
	parent []int32 // elimination tree over positions, −1 at a root
	colptr []int   // column j of L is rowind/lval[colptr[j]:colptr[j+1]], rows ascending
	rowind []int32
	lval   []complex128
	dinv   []complex128 // 1/dⱼ
}

// Size returns n, the order of the factored matrix.
func (f *Factor) Size() int { return f.n }

// NonZeros returns the number of nonzeros in L strictly below the
// diagonal, for reports and benchmarks.
func (f *Factor) NonZeros() int { return f.colptr[f.n] }

// factorize computes the numeric factorization in the order perm.
//
// It is the up-looking LDLᵀ of Davis, "Algorithm 849: A concise sparse
// Cholesky factorization package", ACM TOMS 31(4), 2005 (and "Direct
// Methods for Sparse Linear Systems", §4.7), with complex arithmetic and
// no conjugation: row k of L solves L₀ y = C(0:k, k) over the first k
// rows, whose pattern is the row subtree of k, visited in topological
// order. Row k's entries are appended to their columns, so rows come out
// ascending within every column.
func factorize(a *csc, perm []int32) (*Factor, error) {
	n := a.n
	pinv := make([]int32, n)
	for k, i := range perm {
		pinv[i] = int32(k)
	}
	c := permuteUpper(a, pinv)
	parent, count := etree(c)
	colptr := make([]int, n+1)
	for j := 0; j < n; j++ {
		colptr[j+1] = colptr[j] + int(count[j])
	}
	f := &Factor{
		n:      n,
		perm:   perm,
		pinv:   pinv,
		parent: parent,
		colptr: colptr,
		rowind: make([]int32, colptr[n]),
		lval:   make([]complex128, colptr[n]),
		dinv:   make([]complex128, n),
	}
	if err := f.numeric(c, rowScale(a)); err != nil {
		return nil, err
	}
	return f, nil
}

// rowScale returns maxⱼ|Aᵢⱼ| for every original row i, the yardstick for
// a negligible pivot.
func rowScale(a *csc) []float64 {
	s := make([]float64, a.n)
	for j := 0; j < a.n; j++ {
		for _, v := range a.val[a.colptr[j]:a.colptr[j+1]] {
			s[j] = math.Max(s[j], cmplx.Abs(v))
		}
	}
	return s
}

// numeric fills L and D from the permuted upper triangle c.
func (f *Factor) numeric(c *csc, scale []float64) error {
	n := f.n
	y := make([]complex128, n)  // row k of L·D, scattered
	flag := make([]int32, n)    // flag[i] == k: i is in row k's pattern
	pattern := make([]int32, n) // row k's pattern, topological, in pattern[top:]
	filled := make([]int, n)    // next free slot in each column of L
	copy(filled, f.colptr[:n])
	for k := 0; k < n; k++ {
		top := n
		flag[k] = int32(k)
		for p := c.colptr[k]; p < c.colptr[k+1]; p++ {
			i := c.rowind[p]
			y[i] += c.val[p]
			// Walk up from i to the first node already in the pattern,
			// then push that stretch so ancestors stay behind descendants.
			m := 0
			for ; flag[i] != int32(k); i = f.parent[i] {
				pattern[m] = i
				m++
				flag[i] = int32(k)
			}
			for m > 0 {
				m--
				top--
				pattern[top] = pattern[m]
			}
		}
		d := y[k]
		y[k] = 0
		for ; top < n; top++ {
			i := pattern[top]
			yi := y[i]
			y[i] = 0
			for q := f.colptr[i]; q < filled[i]; q++ {
				y[f.rowind[q]] -= f.lval[q] * yi
			}
			lki := yi * f.dinv[i]
			d -= lki * yi
			q := filled[i]
			f.rowind[q], f.lval[q] = int32(k), lki
			filled[i]++
		}
		if err := checkPivot(d, scale[f.perm[k]], int(f.perm[k])); err != nil {
			return err
		}
		f.dinv[k] = 1 / d
	}
	return nil
}

// checkPivot returns a *SingularError for a pivot that is not finite or
// not larger than PivotTolerance times its row's scale.
func checkPivot(d complex128, scale float64, index int) error {
	ad := cmplx.Abs(d)
	if ad > PivotTolerance*scale && !math.IsInf(ad, 0) {
		return nil
	}
	return &SingularError{Index: index, Pivot: d}
}
