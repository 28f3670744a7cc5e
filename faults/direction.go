package faults

import "math/cmplx"

// Downstream returns the end of branch b towards which it carries the
// larger fault current: a bolted three-phase fault at each end in the
// maximum case is compared by the per-unit current the branch delivers to
// it. In a radial network this is the end away from the source; with
// sources on both sides it is the end away from the stronger one. A device
// at the other (upstream) end looks into the branch, away from the
// sources; a device at the downstream end (a transformer's LV incomer)
// looks the other way, into its bus.
func (e *Engine) Downstream(b int) (End, error) {
	from, to := e.net.BranchEnds(b)
	atTo, err := e.Solve(Fault{Place: AtBus(to), Kind: LLL, Case: Max})
	if err != nil {
		return To, err
	}
	atFrom, err := e.Solve(Fault{Place: AtBus(from), Kind: LLL, Case: Max})
	if err != nil {
		return To, err
	}
	toward := cmplx.Abs(atTo.At(Point{Branch: b, End: From}).Seq[pos]) / e.ibase[from]
	back := cmplx.Abs(atFrom.At(Point{Branch: b, End: To}).Seq[pos]) / e.ibase[to]
	if back > toward {
		return From, nil
	}
	return To, nil
}
