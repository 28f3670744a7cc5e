package study

import "strings"

// A switch — a bus coupler, a bus section, a normally open point, a tie —
// joins two buses of one voltage with no impedance of its own. The fault
// engine has no branch for it: a branch of zero impedance would make the
// admittance matrices singular, and a tiny stand-in impedance would spoil
// their conditioning (and the results' digits) in proportion to how tiny
// it is. A closed switch therefore makes its two buses one bus of the
// model, named after both ("MAIN-A+MAIN-B", mergedSeparator), and an open
// one leaves them apart. Every element keeps the names it was declared
// with: a device says "at" the bus of its own end, whatever that bus is
// tied to.

// rawSwitch is a [[switch]] table.
type rawSwitch struct {
	Name   string `key:"name"`
	From   string `key:"from"`
	To     string `key:"to"`
	Closed *bool  `key:"closed"`
}

// mergedSeparator joins the names of buses that closed switches make one
// bus of the model, as the reports name it.
const mergedSeparator = "+"

// switchState is a switch as the study draws it.
type switchState struct {
	closed bool
	index  int // its table's index
}

// buildSwitches reads the switches and returns, for every bus (by table
// index), the first bus of the group that the closed switches tie it to
// (itself when none). A scenario's switch states replace those of the
// file. kvs are the buses' voltages (NaN where unreadable).
func (b *builder) buildSwitches(kvs []float64) []int {
	first := make([]int, len(b.raw.Buses))
	for i := range first {
		first[i] = i
	}
	var root func(i int) int
	root = func(i int) int {
		for first[i] != i {
			first[i] = first[first[i]]
			i = first[i]
		}
		return i
	}
	b.switches = map[string]switchState{}
	seen := map[string]int{}
	for i, r := range b.raw.Switches {
		w := b.at("switch", i, r.Name)
		named := b.named(w, r.Name, seen, "switch")
		from, okF := b.rawBusRef(w, "from", r.From)
		to, okT := b.rawBusRef(w, "to", r.To)
		ok := okF && okT
		if ok && from == to {
			b.fail(w, "to", "from and to are the same bus %q", r.From)
			ok = false
		} else if ok && kvs[from] > 0 && kvs[to] > 0 && kvs[from] != kvs[to] {
			b.fail(w, "to", "joins bus %q at %g kV to bus %q at %g kV; a switch joins buses of one voltage", r.From, kvs[from], r.To, kvs[to])
			ok = false
		}
		if r.Closed == nil {
			if !b.blamedAny(w, "closed") {
				b.fail(w, "closed", "closed is missing: true or false, the switch as normally operated")
			}
			continue
		}
		if named {
			b.switches[r.Name] = switchState{closed: *r.Closed, index: i}
		}
		if ok && b.switchClosed(r) {
			// The group is known by its first bus, so the model keeps
			// the buses in the file's order.
			a, c := root(from), root(to)
			if a > c {
				a, c = c, a
			}
			first[c] = a
		}
	}
	for i := range first {
		first[i] = root(i)
	}
	return first
}

// rawBusRef resolves a bus name to its table's index (busRef resolves it
// to the bus of the model).
func (b *builder) rawBusRef(w where, key, name string) (int, bool) {
	return b.busIn(b.busRaw, w, key, name)
}

// tiedBy names the closed switches that tie the buses named x and y
// into one bus of the model, for a message about an element between
// them: the switches on a shortest path of closed switches from x to y.
func (b *builder) tiedBy(x, y string) []string {
	type step struct{ bus, via, prev int }
	from, okX := b.busRaw[x]
	to, okY := b.busRaw[y]
	if !okX || !okY {
		return nil
	}
	adj := map[int][][2]int{} // bus → (other bus, switch index)
	for i, r := range b.raw.Switches {
		if !b.switchClosed(r) {
			continue
		}
		f, okF := b.busRaw[r.From]
		t, okT := b.busRaw[r.To]
		if okF && okT {
			adj[f] = append(adj[f], [2]int{t, i})
			adj[t] = append(adj[t], [2]int{f, i})
		}
	}
	steps := []step{{bus: from, via: -1, prev: -1}}
	seen := map[int]bool{from: true}
	for k := 0; k < len(steps); k++ {
		if steps[k].bus == to {
			var names []string
			for j := k; steps[j].via >= 0; j = steps[j].prev {
				names = append([]string{b.raw.Switches[steps[j].via].Name}, names...)
			}
			return names
		}
		for _, e := range adj[steps[k].bus] {
			if !seen[e[0]] {
				seen[e[0]] = true
				steps = append(steps, step{bus: e[0], via: e[1], prev: k})
			}
		}
	}
	return nil
}

// switchClosed reports whether a switch is closed in the configuration
// being built.
func (b *builder) switchClosed(r rawSwitch) bool {
	if b.cfg != nil {
		if c, set := b.cfg.switches[r.Name]; set {
			return c
		}
	}
	return r.Closed != nil && *r.Closed
}

func joinQuoted(names []string) string { return strings.Join(quoteAll(names), ", ") }

// sameBus reports an element between two buses that are one bus of the
// model: the same bus named twice, or two buses that closed switches tie
// together (which would short the element out).
func (b *builder) sameBus(w where, kind, from, to string) {
	if from == to {
		b.fail(w, "to", "from and to are the same bus %q", from)
		return
	}
	tied := b.tiedBy(from, to)
	word, verb := verbatim("switch"), verbatim("is")
	if len(tied) > 1 {
		word, verb = "switches", "are"
	}
	b.fail(w, "to", "%q and %q are one bus while %s %s %s closed: the %s would be shorted out (open a switch, or take the %s out of service%s)",
		from, to, word, joinQuoted(tied), verb, kind, kind, b.cfgWords())
}
