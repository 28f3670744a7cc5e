package sparse

// Diagonal sets dst[k] to (A⁻¹)ₖₖ for every k, the driving-point
// impedances of a bus admittance matrix.
//
// It evaluates the entries of Z = A⁻¹ on the pattern of L only, by the
// recurrence of Takahashi, Fagan & Chen, "Formation of a sparse bus
// impedance matrix and its application to short circuit study", PICA 1973,
// as put by Erisman & Tinney,
// "On computing certain elements of the inverse of a sparse matrix",
// Comm. ACM 18(3), 1975: from Lᵀ Z = D⁻¹ L⁻¹, whose upper triangle is D⁻¹,
// for the column pattern Sⱼ of L
//
//	Zᵢⱼ = −Σ_{m∈Sⱼ} Lₘⱼ Zₘᵢ   for i ∈ Sⱼ,
//	Zⱼⱼ = 1/dⱼ − Σ_{m∈Sⱼ} Lₘⱼ Zₘⱼ,
//
// taken for j from the last position down. Sⱼ is a clique of the filled
// graph, so every Zₘᵢ needed is already known. The cost is Σⱼ Σ_{m∈Sⱼ} |Sₘ|
// and the memory one value per nonzero of L, against Σₖ (path length of k)
// × (column counts) for n calls of Path and Dot. It panics if len(dst) !=
// Size().
func (f *Factor) Diagonal(dst []complex128) {
	f.checkLen("Diagonal", len(dst))
	f.inverseOnPattern(dst, nil, nil, nil)
}

// DiagonalAndPairs is Diagonal that also sets pairDst[t] to (A⁻¹)ᵢₖ for
// each pair (i, k) of pairs (original indices) that lies on the pattern of
// L, found[t] true: every pair whose entry of A is a nonzero (the two ends
// of a branch) does, and comes at no cost beyond Diagonal's. It panics if
// len(dst) != Size() or the pair slices differ in length.
func (f *Factor) DiagonalAndPairs(dst []complex128, pairs [][2]int, pairDst []complex128, found []bool) {
	f.checkLen("DiagonalAndPairs", len(dst))
	if len(pairDst) != len(pairs) || len(found) != len(pairs) {
		panic("sparse: DiagonalAndPairs: pairs, pairDst and found differ in length")
	}
	for _, pr := range pairs {
		f.checkIndex("DiagonalAndPairs", pr[0])
		f.checkIndex("DiagonalAndPairs", pr[1])
	}
	f.inverseOnPattern(dst, pairs, pairDst, found)
}

func (f *Factor) inverseOnPattern(dst []complex128, pairs [][2]int, pairDst []complex128, found []bool) {
	zl := make([]complex128, len(f.lval)) // Zᵢⱼ for i ∈ Sⱼ, laid out like L
	zd := make([]complex128, f.n)         // Zⱼⱼ
	var acc []complex128                  // Zᵢⱼ being summed, i ∈ Sⱼ
	for j := f.n - 1; j >= 0; j-- {
		lo, hi := f.colptr[j], f.colptr[j+1]
		s := f.rowind[lo:hi]
		lj := f.lval[lo:hi]
		acc = grow(acc, len(s))
		for t, m := range s {
			// Diagonal term of the pair (m, m).
			acc[t] -= lj[t] * zd[m]
			// Pairs (m, i) with i ∈ Sⱼ above m: Zᵢₘ sits in column m of Z,
			// whose rows include every such i; merge the two sorted lists.
			col := f.rowind[f.colptr[m]:f.colptr[m+1]]
			zm := zl[f.colptr[m]:f.colptr[m+1]]
			q := 0
			for u := t + 1; u < len(s); u++ {
				for col[q] != s[u] {
					q++
				}
				z := zm[q]
				acc[u] -= lj[t] * z
				acc[t] -= lj[u] * z
			}
		}
		d := f.dinv[j]
		for t := range s {
			zl[lo+t] = acc[t]
			d -= lj[t] * acc[t]
		}
		zd[j] = d
	}
	for k, i := range f.perm {
		dst[i] = zd[k]
	}
	for t, pr := range pairs {
		a, b := f.pinv[pr[0]], f.pinv[pr[1]]
		if a == b {
			pairDst[t], found[t] = zd[a], true
			continue
		}
		lo, hi := min(a, b), max(a, b)
		pairDst[t], found[t] = 0, false
		for q := f.colptr[lo]; q < f.colptr[lo+1]; q++ {
			if f.rowind[q] == hi {
				pairDst[t], found[t] = zl[q], true
				break
			}
		}
	}
}

// grow returns a zeroed slice of length m, reusing buf when it is large
// enough.
func grow(buf []complex128, m int) []complex128 {
	if cap(buf) < m {
		return make([]complex128, m)
	}
	buf = buf[:m]
	clear(buf)
	return buf
}
