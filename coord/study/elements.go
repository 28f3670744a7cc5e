package study

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"tripgrade/coord"
	"tripgrade/faults"
)

func (b *builder) buildEarthings() {
	seen := map[string]int{}
	for i, r := range b.raw.Earthings {
		w := b.at("earthing", i, r.Name)
		b.named(w, r.Name, seen, "earthing")
		bus, _ := b.busRef(w, "bus", r.Bus)
		switch r.Kind {
		case "zigzag", "star-delta":
		case "":
			b.fail(w, "kind", "kind is missing (zigzag or star-delta)")
		default:
			b.fail(w, "kind", "kind = %q: want zigzag or star-delta", r.Kind)
		}
		e := faults.Earthing{Name: r.Name, Bus: bus}
		e.Z0Ohm = complex(b.optional(w, "r0_ohm", r.R0Ohm, 0, 0, math.Inf(1), false),
			b.optional(w, "x0_ohm", r.X0Ohm, 0, 0, math.Inf(1), false))
		e.NeutralZ = complex(b.optional(w, "neutral_ohm", r.NeutralOhm, 0, 0, math.Inf(1), false),
			b.optional(w, "neutral_x_ohm", r.NeutralX, 0, 0, math.Inf(1), false))
		if e.Z0Ohm+3*e.NeutralZ == 0 {
			b.fail(w, "x0_ohm", "give the zero-sequence impedance (r0_ohm, x0_ohm) and/or the neutral impedance (neutral_ohm); all are zero or missing")
		}
		b.net.Earthings = append(b.net.Earthings, e)
	}
}

func (b *builder) buildLoads() {
	seen := map[string]int{}
	for i, r := range b.raw.Loads {
		w := b.at("load", i, r.Name)
		if r.Name == "" {
			w.element = fmt.Sprintf("load %d", i+1)
		} else {
			b.named(w, r.Name, seen, "load")
		}
		bus, ok := b.busRef(w, "bus", r.Bus)
		l := coord.Load{Name: r.Name, Bus: bus}
		switch {
		case r.MVA != nil && r.CurrentA != nil:
			b.fail(w, "mva", "give either mva or current_a, not both")
		case r.MVA != nil:
			mva := b.positive(w, "mva", r.MVA)
			if ok && mva > 0 {
				l.CurrentA = ratedA(mva, b.net.Buses[bus].KV)
			}
		case r.CurrentA != nil:
			l.CurrentA = b.positive(w, "current_a", r.CurrentA)
		default:
			b.fail(w, "mva", "the load's size is missing: give mva or current_a")
		}
		b.st.Loads = append(b.st.Loads, l)
	}
}

// checkTopology reports islands with no source and transformer loops with
// inconsistent phase shifts.
func (b *builder) checkTopology() {
	for _, all := range b.net.Islands() {
		// A three-winding transformer's star point is no bus of the study.
		isl := make([]string, 0, len(all))
		for _, name := range all {
			if !b.internal(name) {
				isl = append(isl, name)
			}
		}
		if len(isl) == 0 || b.anyBadName(isl) {
			continue // none of the study's buses, or reported as the name's problem
		}
		first := isl[0]
		line := 0
		for k, bus := range b.net.Buses[:len(b.busOrigin)] {
			if bus.Name == first {
				line = b.lines.table("bus[" + strconv.Itoa(b.busOrigin[k]) + "]")
				break
			}
		}
		list := isl
		more := ""
		if len(list) > 6 {
			list, more = list[:6], fmt.Sprintf(" and %d more", len(isl)-6)
		}
		what := fmt.Sprintf("bus %q is", first)
		if len(isl) > 1 {
			what = fmt.Sprintf("buses %s%s are", strings.Join(quoteAll(list), ", "), more)
		}
		b.errorf(line, fmt.Sprintf("bus %q", first), "island with no source: %s not connected to any source or generator", what)
	}
	if _, err := b.net.ZoneAngles(); err != nil {
		if se, ok := err.(*faults.ShiftLoopError); ok {
			path := b.branchPath(se.Branch)
			element, what := fmt.Sprintf("line %q", se.Branch), "closes"
			if ref, ok := b.starOf[se.Branch]; ok {
				element, what = fmt.Sprintf("transformer3 %q", ref.unit), "its "+ref.winding+" winding closes"
			} else if strings.HasPrefix(path, "transformer") {
				element = fmt.Sprintf("transformer %q", se.Branch)
			}
			at := fmt.Sprintf(" at bus %q", se.Bus)
			if b.internal(se.Bus) {
				at = ""
			}
			b.errorf(b.lines.table(path), element,
				"%s a loop whose transformer phase shifts disagree by %.0f°%s; transformers in parallel must have the same clock number", what, se.Mismatch, at)
		}
	}
}

// anyBadName reports whether a bus of the list has a name already
// reported unreadable: its island most likely comes from references that
// were meant for it.
func (b *builder) anyBadName(buses []string) bool {
	for _, n := range buses {
		if b.badNames[n] {
			return true
		}
	}
	return false
}

// internal reports whether a bus name is a three-winding transformer's
// star point rather than a bus of the study. The star points are
// gathered on the first call, which comes after every element is built,
// so that an island of thousands of buses costs a lookup per bus.
func (b *builder) internal(name string) bool {
	if _, declared := b.bus[name]; declared {
		return false
	}
	if b.stars == nil {
		b.stars = map[string]bool{}
		for _, bus := range b.net.Buses {
			if bus.Internal {
				b.stars[bus.Name] = true
			}
		}
	}
	return b.stars[name]
}

func (b *builder) branchPath(name string) string {
	if p, ok := b.starPath[name]; ok {
		return p
	}
	return b.branchPaths[name]
}

func quoteAll(s []string) []string {
	q := make([]string, len(s))
	for i, v := range s {
		q[i] = fmt.Sprintf("%q", v)
	}
	return q
}
