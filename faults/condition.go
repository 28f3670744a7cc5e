package faults

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"
)

// ElementRef names an element of a Network for messages: its kind as the
// study file names its table ("source", "generator", "line",
// "transformer", "earthing") and its name.
type ElementRef struct {
	Kind, Name string
}

func (r ElementRef) String() string { return fmt.Sprintf("%s %q", r.Kind, r.Name) }

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
	if len(e.Elements) >= 2 && e.Spread > conditionLimit {
		return fmt.Sprintf("%s: at and next to it, %s and %s differ in admittance by a factor of %.1e, more than the arithmetic can bear; check their impedances (a figure in the wrong unit?)",
			where, e.Elements[0], e.Elements[len(e.Elements)-1], e.Spread)
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
		kind := "line"
		if n.IsTransformer(b) {
			kind = "transformer"
		}
		at = append(at, elementY{bus: k, ref: ElementRef{kind, n.BranchName(b)}, y: y})
	}
	sort.SliceStable(at, func(i, j int) bool { return at[i].y > at[j].y })
	for _, a := range at {
		e.Elements = append(e.Elements, a.ref)
	}
	if len(at) >= 2 {
		e.Spread = at[0].y / at[len(at)-1].y
	}
	return e
}
