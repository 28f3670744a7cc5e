package sparse

// Column evaluates one column of A⁻¹ lazily: z = L⁻ᵀ D⁻¹ L⁻¹ P eₖ at the
// positions asked for. Row j of Lᵀz = w involves only column j of L, whose
// rows are ancestors of j in the elimination tree, so zⱼ needs only the
// entries on j's path to the root. At computes the missing part of that
// path, top down, and keeps it: entries asked for near one another share
// their ancestors, and each position is computed once per column (the
// partial backward substitution of Tinney, Brandwajn & Chan, "Sparse
// vector methods", IEEE Trans. PAS 104(2), 1985). A Column belongs to one
// goroutine.
type Column struct {
	f *Factor
	// z holds, on k's path, w = D⁻¹L⁻¹Peₖ until the entry is final (w is
	// zero off the path), and the final entries of the column.
	z     []complex128
	wGen  []uint32 // z[j] holds w[j] when wGen[j] == gen and zGen[j] != gen
	zGen  []uint32 // z[j] is final when zGen[j] == gen
	gen   uint32
	stack []int32
	set   bool
}

// NewColumn returns an empty Column of f; Reset chooses its column.
func (f *Factor) NewColumn() *Column {
	return &Column{f: f, z: make([]complex128, f.n),
		wGen: make([]uint32, f.n), zGen: make([]uint32, f.n)}
}

// Reset makes c column k (an original index) of A⁻¹, forgetting the
// entries of the column it was. Its cost is k's path length times the
// column counts of L along it.
func (c *Column) Reset(k int) {
	f := c.f
	f.checkIndex("Column", k)
	c.gen++
	if c.gen == 0 {
		clear(c.wGen)
		clear(c.zGen)
		c.gen = 1
	}
	c.set = true
	start := f.pinv[k]
	w := c.z
	for j := start; j >= 0; j = f.parent[j] {
		w[j], c.wGen[j] = 0, c.gen
	}
	w[start] = 1
	for j := start; j >= 0; j = f.parent[j] {
		// The rows of column j are ancestors of j: on the path, and
		// still to be finished, so w[j] is final here.
		xj := w[j]
		for q := f.colptr[j]; q < f.colptr[j+1]; q++ {
			w[f.rowind[q]] -= f.lval[q] * xj
		}
		w[j] = xj * f.dinv[j]
	}
}

// At returns (A⁻¹)ᵢₖ for the column k of the last Reset.
func (c *Column) At(i int) complex128 {
	f := c.f
	if !c.set {
		panic("sparse: Column.At before Reset")
	}
	f.checkIndex("Column.At", i)
	st := c.stack[:0]
	for j := f.pinv[i]; j >= 0 && c.zGen[j] != c.gen; j = f.parent[j] {
		st = append(st, j)
	}
	for t := len(st) - 1; t >= 0; t-- {
		j := st[t]
		var zj complex128
		if c.wGen[j] == c.gen {
			zj = c.z[j] // w[j]; the ancestors read below are final
		}
		for q := f.colptr[j]; q < f.colptr[j+1]; q++ {
			zj -= f.lval[q] * c.z[f.rowind[q]]
		}
		c.z[j], c.zGen[j] = zj, c.gen
	}
	c.stack = st
	return c.z[f.pinv[i]]
}
