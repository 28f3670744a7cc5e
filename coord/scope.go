package coord

import (
	"fmt"
	"strings"

	"tripgrade/faults"
)

// Scope narrows a check to the devices a gate is about: devices named
// directly, and every device on a named line or transformer and on
// everything beyond it away from the sources (its feeder). Their backups,
// the devices of the pairs that back them up, come along for those pairs'
// findings only.
type Scope struct {
	// Names are the names given, in order.
	Names []string
	// Devices are the selected devices and Backups the devices backing
	// them up that are not selected themselves, each in study order.
	Devices, Backups []int

	in, backup map[string]bool // by device name
}

// NewScope resolves names (device, line or transformer names) against a
// study and its backup pairs. A name that is none of these is an error.
func NewScope(s *Study, t *Topology, pairs []Pair, names []string) (*Scope, error) {
	dev := map[string]int{}
	for i, d := range s.Devices {
		dev[d.Name] = i
	}
	br := map[string]int{}
	for b := 0; b < s.Network.BranchCount(); b++ {
		br[s.Network.BranchName(b)] = b
	}
	sel := make([]bool, len(s.Devices))
	var bad []string
	for _, n := range names {
		if i, ok := dev[n]; ok {
			sel[i] = true
			continue
		}
		b, ok := br[n]
		if !ok {
			bad = append(bad, fmt.Sprintf("%q", n))
			continue
		}
		feeder := feederBranches(s.Network, t, b)
		for i, d := range s.Devices {
			if feeder[d.Point.Branch] {
				sel[i] = true
			}
		}
	}
	if len(bad) > 0 {
		return nil, fmt.Errorf("--scope: no relay, fuse, line or transformer named %s", strings.Join(bad, ", "))
	}
	sc := &Scope{Names: names, in: map[string]bool{}, backup: map[string]bool{}}
	for i, ok := range sel {
		if ok {
			sc.Devices = append(sc.Devices, i)
			sc.in[s.Devices[i].Name] = true
		}
	}
	isBackup := make([]bool, len(s.Devices))
	for _, p := range pairs {
		if sel[p.Downstream] && !sel[p.Upstream] {
			isBackup[p.Upstream] = true
		}
	}
	for i, ok := range isBackup {
		if ok {
			sc.Backups = append(sc.Backups, i)
			sc.backup[s.Devices[i].Name] = true
		}
	}
	return sc, nil
}

// feederBranches returns branch b and every branch beyond its downstream
// end, walking away from the sources.
func feederBranches(n *faults.Network, t *Topology, b int) map[int]bool {
	out := map[int]bool{b: true}
	down := func(br int) (bus int) {
		from, to := n.BranchEnds(br)
		if t.Downstream[br] == faults.From {
			return from
		}
		return to
	}
	stack := []int{down(b)}
	seen := map[int]bool{}
	for len(stack) > 0 {
		bus := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if seen[bus] {
			continue
		}
		seen[bus] = true
		for _, br := range t.BranchesAt(bus) {
			if out[br] || down(br) == bus {
				continue // already taken, or it feeds this bus
			}
			out[br] = true
			stack = append(stack, down(br))
		}
	}
	return out
}

// Keeps reports whether a finding, by its device and other device, is
// about the scope: its device is selected, or its other device is (the
// pair below a selected device, whose upstream device's setting the gate
// is about).
func (sc *Scope) Keeps(device, other string) bool {
	return sc.in[device] || sc.in[other]
}

// Apply keeps in r the findings and pairs the scope is about and returns
// the findings left out.
func (sc *Scope) Apply(s *Study, r *Result) (left []Finding) {
	kept := r.Findings[:0:0]
	for _, f := range r.Findings {
		keep := sc.Keeps(f.Device, f.Other)
		if f.Check == Clearing {
			// A fault-clearing finding is about an element; it belongs
			// to the scope when a device of the scope clears it.
			for _, name := range strings.Split(f.Other, ", ") {
				keep = keep || sc.in[name]
			}
		}
		if keep {
			kept = append(kept, f)
		} else {
			left = append(left, f)
		}
	}
	r.Findings = kept
	var pairs []Pair
	for _, p := range r.Pairs {
		if sc.Keeps(s.Devices[p.Downstream].Name, s.Devices[p.Upstream].Name) {
			pairs = append(pairs, p)
		}
	}
	r.Pairs = pairs
	return left
}
