package faults

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"
)

// ElementRef names an element of a Network for messages: its kind as the
// study file names its table ("source", "generator", "motor", "line",
// "transformer", "transformer3", "earthing") and its name.
type ElementRef struct {
	Kind, Name string
}

func (r ElementRef) String() string { return fmt.Sprintf("%s %q", r.Kind, r.Name) }

// branchRef names branch b: a star branch by its three-winding
// transformer, whose table the study file has.
func (n *Network) branchRef(b int) ElementRef {
	switch t, _, star := n.Star(b); {
	case star:
		return ElementRef{"transformer3", t.Name}
	case n.IsTransformer(b):
		return ElementRef{"transformer", n.BranchName(b)}
	}
	return ElementRef{"line", n.BranchName(b)}
}

// elementY is one element's admittance at a bus in one sequence network,
// in per unit, kept to explain a matrix that cannot be factored.
type elementY struct {
	bus int
	ref ElementRef
	y   float64
}

// ConditionError reports a sequence network that cannot be solved
// accurately: the factorization met a pivot at Bus that is negligible
// next to the admittances meeting there. The pivot is the bus's admittance
// to the reference through what was eliminated before it, so either the
// elements at and next to the bus differ so much in admittance that the
// arithmetic loses every digit (a figure in the wrong unit, a tie of
// 1e-9 Ω next to a source of 1 kVA), or a part of the network has no
// impedance to the rest. Elements lists what meets at the bus and at its
// neighbours, the largest admittance first.
type ConditionError struct {
	Case     Case
	Sequence string
	Bus      string
	Elements []ElementRef
	// Spread is the ratio of the largest to the smallest admittance
	// meeting at the bus (0 with fewer than two).
	Spread float64
	// Region is the number of buses of a part of the network held to the
	// rest (or to earth) by admittances Spread times weaker than one
	// within it; Elements are then that strongest element and the
	// strongest tie. Zero when the trouble is at Bus alone.
	Region int
}

// conditionLimit is the spread of admittances at one bus beyond which the
// message blames the spread: the factorization keeps about
// −log10(PivotTolerance) = 12 digits, so a spread near 1e12 leaves none.
const conditionLimit = 1e10

func (e *ConditionError) Error() string {
	cs := "maximum"
	if e.Case == Min {
		cs = "minimum"
	}
	where := fmt.Sprintf("the %s-sequence network of the %s case cannot be solved accurately at bus %q", e.Sequence, cs, e.Bus)
	if e.Region > 0 && len(e.Elements) == 2 {
		part := "the network"
		if e.Region > 1 {
			part = fmt.Sprintf("the %d buses around it", e.Region)
		}
		return fmt.Sprintf("%s: %s hang on %s, whose admittance is %s times smaller than that of %s among them, more than the arithmetic can bear; check their impedances (a figure in the wrong unit?)",
			where, part, e.Elements[1], spreadText(e.Spread), e.Elements[0])
	}
	if len(e.Elements) >= 2 && e.Spread > conditionLimit {
		return fmt.Sprintf("%s: at and next to it, %s and %s differ in admittance by a factor of %s, more than the arithmetic can bear; check their impedances (a figure in the wrong unit?)",
			where, e.Elements[0], e.Elements[len(e.Elements)-1], spreadText(e.Spread))
	}
	if len(e.Elements) == 0 {
		return where + ": nothing connects it to the rest of the network in this sequence"
	}
	list := e.Elements
	more := ""
	if len(list) > 6 {
		list, more = list[:6], fmt.Sprintf(" and %d more", len(e.Elements)-6)
	}
	names := make([]string, len(list))
	for i, r := range list {
		names[i] = r.String()
	}
	return fmt.Sprintf("%s: a part of the network has no impedance to the rest there (elements at and next to the bus: %s%s)", where, strings.Join(names, ", "), more)
}

// spreadText prints a ratio of admittances, which may exceed any number.
func spreadText(r float64) string {
	if math.IsInf(r, 1) || math.IsNaN(r) {
		return "more than 1e+308"
	}
	return fmt.Sprintf("%.1e", r)
}

// conditionError explains a failed pivot at bus k of sequence network d.
func conditionError(n *Network, d *seqData, cs Case, seq, k int) *ConditionError {
	e := &ConditionError{Case: cs, Sequence: seqName[seq], Bus: n.Buses[k].Name}
	near := map[int]bool{k: true}
	for b, blk := range d.branch {
		if f, t := n.BranchEnds(b); (f == k || t == k) && blk != (block{}) {
			near[f], near[t] = true, true
		}
	}
	var at []elementY
	for _, s := range d.shunts {
		if near[s.bus] && s.y > 0 {
			at = append(at, s)
		}
	}
	for b, blk := range d.branch {
		f, t := n.BranchEnds(b)
		if !near[f] && !near[t] {
			continue
		}
		y := math.Max(cmplx.Abs(blk.ft), math.Max(cmplx.Abs(blk.ff), cmplx.Abs(blk.tt)))
		if y == 0 || math.IsNaN(y) {
			continue
		}
		at = append(at, elementY{bus: k, ref: n.branchRef(b), y: y})
	}
	sort.SliceStable(at, func(i, j int) bool { return at[i].y > at[j].y })
	named := map[ElementRef]bool{} // a three-winding transformer's windings name it once
	var kept []float64
	for _, a := range at {
		if !named[a.ref] {
			named[a.ref] = true
			e.Elements = append(e.Elements, a.ref)
			kept = append(kept, a.y)
		}
	}
	if len(kept) >= 2 {
		e.Spread = kept[0] / kept[len(kept)-1]
	}
	return e
}

// estimateInverseNorm estimates ‖A⁻¹‖₁ of the factored complex symmetric
// matrix by Hager's method as Higham extended it to complex matrices
// (N. J. Higham, "FORTRAN codes for estimating the one-norm of a real or
// complex matrix", ACM TOMS 14(4), 1988, Algorithm 4.1, the basis of
// LAPACK's ZLACON), with solves by A and by Aᴴ = conj(A) (A is complex
// symmetric, so Aᴴ⁻¹v = conj(A⁻¹ conj(v))). The estimate is a lower
// bound, rarely more than a few times low. It also returns the last
// A⁻¹x, whose largest entries mark the buses the trouble is worst at.
func estimateInverseNorm(solve func([]complex128), n int) (float64, []complex128) {
	x := make([]complex128, n)
	for i := range x {
		x[i] = complex(1/float64(n), 0)
	}
	y := make([]complex128, n)
	est, last := 0.0, -1
	for iter := 0; iter < 5; iter++ {
		copy(y, x)
		solve(y)
		newEst := norm1(y)
		if iter > 0 && newEst <= est {
			break
		}
		est = newEst
		// ξ = sign(y); z = A⁻ᴴ ξ.
		z := make([]complex128, n)
		for i, v := range y {
			if a := cmplx.Abs(v); a > 0 {
				z[i] = cmplx.Conj(v / complex(a, 0))
			} else {
				z[i] = 1
			}
		}
		solve(z)
		for i := range z {
			z[i] = cmplx.Conj(z[i])
		}
		j, zmax := 0, -1.0
		for i, v := range z {
			if a := cmplx.Abs(v); a > zmax {
				j, zmax = i, a
			}
		}
		if j == last {
			break
		}
		last = j
		clear(x)
		x[j] = 1
	}
	// Higham's safeguard against special structure: an alternating vector.
	alt := make([]complex128, n)
	for i := range alt {
		s := 1.0
		if i%2 == 1 {
			s = -1
		}
		alt[i] = complex(s*(1+float64(i)/math.Max(1, float64(n-1))), 0)
	}
	solve(alt)
	if a := 2 * norm1(alt) / (3 * float64(n)); a > est {
		est = a
		copy(y, alt)
	}
	return est, y
}

func norm1(v []complex128) float64 {
	s := 0.0
	for _, x := range v {
		s += cmplx.Abs(x)
	}
	return s
}

// maxCondition is the largest condition number (in the 1-norm, as
// estimated) of a sequence admittance matrix whose results the engine
// returns: with a unit rounding error of 1.1e-16 they keep about six
// correct digits (the forward error is bounded by the condition number
// times the backward error of the factorization, Higham, "Accuracy and
// Stability of Numerical Algorithms", 2002, §7.1). The matrices of real
// networks stay near 1e2 to 1e6 (measured: the bundled examples 3e2 to
// 4e3, generated meshed networks of 300 to 10,000 buses up to 2e5).
const maxCondition = 1e10

// checkCondition estimates the condition number of the factored matrix
// and, beyond maxCondition, names the elements to blame.
func (s *seqNet) checkCondition(n *Network, cs Case, seq int) error {
	m := s.fac.Size()
	if m == 0 {
		return nil
	}
	colsum := make([]float64, m)
	for i, y := range s.shunt {
		if r := s.row[i]; r >= 0 {
			colsum[r] += cmplx.Abs(y)
		}
	}
	for b, blk := range s.branch {
		f, t := n.BranchEnds(b)
		rf, rt := s.row[f], s.row[t]
		if rf >= 0 {
			colsum[rf] += cmplx.Abs(blk.ff)
		}
		if rt >= 0 {
			colsum[rt] += cmplx.Abs(blk.tt)
		}
		if rf >= 0 && rt >= 0 {
			colsum[rf] += cmplx.Abs(blk.ft)
			colsum[rt] += cmplx.Abs(blk.ft)
		}
	}
	norm := 0.0
	for _, c := range colsum {
		norm = math.Max(norm, c)
	}
	inv, y := estimateInverseNorm(s.fac.Solve, m)
	if cond := norm * inv; !(cond > maxCondition) && !math.IsNaN(cond) {
		return nil
	}
	return s.weakRegion(n, cs, seq, y)
}

// weakRegion explains an ill-conditioned matrix from the solution y that
// the estimate found: where |y| is large, the buses hang together and
// float on weak ties. It names the strongest element among those buses
// and the strongest of their ties to the rest and to earth.
func (s *seqNet) weakRegion(n *Network, cs Case, seq int, y []complex128) *ConditionError {
	peak, top := 0.0, 0
	bus := make([]int, len(y)) // matrix row → bus
	for i, r := range s.row {
		if r >= 0 {
			bus[r] = i
		}
	}
	for r, v := range y {
		if a := cmplx.Abs(v); a > peak {
			peak, top = a, bus[r]
		}
	}
	in := make([]bool, len(n.Buses))
	size := 0
	for r, v := range y {
		if cmplx.Abs(v) >= peak/2 {
			in[bus[r]] = true
			size++
		}
	}
	var strong, tie elementY
	for _, sh := range s.shunts {
		if in[sh.bus] && sh.y > tie.y {
			tie = sh
		}
	}
	for b, blk := range s.branch {
		f, t := n.BranchEnds(b)
		y := math.Max(cmplx.Abs(blk.ft), math.Max(cmplx.Abs(blk.ff), cmplx.Abs(blk.tt)))
		if y == 0 || (!in[f] && !in[t]) {
			continue
		}
		e := elementY{ref: n.branchRef(b), y: y}
		switch {
		case in[f] && in[t] && blk.ft != 0:
			if y > strong.y {
				strong = e
			}
		case y > tie.y: // to the rest, or to earth through a delta winding
			tie = e
		}
	}
	if strong.y == 0 || tie.y == 0 {
		return conditionError(n, s.seqData, cs, seq, top)
	}
	return &ConditionError{Case: cs, Sequence: seqName[seq], Bus: n.Buses[top].Name,
		Elements: []ElementRef{strong.ref, tie.ref}, Spread: strong.y / tie.y, Region: size}
}
