package sparse

import (
	"fmt"
	"math"
)

// Builder accumulates the entries of an n×n complex symmetric matrix.
// Entries are kept as given until Factor, so building costs nothing but the
// triplets. A Builder is not safe for concurrent use.
type Builder struct {
	n    int
	rows []int32
	cols []int32
	vals []complex128
}

// NewBuilder returns a Builder for an n×n matrix, all of whose entries are
// zero. It panics if n is negative or does not fit in an int32.
func NewBuilder(n int) *Builder {
	if n < 0 || n > math.MaxInt32 {
		panic(fmt.Sprintf("sparse: NewBuilder(%d): size out of range", n))
	}
	return &Builder{n: n}
}

// Size returns n, the order of the matrix being built.
func (b *Builder) Size() int { return b.n }

// Add adds v to A[i][j] and, when i != j, to A[j][i] too. Duplicates sum.
// Adding a zero still makes (i, j) a structural entry. Add panics if i or j
// is outside [0, n).
func (b *Builder) Add(i, j int, v complex128) {
	if i < 0 || i >= b.n || j < 0 || j >= b.n {
		panic(fmt.Sprintf("sparse: Add(%d, %d): index out of range [0, %d)", i, j, b.n))
	}
	b.rows = append(b.rows, int32(i))
	b.cols = append(b.cols, int32(j))
	b.vals = append(b.vals, v)
}

// Factor orders the matrix by approximate minimum degree (Amestoy, Davis &
// Duff 1996) and factors it as A = Pᵀ L D Lᵀ P. It returns a *SingularError
// if a pivot is zero or negligible. The Builder is not changed, so more
// entries may be added and Factor called again.
func (b *Builder) Factor() (*Factor, error) {
	a := b.assemble()
	perm := minimumDegree(a)
	return factorize(a, perm)
}

// csc is a square sparse matrix in compressed sparse column form. For the
// assembled matrix both triangles are stored; rows within a column are
// unique but not sorted.
type csc struct {
	n      int
	colptr []int // column j is rowind[colptr[j]:colptr[j+1]]
	rowind []int32
	val    []complex128
}

// assemble turns the triplets into the full symmetric matrix, mirroring
// off-diagonal entries and summing duplicates.
func (b *Builder) assemble() *csc {
	n := b.n
	colptr := make([]int, n+1)
	for t, j := range b.cols {
		colptr[j+1]++
		if i := b.rows[t]; i != j {
			colptr[i+1]++
		}
	}
	for j := 0; j < n; j++ {
		colptr[j+1] += colptr[j]
	}
	nnz := colptr[n]
	rowind := make([]int32, nnz)
	val := make([]complex128, nnz)
	next := make([]int, n)
	copy(next, colptr[:n])
	for t, j := range b.cols {
		i, v := b.rows[t], b.vals[t]
		rowind[next[j]], val[next[j]] = i, v
		next[j]++
		if i != j {
			rowind[next[i]], val[next[i]] = j, v
			next[i]++
		}
	}
	return sumDuplicates(&csc{n: n, colptr: colptr, rowind: rowind, val: val})
}

// sumDuplicates merges repeated rows within each column, in place, keeping
// the first occurrence's position.
func sumDuplicates(a *csc) *csc {
	where := make([]int, a.n) // where[i]: position of row i in the current column, or -1
	for i := range where {
		where[i] = -1
	}
	out := 0
	start := 0
	for j := 0; j < a.n; j++ {
		end := a.colptr[j+1]
		first := out
		for p := start; p < end; p++ {
			i := a.rowind[p]
			if q := where[i]; q >= first {
				a.val[q] += a.val[p]
				continue
			}
			where[i] = out
			a.rowind[out], a.val[out] = i, a.val[p]
			out++
		}
		a.colptr[j+1] = out
		start = end
	}
	a.rowind = a.rowind[:out:out]
	a.val = a.val[:out:out]
	return a
}
