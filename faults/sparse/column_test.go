package sparse

import (
	"math/cmplx"
	"testing"
)

// A Column must give the column of A⁻¹ that a full solve of A z = eₖ gives
// (Solve, the dense-checked reference of this package), whatever order its
// entries are asked in and however many columns it was before.
func TestColumnMatchesSolve(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, _ := tc.build(t, 23)
			c := f.NewColumn()
			want := make([]complex128, tc.n)
			for _, k := range []int{0, tc.n / 2, tc.n - 1, tc.n / 3} {
				clear(want)
				want[k] = 1
				f.Solve(want)
				c.Reset(k)
				// Leaves first, then everything: entries asked later
				// reuse the ancestors already finished.
				for _, order := range [][]int{{tc.n - 1, 0, tc.n / 2}, nil} {
					if order == nil {
						for i := range tc.n {
							order = append(order, i)
						}
					}
					for _, i := range order {
						got := c.At(i)
						if cmplx.Abs(got-want[i]) > 1e-12*(1+cmplx.Abs(want[i])) {
							t.Fatalf("column %d: At(%d) = %v, Solve gives %v", k, i, got, want[i])
						}
					}
				}
			}
		})
	}
}
