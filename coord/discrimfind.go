package coord

import (
	"fmt"
	"math"
	"strings"
)

// discrimination judges every fault of the study one by one and returns
// the findings of the fault-clearing and discrimination checks.
func (c *checker) discrimination() ([]Finding, []string, error) {
	x := newNetIndex(c.s, c.eng, c.topo.ratioKV, c.timers)
	x.topo = c.topo
	x.hook = c.hook
	x.region = c.region
	t, err := x.runPass(c.s.Criteria)
	if err != nil {
		return nil, nil, err
	}
	g := c.region
	var notes []string
	for _, name := range c.s.OwnProtection {
		n := t.ownFaults[name]
		if !g.infeed(c.s.Network, name) {
			n = g.prior.ownFaults[name]
		}
		if c.keep != nil {
			c.keep.ownFaults[name] = n
		}
		if n > 0 {
			notes = append(notes, fmt.Sprintf("%d faults are fed by %s with no device of the study between: that part is left to its own protection (the supply's, or the machine's), taken to act within the maximum clearing time %g s", n, name, c.s.Criteria.MaxClearingS))
		}
	}
	var only []string
	for i := 0; i < len(t.clears); i++ {
		left := t.ownOnly[i] && !t.clears[i].valid
		if !x.elementIn(i) {
			left = g.prior.ownOnly[x.elementKey(i)]
		}
		if left {
			only = append(only, x.elementName(i))
			if c.keep != nil {
				c.keep.ownOnly[x.elementKey(i)] = true
			}
		}
	}
	if len(only) > 0 {
		const shown = 12
		list := strings.Join(only[:min(len(only), shown)], ", ")
		if len(only) > shown {
			list += fmt.Sprintf(" and %d more", len(only)-shown)
		}
		notes = append(notes, fmt.Sprintf("no device of the study clears any fault of %s: they are left to the declared own protection above, and have no fault-clearing finding", list))
	}
	fs := append(x.clearingFindings(t, c.keep), x.discriminationFindings(t, c.keep)...)
	return fs, notes, nil
}

// elementIn reports whether element i (buses first, then branches) lies
// in the region checked.
func (x *netIndex) elementIn(i int) bool {
	if i < len(x.n.Buses) {
		return x.region.bus(i)
	}
	return x.region.branch(x.n, i-len(x.n.Buses))
}

// elementKey names element i apart from any other element: a bus and a
// branch may share a name.
func (x *netIndex) elementKey(i int) string {
	if i < len(x.n.Buses) {
		return "bus\x00" + x.n.Buses[i].Name
	}
	return "branch\x00" + x.n.BranchName(i-len(x.n.Buses))
}

// elementName names element index i (buses first, then branches).
func (x *netIndex) elementName(i int) string {
	if i < len(x.n.Buses) {
		return x.n.Buses[i].Name
	}
	return x.n.BranchName(i - len(x.n.Buses))
}

func (x *netIndex) names(ds []int) string {
	parts := make([]string, len(ds))
	for i, d := range ds {
		parts[i] = x.s.Devices[d].Name
	}
	return strings.Join(parts, ", ")
}

// clearingFindings gives one finding per faulted element (buses, then
// branches, in study order), and one warning per source or generator that
// feeds faults along a path without any device of the study.
func (x *netIndex) clearingFindings(t *tally, keep *reusable) []Finding {
	var out []Finding
	for i := range t.clears {
		fs, _ := item(x.region, keep, partClearing, x.elementKey(i), x.elementIn(i), func() ([]Finding, error) { return x.clearingFinding(t, i), nil })
		out = append(out, fs...)
	}
	return out
}

// clearingFinding gives element i's clearing finding, if it has one.
func (x *netIndex) clearingFinding(t *tally, i int) []Finding {
	crit := x.s.Criteria
	r := t.clears[i]
	if names := t.outside[i]; len(names) > 0 {
		f := unchecked(Clearing, fmt.Sprintf("faults on it are fed by %s with no device of the study between: their clearing is left to protection outside the study (declare own_protection on a source or generator whose own protection removes its infeed)",
			strings.Join(names, ", ")))
		f.Device = x.elementName(i)
		if r.valid {
			f.Other = x.names(r.must)
		}
		return []Finding{f}
	}
	if !r.valid && r.unjudged == 0 && r.declared == 0 {
		return nil
	}
	name := x.elementName(i)
	var gaps []string
	if r.unjudged > 0 {
		gaps = append(gaps, fmt.Sprintf("%d faults, where %s's curve gives no time at the fault current (outside its table's points)", r.unjudged, x.s.Devices[r.undef].Name))
	}
	if r.declared > 0 {
		d := &x.s.Devices[r.declaredBy-1]
		gaps = append(gaps, fmt.Sprintf("%d earth faults that drive no residual current through %s, left to \"%s\" (declared by the study)", r.declared, d.Name, d.EarthFaultsBy))
	}
	undefNote := ""
	if len(gaps) > 0 {
		undefNote = "not checked: " + joinNotes(gaps...)
	}
	if !r.valid {
		f := unchecked(Clearing, joinNotes(gaps...))
		f.Device = name
		if r.unjudged > 0 {
			f.Other = x.s.Devices[r.undef].Name
		} else {
			f.Other = x.s.Devices[r.declaredBy-1].Name
		}
		return []Finding{f}
	}
	ref := &FaultRef{Kind: r.key.kind, Case: r.key.cs, Place: PlaceName(x.n, r.place)}
	var f Finding
	switch {
	case r.board >= 0:
		f = Finding{Check: Clearing, Verdict: Fail, Fault: ref,
			Note: fmt.Sprintf("unprotected: no device where it is fed from %s, whose other circuits have their own; its faults are cleared only by %s, which also disconnect%s the rest of %s",
				x.n.Buses[r.board].Name, orNone(x.names(r.must)), plural(len(r.must)), x.n.Buses[r.board].Name)}
	case math.IsInf(r.isoS, 1):
		f = Finding{Check: Clearing, Verdict: Fail, Fault: ref, Note: "not cleared: " + x.notClearedWhy(r)}
	default:
		f = atMost(Clearing, r.isoS, crit.MaxClearingS, "s")
		f.Fault = ref
		f.Note = x.clearedNote(r)
		if f.Verdict == Fail {
			f.Note = joinNotes("cleared too late", f.Note)
		}
	}
	if undefNote != "" {
		f.Note = joinNotes(f.Note, undefNote)
		if f.Verdict == Pass {
			f.Verdict = Warn
		}
	}
	f.Device, f.Other = name, x.names(r.must)
	return []Finding{f}
}

func orNone(s string) string {
	if s == "" {
		return "no device"
	}
	return s
}

func plural(n int) string {
	if n == 1 {
		return "s"
	}
	return ""
}

// notClearedWhy explains a fault that is never isolated.
func (x *netIndex) notClearedWhy(r clearRecord) string {
	var parts []string
	if len(r.failed) > 0 {
		parts = append(parts, fmt.Sprintf("on a side fed by a source, %s do%s not operate", x.names(r.failed), map[bool]string{true: "es", false: ""}[len(r.failed) == 1]))
	}
	if len(r.sequence) > 0 {
		parts = append(parts, "after "+x.sequenceText(r.sequence)+" the fault is still fed and nothing else operates")
	}
	if len(parts) == 0 {
		parts = append(parts, "no device operates")
	}
	return strings.Join(parts, "; ")
}

// clearedNote names who clears the element's slowest fault and, for a
// fault fed from more than one side, the sequence of openings.
func (x *netIndex) clearedNote(r clearRecord) string {
	if len(r.sequence) > 0 {
		return "isolated by " + x.sequenceText(r.sequence)
	}
	if r.above >= 0 && r.valid {
		return fmt.Sprintf("at most: %s's current is above its clearing table's last point, whose time is taken", x.s.Devices[r.above].Name)
	}
	return "" // the column names who clears it
}

// sequenceText describes the openings of a sequence: "R1 at 0.412 s
// (3120 A), then R2 at 0.688 s (2010 A → 4150 A)".
func (x *netIndex) sequenceText(evs []event) string {
	parts := make([]string, len(evs))
	for i, e := range evs {
		if e.dev < 0 {
			parts[i] = fmt.Sprintf("%s's own protection (declared; taken to act within %g s)", e.infeed, x.s.Criteria.MaxClearingS)
			continue
		}
		cur := fmtA(e.intactA) + " A"
		if math.Abs(e.openA-e.intactA) > 1e-3*math.Max(e.openA, e.intactA) {
			cur = fmtA(e.intactA) + " A → " + fmtA(e.openA) + " A"
		}
		s := fmt.Sprintf("%s at %.3f s (%s)", x.s.Devices[e.dev].Name, e.atS, cur)
		parts[i] = s
	}
	return strings.Join(parts, ", then ")
}

// discriminationFindings gives one finding per device: its worst
// operation for a fault outside its zone.
func (x *netIndex) discriminationFindings(t *tally, keep *reusable) []Finding {
	var out []Finding
	for d := range x.s.Devices {
		fs, _ := item(x.region, keep, partDiscrimination, x.s.Devices[d].Name, x.region.device(x.s, d), func() ([]Finding, error) {
			return []Finding{x.discriminationFinding(t, d)}, nil
		})
		out = append(out, fs...)
	}
	return out
}

// discriminationFinding gives device d's discrimination finding.
func (x *netIndex) discriminationFinding(t *tally, d int) Finding {
	r := t.ops[d]
	name := x.s.Devices[d].Name
	if !r.valid {
		return Finding{Check: Discrimination, Device: name, Verdict: Pass,
			Note: "does not operate for any fault of the study that other devices must clear"}
	}
	f := atLeast(Discrimination, r.margin, r.required, "s")
	f.Device, f.Other = name, x.s.Devices[r.relief].Name
	place := PlaceName(x.n, r.place)
	ref := &FaultRef{Kind: r.key.kind, Case: r.key.cs, Place: place, Interpolated: r.scale < 1,
		DeviceA: r.dA, OtherA: r.reliefA, DeviceS: r.dS, OtherS: r.reliefS, DeviceQty: r.dQty, OtherQty: r.reliefQty}
	f.Fault = ref
	dir := "current from its bus into its branch"
	if !r.forward {
		dir = "current from its branch into its bus"
	}
	what := "operates"
	if x.s.Devices[d].Kind == Fuse {
		what = "melts"
	}
	f.Note = fmt.Sprintf("%s for a fault %s must clear (%s)", what, f.Other, dir)
	if r.scale < 1 {
		f.Note += fmt.Sprintf(", at %.0f %% of the bolted fault's current", 100*r.scale)
	}
	if r.tripped {
		f.Note += "; it trips before the fault is isolated"
	}
	if dev := x.s.Devices[d]; dev.Kind == Fuse {
		if _, hi := dev.Melt.Span(); r.dA > hi {
			f.Note += fmt.Sprintf("; its current is above its melting table's last point (%s A), where the table gives no time: taken to melt at once", fmtA(hi))
		}
	}
	f.Note += fmt.Sprintf("; %d faults where it operates for another device's fault", r.count)
	return f
}
