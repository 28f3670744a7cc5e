package sparse

import "fmt"

// Path is the sparse vector w = L⁻¹ P eₖ for one original index k. Its
// nonzeros lie on the elimination-tree path from k's position to the root
// (Tinney, Brandwajn & Chan, "Sparse vector methods", IEEE Trans. PAS
// 104(2), 1985), and it keeps them with their positions, ascending, which
// is what Dot needs. A Path is an immutable value and belongs to the Factor
// that made it.
type Path struct {
	pos []int32 // positions on the path, ascending (each parent is above its child)
	val []complex128
}

// Len returns the number of positions on the path.
func (p Path) Len() int { return len(p.pos) }

// Workspace holds per-goroutine scratch for Path: one dense vector of
// length n that is all zero between calls. The zero value is not usable;
// use Factor.NewWorkspace.
type Workspace struct {
	x []complex128
}

// NewWorkspace returns scratch space for Path and PathTo on f. Each
// goroutine needs its own.
func (f *Factor) NewWorkspace() *Workspace {
	return &Workspace{x: make([]complex128, f.n)}
}

// Path returns L⁻¹ P eₖ. Its cost is the path length times the column
// counts of L along it, not n, and it allocates only the Path's own two
// slices. It panics if k is out of range or ws was not made for a Factor
// of this size.
func (f *Factor) Path(k int, ws *Workspace) Path {
	var p Path
	f.PathTo(&p, k, ws)
	return p
}

// PathTo sets *dst to the Path of k, reusing dst's storage when it is large
// enough, so a loop over many k need not allocate. The Path previously in
// *dst must no longer be used.
func (f *Factor) PathTo(dst *Path, k int, ws *Workspace) {
	f.checkIndex("Path", k)
	if ws == nil || len(ws.x) != f.n {
		panic(fmt.Sprintf("sparse: Path: workspace not made by NewWorkspace for a Factor of size %d", f.n))
	}
	start := f.pinv[k]
	m := 0
	for j := start; j >= 0; j = f.parent[j] {
		m++
	}
	if cap(dst.pos) < m {
		dst.pos = make([]int32, m)
		dst.val = make([]complex128, m)
	}
	dst.pos, dst.val = dst.pos[:m], dst.val[:m]
	x := ws.x
	x[start] = 1
	m = 0
	for j := start; j >= 0; j = f.parent[j] {
		// Every row of column j of L is an ancestor of j, hence on the
		// path and not yet visited, so x[j] is final here.
		xj := x[j]
		x[j] = 0
		dst.pos[m], dst.val[m] = j, xj
		m++
		for q := f.colptr[j]; q < f.colptr[j+1]; q++ {
			x[f.rowind[q]] -= f.lval[q] * xj
		}
	}
}

// Dot returns aᵀ D⁻¹ b, which is (A⁻¹)ᵢₖ when a and b are the Paths of i
// and k. Only the common part of the two paths contributes: it runs from
// their lowest common ancestor to the root, so it is the same tail of
// both position lists (each path climbs parent by parent). The length of
// that tail is found by bisection (a node two paths share has its parent
// in common too), and the sum runs along it from the ancestor upwards, in
// ascending positions.
func (f *Factor) Dot(a, b Path) complex128 {
	la, lb := len(a.pos), len(b.pos)
	lo, hi := 0, min(la, lb) // the common tail is at least lo and at most hi long
	for lo < hi {
		mid := (lo + hi + 1) / 2
		if a.pos[la-mid] == b.pos[lb-mid] {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	av, bv, pos := a.val[la-lo:], b.val[lb-lo:lb], a.pos[la-lo:]
	var s complex128
	for t := range av {
		s += av[t] * bv[t] * f.dinv[pos[t]]
	}
	return s
}

// Entry returns (A⁻¹)ᵢₖ through two Paths and Dot. It allocates a
// Workspace of length n on every call, so it is meant for tests and light
// use; loops should keep a Workspace and call Path and Dot themselves.
func (f *Factor) Entry(i, k int) complex128 {
	ws := f.NewWorkspace()
	return f.Dot(f.Path(i, ws), f.Path(k, ws))
}
