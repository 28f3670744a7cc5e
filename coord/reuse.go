package coord

import (
	"slices"

	"tripgrade/faults"
)

// Islands. Buses that no branch joins carry no current between them: a
// fault in one island is fed, seen and cleared within it, and every
// finding of a device or an element there is made of that island's faults
// alone. The engine keeps them apart in its arithmetic too (its ordering
// and factors of one island do not depend on another's), so an island
// that a scenario leaves as drawn gives, figure for figure, the findings
// it gives as drawn. An outage of the N-1 sweep changes one island (the
// one holding the element); its check works out that island's findings
// and takes every other island's from the check of the study as drawn.
// TestOutageReusesUntouchedIslands holds the two to the whole check of
// each outage, byte for byte.

// part names one check's findings of one item: a device, a pair, a
// faulted element or a protected branch.
type part uint8

const (
	partClearing part = iota
	partDiscrimination
	partGrading
	partPrimary
	partBackup
	partLoad
	partReach
	partInrush
	partDamage
	partAudit
)

type itemKey struct {
	part part
	name string
}

// reusable is what the check of a study as drawn hands on to the checks
// of its outages: the findings of every item, and the counts behind the
// notes of the fault-by-fault pass.
type reusable struct {
	findings  map[itemKey][]Finding
	ownFaults map[string]int  // faults fed by a named infeed with no device between
	ownOnly   map[string]bool // elements (by elementKey) left to declared own protection
}

func newReusable() *reusable {
	return &reusable{findings: map[itemKey][]Finding{}, ownFaults: map[string]int{}, ownOnly: map[string]bool{}}
}

// put records an item's findings (a copy: the result's own findings may be
// tagged, filtered or reordered by whoever takes the result).
func (u *reusable) put(p part, name string, fs []Finding) {
	if len(fs) > 0 {
		u.findings[itemKey{p, name}] = slices.Clone(fs)
	}
}

// get returns a copy of an item's findings.
func (u *reusable) get(p part, name string) []Finding {
	return slices.Clone(u.findings[itemKey{p, name}])
}

// region is the island(s) a scenario changes, in the scenario's study:
// the items there are checked, every other item's findings are taken
// from the study as drawn.
type region struct {
	prior *reusable
	in    []bool // by bus of the scenario's network
}

// elementBuses returns the buses of the network elements of the given
// names: the ends of lines and transformers (all windings of a
// three-winding one), the buses of sources, generators and motors.
func elementBuses(n *faults.Network, names []string) []int {
	want := map[string]bool{}
	for _, s := range names {
		want[s] = true
	}
	var out []int
	for i, l := range n.Lines {
		if want[l.Name] {
			f, t := n.BranchEnds(i)
			out = append(out, f, t)
		}
	}
	for i, t := range n.Transformers {
		if want[t.Name] {
			f, to := n.BranchEnds(len(n.Lines) + i)
			out = append(out, f, to)
		}
	}
	for _, t := range n.Transformers3 {
		if want[t.Name] {
			out = append(out, t.Buses[:]...)
		}
	}
	for _, s := range n.Sources {
		if want[s.Name] {
			out = append(out, s.Bus)
		}
	}
	for _, g := range n.Generators {
		if want[g.Name] {
			out = append(out, g.Bus)
		}
	}
	for _, m := range n.Motors {
		if want[m.Name] {
			out = append(out, m.Bus)
		}
	}
	return out
}

// changedRegion returns the region of scenario study st that an outage of
// the named elements changes: the buses of the islands of the study as
// drawn (network drawn) that hold those elements, found in st by name. It
// returns nil when an element is not found or a bus of one network is not
// in the other: then nothing is taken over.
func changedRegion(drawn, st *faults.Network, out []string, prior *reusable) *region {
	if len(out) == 0 || len(drawn.Buses) != len(st.Buses) {
		return nil
	}
	var at []int
	for _, name := range out {
		ks := elementBuses(drawn, []string{name})
		if len(ks) == 0 {
			return nil
		}
		at = append(at, ks...)
	}
	isl := drawn.PartLabels()
	changed := map[int]bool{}
	for _, k := range at {
		changed[isl[k]] = true
	}
	index := map[string]int{}
	for k, b := range drawn.Buses {
		index[b.Name] = k
	}
	g := &region{prior: prior, in: make([]bool, len(st.Buses))}
	for k, b := range st.Buses {
		j, ok := index[b.Name]
		if !ok {
			return nil
		}
		g.in[k] = changed[isl[j]]
	}
	return g
}

// bus reports whether bus k lies in the region (every bus does when there
// is no region).
func (g *region) bus(k int) bool { return g == nil || g.in[k] }

// branch reports whether branch b lies in the region.
func (g *region) branch(n *faults.Network, b int) bool {
	f, _ := n.BranchEnds(b)
	return g.bus(f)
}

// device reports whether device d of study s lies in the region.
func (g *region) device(s *Study, d int) bool {
	if g == nil {
		return true
	}
	pt := s.Devices[d].Point
	f, t := s.Network.BranchEnds(pt.Branch)
	if pt.End == faults.To {
		f = t
	}
	return g.in[f]
}

// infeed reports whether the source or generator of the given name lies
// in the region.
func (g *region) infeed(n *faults.Network, name string) bool {
	if g == nil {
		return true
	}
	for _, src := range n.Sources {
		if src.Name == name && g.in[src.Bus] {
			return true
		}
	}
	for _, gen := range n.Generators {
		if gen.Name == name && g.in[gen.Bus] {
			return true
		}
	}
	return false
}

// item gives one item's findings in a check: in region g (every item
// when g is nil), those run makes, settled; outside it, those the study
// as drawn gave. With keep, the item's findings are recorded there (keep
// is not safe for concurrent use: a caller on several goroutines passes
// nil and records afterwards).
func item(g *region, keep *reusable, p part, name string, in bool, run func() ([]Finding, error)) ([]Finding, error) {
	var fs []Finding
	if !in {
		fs = g.prior.get(p, name)
	} else {
		var err error
		if fs, err = run(); err != nil {
			return nil, err
		}
		for i := range fs {
			settle(&fs[i])
		}
	}
	if keep != nil {
		keep.put(p, name, fs)
	}
	return fs, nil
}
