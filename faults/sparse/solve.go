package sparse

import "fmt"

// Solve overwrites x with A⁻¹x. It panics if len(x) != Size(). It
// allocates one vector of length n for the permuted right-hand side.
func (f *Factor) Solve(x []complex128) {
	f.checkLen("Solve", len(x))
	y := make([]complex128, f.n)
	for k, i := range f.perm {
		y[k] = x[i]
	}
	f.forward(y)
	for k := range y {
		y[k] *= f.dinv[k]
	}
	f.backward(y)
	for k, i := range f.perm {
		x[i] = y[k]
	}
}

// Column sets dst to column k of A⁻¹ (equally row k, A⁻¹ being
// symmetric). The forward substitution runs over k's elimination-tree path
// only; the backward one is full. It panics if len(dst) != Size() or k is
// out of range.
func (f *Factor) Column(dst []complex128, k int) {
	f.checkLen("Column", len(dst))
	f.checkIndex("Column", k)
	y := make([]complex128, f.n)
	j := f.pinv[k]
	y[j] = 1
	for ; j >= 0; j = f.parent[j] {
		yj := y[j]
		for q := f.colptr[j]; q < f.colptr[j+1]; q++ {
			y[f.rowind[q]] -= f.lval[q] * yj
		}
		y[j] = yj * f.dinv[j]
	}
	f.backward(y)
	for p, i := range f.perm {
		dst[i] = y[p]
	}
}

// forward solves L y = b in place, by columns.
func (f *Factor) forward(y []complex128) {
	for j := 0; j < f.n; j++ {
		yj := y[j]
		if yj == 0 {
			continue
		}
		for q := f.colptr[j]; q < f.colptr[j+1]; q++ {
			y[f.rowind[q]] -= f.lval[q] * yj
		}
	}
}

// backward solves Lᵀ z = y in place: column j of L is row j of Lᵀ.
func (f *Factor) backward(y []complex128) {
	for j := f.n - 1; j >= 0; j-- {
		s := y[j]
		for q := f.colptr[j]; q < f.colptr[j+1]; q++ {
			s -= f.lval[q] * y[f.rowind[q]]
		}
		y[j] = s
	}
}

func (f *Factor) checkLen(op string, got int) {
	if got != f.n {
		panic(fmt.Sprintf("sparse: %s: vector length %d, want %d", op, got, f.n))
	}
}

func (f *Factor) checkIndex(op string, k int) {
	if k < 0 || k >= f.n {
		panic(fmt.Sprintf("sparse: %s: index %d out of range [0, %d)", op, k, f.n))
	}
}
