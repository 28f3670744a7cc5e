package sparse

import "fmt"

// PivotTolerance is the relative size below which a pivot counts as zero:
// the factorization fails when |dₖ| ≤ PivotTolerance·maxⱼ|Aₖⱼ| for the
// row k being eliminated. An exactly singular matrix leaves a pivot made of
// rounding errors: for floating meshed islands of 10 to 1000 buses it
// measured below 1e-14 of its row, two orders under the threshold
// (1e-12 ≈ 4500ε). A pivot that small in a nonsingular matrix would leave
// too few correct digits in the inverse to be worth returning.
const PivotTolerance = 1e-12

// SingularError reports a pivot that is zero, negligible or not finite. For
// an admittance matrix it usually means a bus or an island of buses with no
// path to the reference (no shunt, source or earthing), or a bus that no
// entry mentions at all.
type SingularError struct {
	Index int        // original index of the row whose pivot failed
	Pivot complex128 // the pivot found
}

// Error implements the error interface.
func (e *SingularError) Error() string {
	return fmt.Sprintf("sparse: matrix is singular at index %d (pivot %v)", e.Index, e.Pivot)
}
