// Package sparse factors sparse complex symmetric matrices, such as the
// sequence bus admittance matrices of a power network, and answers
// questions about their inverse (the bus impedance matrix) without ever
// forming anything n×n.
//
// # Conventions
//
// Symmetric means complex symmetric, not Hermitian: Aᵀ = A with no
// conjugation, which is what a bus admittance matrix of reciprocal
// elements is. The factorization is A = Pᵀ L D Lᵀ P with L unit lower
// triangular, D diagonal and complex, and P a fill-reducing permutation.
// No numerical pivoting is done: admittance matrices are factored in any
// symmetric order in practice. A pivot that is zero, or negligible next to
// the largest entry of its row (see [PivotTolerance]), stops the
// factorization with a [*SingularError].
//
// Every index in the API is an original index, the one given to
// [Builder.Add]; the permutation is internal. Indices run from 0 to n−1.
//
// # Columns and entries of the inverse
//
// Because A is symmetric, A⁻¹ = Pᵀ L⁻ᵀ D⁻¹ L⁻¹ P, so
//
//	(A⁻¹)ᵢₖ = wᵢᵀ D⁻¹ wₖ,  wₖ = L⁻¹ P eₖ.
//
// The sparse vector wₖ is nonzero only on the path from k's position to the
// root of the elimination tree (Tinney, Brandwajn & Chan 1985, "Sparse
// vector methods"), so [Factor.Path] costs the path length times the column
// counts of L, not n, and [Factor.Dot] touches only the common part of two
// paths. [Factor.Column] gives a whole column of A⁻¹ with one sparse forward
// and one full backward substitution, and [Factor.Diagonal] gives every
// diagonal entry of A⁻¹ in one sweep over L.
//
// # Concurrency
//
// A [Builder] is not safe for concurrent use. A [*Factor] is read-only once
// [Builder.Factor] returns it, and all its methods may be called from many
// goroutines at once, provided each goroutine has its own [Workspace] for
// [Factor.Path] and [Factor.PathTo]. A [Path] is an immutable value.
//
// # Example
//
//	b := sparse.NewBuilder(3)
//	b.Add(0, 0, 10)     // shunt at bus 0
//	b.Add(0, 1, -5i)    // series admittance 5i between buses 0 and 1 ...
//	b.Add(0, 0, 5i)     // ... enters both diagonals
//	b.Add(1, 1, 5i)
//	...
//	f, err := b.Factor()
//	if err != nil {
//		var se *sparse.SingularError
//		if errors.As(err, &se) { /* bus se.Index floats */ }
//	}
//	ws := f.NewWorkspace()
//	zkk := f.Dot(f.Path(k, ws), f.Path(k, ws)) // (A⁻¹)ₖₖ
package sparse
