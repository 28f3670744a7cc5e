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
