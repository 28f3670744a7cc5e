package sparse

// The symbolic step finds the elimination tree of C = P A Pᵀ and the number
// of nonzeros in each column of L by walking, for every row k, the row
// subtree of L: the paths from the nonzeros of C's row k up the tree until
// a node already met for this row. That costs O(nnz(L)) and needs no
// storage beyond the tree (Liu, "The role of elimination trees in sparse
// factorization", SIAM J. Matrix Anal. Appl. 11(1), 1990; Davis, "Direct
// Methods for Sparse Linear Systems", SIAM 2006, §4.1 and §4.4).

// permuteUpper returns the upper triangle (row ≤ column) of C = P A Pᵀ by
// columns, where row i of C is row perm[i] of A and pinv is the inverse of
// perm.
func permuteUpper(a *csc, pinv []int32) *csc {
	n := a.n
	colptr := make([]int, n+1)
	for j := 0; j < n; j++ {
		pj := pinv[j]
		for _, i := range a.rowind[a.colptr[j]:a.colptr[j+1]] {
			if pi := pinv[i]; pi <= pj {
				colptr[pj+1]++
			}
		}
	}
	for j := 0; j < n; j++ {
		colptr[j+1] += colptr[j]
	}
	nnz := colptr[n]
	c := &csc{n: n, colptr: colptr, rowind: make([]int32, nnz), val: make([]complex128, nnz)}
	next := make([]int, n)
	copy(next, colptr[:n])
	for j := 0; j < n; j++ {
		pj := pinv[j]
		for p := a.colptr[j]; p < a.colptr[j+1]; p++ {
			if pi := pinv[a.rowind[p]]; pi <= pj {
				q := next[pj]
				c.rowind[q], c.val[q] = pi, a.val[p]
				next[pj]++
			}
		}
	}
	return c
}

// etree returns the elimination tree of L (parent[j] = −1 at a root) and
// count[j], the number of nonzeros below the diagonal in column j of L,
// for the upper triangle c of the permuted matrix.
func etree(c *csc) (parent, count []int32) {
	n := c.n
	parent = make([]int32, n)
	count = make([]int32, n)
	flag := make([]int32, n)
	for k := 0; k < n; k++ {
		parent[k] = -1
		flag[k] = int32(k)
		for _, i := range c.rowind[c.colptr[k]:c.colptr[k+1]] {
			// Climb from i towards k; every node on the way has L(k, ·) ≠ 0.
			for ; flag[i] != int32(k); i = parent[i] {
				if parent[i] < 0 {
					parent[i] = int32(k)
				}
				count[i]++
				flag[i] = int32(k)
			}
		}
	}
	return parent, count
}
