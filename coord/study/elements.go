package study

import (
	"fmt"
	"math"
	"strings"

	"tripgrade/coord"
	"tripgrade/faults"
)

func (b *builder) buildEarthings() {
	seen := map[string]int{}
	for i, r := range b.raw.Earthings {
		w := where{path: fmt.Sprintf("earthing[%d]", i), element: fmt.Sprintf("earthing %q", r.Name)}
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
		w := where{path: fmt.Sprintf("load[%d]", i), element: fmt.Sprintf("load %q", r.Name)}
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
		var isl []string
		for _, name := range all {
			if !b.internal(name) {
				isl = append(isl, name)
			}
		}
		if len(isl) == 0 {
			continue
		}
		first := isl[0]
		line := 0
		for i, r := range b.raw.Buses {
			if r.Name == first {
				line = b.lines.table(fmt.Sprintf("bus[%d]", i))
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

// internal reports whether a bus name is a three-winding transformer's
// star point rather than a bus of the study.
func (b *builder) internal(name string) bool {
	_, declared := b.bus[name]
	if declared {
		return false
	}
	for _, bus := range b.net.Buses {
		if bus.Name == name {
			return bus.Internal
		}
	}
	return false
}

func (b *builder) branchPath(name string) string {
	if p, ok := b.starPath[name]; ok {
		return p
	}
	k, ok := b.branch[name]
	if !ok {
		return ""
	}
	if k < len(b.raw.Lines) {
		return fmt.Sprintf("line[%d]", k)
	}
	return fmt.Sprintf("transformer[%d]", k-len(b.raw.Lines))
}

func quoteAll(s []string) []string {
	q := make([]string, len(s))
	for i, v := range s {
		q[i] = fmt.Sprintf("%q", v)
	}
	return q
}
