package study

import (
	"fmt"
	"math"
	"strings"

	"tripgrade/coord"
)

// A scenario is built as the study file with the scenario's changes made
// to it: its elements out of service are left out (with the devices on
// them, the [[pair]] entries naming those devices and their rows of the
// settings table), its switches and generators set as it says, its
// sources' strengths replaced. The same builder then reads it, so a
// scenario's study is exactly the one a user would get by editing the
// file so (tests hold the two to byte-identical findings), and messages
// still name the file's lines.

// rawScenario is a [[scenario]] table.
type rawScenario struct {
	Name          string              `key:"name"`
	OutOfService  []string            `key:"out_of_service"`
	Open          []string            `key:"open"`
	Close         []string            `key:"close"`
	AlwaysRunning []string            `key:"always_running"`
	Sources       []rawScenarioSource `key:"source"`
}

// rawScenarioSource is a source's strength in a scenario: the keys given
// replace the source's own.
type rawScenarioSource struct {
	Name     string   `key:"name"`
	SCMVAMax *float64 `key:"sc_mva_max"`
	SCMVAMin *float64 `key:"sc_mva_min"`
	XR       *float64 `key:"x_r"`
	XRMin    *float64 `key:"x_r_min"`
}

// Kinds of element a scenario can take out of service, as the file and
// n_minus_1 name them, in the order the sweep visits them.
var outageKinds = []string{"line", "transformer", "transformer3", "generator", "source"}

// element names an element of one kind.
type element struct{ kind, name string }

func (e element) String() string { return e.kind + " " + fmt.Sprintf("%q", e.name) }

// scenarioDef is a checked scenario: what it changes from the study as
// drawn.
type scenarioDef struct {
	name     string
	path     string // its table's path ("" for an outage of the sweep)
	outage   bool
	out      map[element]bool
	switches map[string]bool // switch → closed
	running  map[string]bool // generators that run in the minimum case
	sources  map[string]rawScenarioSource
	changes  []string
}

// cfgWords is " in this scenario" while a scenario is built.
func (b *builder) cfgWords() string {
	if b.cfg == nil {
		return ""
	}
	return " in this scenario"
}

// elementsByName maps every name a scenario may take out of service to
// the elements of that name (a generator and a line may share one).
func (b *builder) elementsByName() map[string][]element {
	m := map[string][]element{}
	add := func(kind, name string) {
		if name != "" {
			m[name] = append(m[name], element{kind, name})
		}
	}
	for _, r := range b.raw.Lines {
		add("line", r.Name)
	}
	for _, r := range b.raw.Transformer {
		add("transformer", r.Name)
	}
	for _, r := range b.raw.Transf3 {
		add("transformer3", r.Name)
	}
	for _, r := range b.raw.Generators {
		add("generator", r.Name)
	}
	for _, r := range b.raw.Sources {
		add("source", r.Name)
	}
	return m
}

// buildScenarios checks the [[scenario]] tables and the N-1 setting of the
// study as drawn, and gives the definitions they make (user scenarios
// first, in file order, then the sweep's outages).
func (b *builder) buildScenarios() []scenarioDef {
	if b.cfg != nil {
		return nil
	}
	elems := b.elementsByName()
	gens := map[string]int{}
	for i, r := range b.raw.Generators {
		gens[r.Name] = i
	}
	srcs := map[string]int{}
	for i, r := range b.raw.Sources {
		srcs[r.Name] = i
	}
	var defs []scenarioDef
	seen := map[string]int{}
	tables := map[string]int{} // scenario name → its table's index
	for i, r := range b.raw.Scenarios {
		w := tableAt("scenario", i, r.Name)
		before := b.failures
		if b.named(w, r.Name, seen, "scenario") {
			tables[r.Name] = i
			if strings.EqualFold(strings.TrimSpace(r.Name), coord.AsDrawn) {
				b.fail(w, "name", "name = %q is the name of the study as drawn; give the scenario a name of its own", r.Name)
			}
		}
		d := scenarioDef{name: r.Name, path: w.path, out: map[element]bool{}, switches: map[string]bool{}, running: map[string]bool{}, sources: map[string]rawScenarioSource{}}
		b.scenarioOut(w, r, elems, &d)
		b.scenarioSwitches(w, "open", r.Open, false, &d)
		b.scenarioSwitches(w, "close", r.Close, true, &d)
		for _, g := range r.AlwaysRunning {
			k, ok := gens[g]
			switch {
			case !ok:
				b.fail(w, "always_running", "always_running: %q is no generator of the study%s", g, suggest(g, gens))
			case d.running[g]:
				b.fail(w, "always_running", "always_running names %q twice", g)
			case d.out[element{"generator", g}]:
				b.fail(w, "always_running", "generator %q is out of service in this scenario; it cannot run", g)
			case boolOr(b.raw.Generators[k].AlwaysRunning, false):
				b.fail(w, "always_running", "generator %q already runs in the minimum case as drawn (always_running = true)", g)
			default:
				d.running[g] = true
				d.changes = append(d.changes, fmt.Sprintf("generator %s in the minimum case", g))
			}
		}
		for j, s := range r.Sources {
			b.scenarioSource(where{path: fmt.Sprintf("%s.source[%d]", w.path, j), element: fmt.Sprintf("%s source %d", w.element, j+1)}, s, srcs, &d)
		}
		if len(d.changes) == 0 && b.failures == before {
			b.fail(w, "name", "the scenario changes nothing: give out_of_service, open, close, always_running or [[scenario.source]]")
		}
		defs = append(defs, d)
	}
	return append(defs, b.nMinus1(tables)...)
}

// scenarioOut reads a scenario's out_of_service list.
func (b *builder) scenarioOut(w where, r rawScenario, elems map[string][]element, d *scenarioDef) {
	for _, name := range r.OutOfService {
		es := elems[name]
		switch {
		case len(es) == 0:
			b.fail(w, "out_of_service", "out_of_service: %q is no line, transformer, generator or source of the study%s", name, b.notOutageHint(name, elems))
		case len(es) > 1:
			b.fail(w, "out_of_service", "out_of_service: %q names both a %s and a %s; rename one of them", name, es[0].kind, es[1].kind)
		case d.out[es[0]]:
			b.fail(w, "out_of_service", "out_of_service names %q twice", name)
		default:
			d.out[es[0]] = true
			d.changes = append(d.changes, fmt.Sprintf("%s %s out of service", es[0].kind, name))
		}
	}
}

// scenarioSwitches reads a scenario's list of switches to open
// (closed = false) or to close.
func (b *builder) scenarioSwitches(w where, key string, names []string, closed bool, d *scenarioDef) {
	state := map[bool]string{true: "closed", false: "open"}
	for _, name := range names {
		s, ok := b.switches[name]
		_, twice := d.switches[name]
		switch {
		case !ok:
			b.fail(w, key, "%s: %q is no switch of the study%s", key, name, b.notSwitchHint(name))
		case twice:
			b.fail(w, key, "switch %q is named twice in open and close", name)
		case s.closed == closed:
			b.fail(w, key, "%s: switch %q is %s as drawn already", key, name, state[closed])
		default:
			d.switches[name] = closed
			d.changes = append(d.changes, fmt.Sprintf("switch %s %s", name, state[closed]))
		}
	}
}

// notOutageHint says what a name out_of_service does not know is: a
// switch (which a scenario opens), a bus (which goes out with the
// elements that connect it), or a slip for one of elems.
func (b *builder) notOutageHint(name string, elems map[string][]element) verbatim {
	if _, ok := b.switches[name]; ok {
		return "; it is a switch: list it in open to take it out of service"
	}
	if _, ok := b.busRaw[name]; ok {
		return "; it is a bus: take out of service the elements that connect it, and open its switches"
	}
	known := map[string]int{}
	for n := range elems {
		known[n] = 0
	}
	return verbatim(b.closest(name, known))
}

// notSwitchHint says what a name open or close does not know is: an
// element (which out_of_service takes out), or a slip for a switch.
func (b *builder) notSwitchHint(name string) verbatim {
	if es := b.elementsByName()[name]; len(es) > 0 {
		return verbatim(fmt.Sprintf("; it is a %s: list it in out_of_service to take it out", es[0].kind))
	}
	known := map[string]int{}
	for n := range b.switches {
		known[n] = 0
	}
	return verbatim(b.closest(name, known))
}

// scenarioSource reads a source's strength in a scenario.
func (b *builder) scenarioSource(w where, s rawScenarioSource, srcs map[string]int, d *scenarioDef) {
	_, ok := srcs[s.Name]
	switch {
	case s.Name == "":
		b.fail(w, "name", "name is missing (the source whose strength the scenario sets)")
		return
	case !ok:
		b.fail(w, "name", "name = %q: no source of that name%s", s.Name, suggest(s.Name, srcs))
		return
	case d.out[element{"source", s.Name}]:
		b.fail(w, "name", "source %q is out of service in this scenario", s.Name)
		return
	}
	if _, twice := d.sources[s.Name]; twice {
		b.fail(w, "name", "source %q is given twice in this scenario", s.Name)
		return
	}
	if s.SCMVAMax == nil && s.SCMVAMin == nil && s.XR == nil && s.XRMin == nil {
		b.fail(w, "name", "give the source's strength in this scenario: sc_mva_max, sc_mva_min, x_r or x_r_min")
		return
	}
	var words []string
	for _, k := range []struct {
		key  string
		v    *float64
		open bool
	}{{"sc_mva_max", s.SCMVAMax, true}, {"sc_mva_min", s.SCMVAMin, true}, {"x_r", s.XR, true}, {"x_r_min", s.XRMin, true}} {
		if k.v != nil {
			b.optional(w, k.key, k.v, 0, 0, math.Inf(1), k.open)
			words = append(words, fmt.Sprintf("%s %g", k.key, *k.v))
		}
	}
	d.sources[s.Name] = s
	d.changes = append(d.changes, fmt.Sprintf("source %s at %s", s.Name, strings.Join(words, ", ")))
}

// nMinus1 reads the study's n_minus_1 setting and gives one scenario per
// single outage of every element of the kinds it names, leaving out those
// that would leave some bus with no source, or to generators alone (said
// in a note; see cutsOff). names are the study's own scenarios, by their
// tables' index.
func (b *builder) nMinus1(names map[string]int) []scenarioDef {
	kinds := b.raw.Study.NMinus1
	if len(kinds) == 0 {
		return nil
	}
	w := where{path: "study", element: "[study]"}
	want := map[string]bool{}
	for _, k := range kinds {
		switch {
		case k == "switch":
			b.fail(w, "n_minus_1", "n_minus_1: %q: the sweep takes elements out of service one at a time; a switch's other state is a [[scenario]] with open or close", k)
		case !contains(outageKinds, k):
			known := map[string]int{}
			for _, o := range outageKinds {
				known[o] = 0
			}
			b.fail(w, "n_minus_1", "n_minus_1: %q is no kind of element (line, transformer, transformer3, generator, source)%s", k, suggest(k, known))
		case want[k]:
			b.fail(w, "n_minus_1", "n_minus_1 names %q twice", k)
		}
		want[k] = true
	}
	if b.failures > 0 {
		return nil // the network the sweep cuts may not be sound
	}
	byName := b.elementsByName()
	var defs []scenarioDef
	var left, islands []string
	for _, e := range b.outageCandidates(want) {
		name := e.name + " out"
		if len(byName[e.name]) > 1 {
			name = e.kind + " " + e.name + " out"
		}
		if k, taken := names[name]; taken {
			b.fail(tableAt("scenario", k, name), "name", "name = %q is the name of an outage of the n_minus_1 sweep; give the scenario another", name)
			continue
		}
		switch b.cutsOff(e) {
		case noSource:
			left = append(left, name)
			continue
		case generators:
			islands = append(islands, name)
			continue
		}
		defs = append(defs, scenarioDef{name: name, outage: true, out: map[element]bool{e: true},
			changes: []string{fmt.Sprintf("%s %s out of service", e.kind, e.name)}})
	}
	b.st.ScenarioNotes = append(b.st.ScenarioNotes, fmt.Sprintf("N-1 (%s): %s", strings.Join(kinds, ", "), count(len(defs), "single outage")))
	b.sweepNote(left, "part of the network with no source")
	b.sweepNote(islands, "part of the network that a grid source feeds as drawn to embedded generators alone (write a [[scenario]] to check such an island)")
	return defs
}

// sweepNote notes the outages the sweep left out, and why.
func (b *builder) sweepNote(left []string, why string) {
	if len(left) == 0 {
		return
	}
	shown, more := left, ""
	if len(shown) > 10 {
		shown, more = shown[:10], fmt.Sprintf(" and %d more", len(left)-10)
	}
	verb := "they leave"
	if len(left) == 1 {
		verb = "it leaves"
	}
	b.st.ScenarioNotes = append(b.st.ScenarioNotes, fmt.Sprintf("N-1: %s left out because %s %s: %s%s",
		count(len(left), "outage"), verb, why, strings.Join(shown, ", "), more))
}

// count says how many of a thing: "1 outage", "3 outages".
func count(n int, thing string) string {
	if n == 1 {
		return "1 " + thing
	}
	return fmt.Sprintf("%d %ss", n, thing)
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// outageCandidates lists the elements of the wanted kinds in the sweep's
// order: kinds as outageKinds orders them, elements in file order.
func (b *builder) outageCandidates(want map[string]bool) []element {
	var out []element
	add := func(kind string, names []string) {
		if want[kind] {
			for _, n := range names {
				out = append(out, element{kind, n})
			}
		}
	}
	var ls, ts, t3s, gs, ss []string
	for _, r := range b.raw.Lines {
		ls = append(ls, r.Name)
	}
	for _, r := range b.raw.Transformer {
		ts = append(ts, r.Name)
	}
	for _, r := range b.raw.Transf3 {
		t3s = append(t3s, r.Name)
	}
	for _, r := range b.raw.Generators {
		gs = append(gs, r.Name)
	}
	for _, r := range b.raw.Sources {
		ss = append(ss, r.Name)
	}
	add("line", ls)
	add("transformer", ts)
	add("transformer3", t3s)
	add("generator", gs)
	add("source", ss)
	return out
}

// Why the sweep leaves an outage out (see cutsOff).
const (
	keeps      = iota // every bus stays fed as it was
	noSource          // some bus is left with no source or generator
	generators        // some bus fed by a grid source as drawn is left to generators alone
)

// cutsOff says whether taking element e out of the study as drawn leaves
// some bus with no source or generator of the maximum case (the fault
// engine needs every bus energised), or leaves a bus that a grid source
// feeds as drawn to embedded generators alone: an island that the
// generators' own loss-of-mains protection would not let stand, and whose
// minimum case has no source at all unless they always run (a
// [[scenario]] may still take the element out, to check such an island
// on purpose). A power station unit's generator goes with its unit
// transformer.
func (b *builder) cutsOff(e element) int {
	n := b.net
	skipBranch := map[int]bool{}
	skipBus := map[int]bool{}
	switch e.kind {
	case "line", "transformer":
		skipBranch[b.branch[e.name]] = true
	case "transformer3":
		k := b.unit3[e.name]
		for wd := 0; wd < 3; wd++ {
			skipBranch[n.StarBranch(k, wd)] = true
		}
		skipBus[n.Transformers3[k].StarBus] = true
	}
	gridDrawn, _ := b.feeding(nil, nil)
	grid, any := b.feeding(skipBranch, func(kind, name string) bool { return kind == e.kind && name == e.name })
	why := keeps
	for k := range n.Buses {
		switch {
		case skipBus[k]:
		case !any[k]:
			return noSource
		case gridDrawn[k] && !grid[k]:
			why = generators
		}
	}
	return why
}

// feeding reports, for every bus, whether it is connected to a grid
// source and whether to a source or a generator of the maximum case,
// with the branches of skip open and the elements out (nil: none) out of
// service.
func (b *builder) feeding(skip map[int]bool, out func(kind, name string) bool) (grid, any []bool) {
	n := b.net
	parent := make([]int, len(n.Buses))
	for i := range parent {
		parent[i] = i
	}
	root := func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	for br := 0; br < n.BranchCount(); br++ {
		if !skip[br] {
			f, t := n.BranchEnds(br)
			parent[root(f)] = root(t)
		}
	}
	if out == nil {
		out = func(string, string) bool { return false }
	}
	fedGrid, fedAny := map[int]bool{}, map[int]bool{}
	for _, s := range n.Sources {
		if !out("source", s.Name) {
			fedGrid[root(s.Bus)], fedAny[root(s.Bus)] = true, true
		}
	}
	for _, g := range n.Generators {
		gone := out("generator", g.Name)
		if u := g.Unit; u != nil && skip[len(n.Lines)+u.Transformer] {
			gone = true
		}
		if g.InMax && !gone {
			fedAny[root(g.Bus)] = true
		}
	}
	grid, any = make([]bool, len(n.Buses)), make([]bool, len(n.Buses))
	for k := range n.Buses {
		grid[k], any[k] = fedGrid[root(k)], fedAny[root(k)]
	}
	return grid, any
}

// acceptScenarios checks the scenario each [[accept]] entry names.
func (b *builder) acceptScenarios(defs []scenarioDef) {
	known := map[string]int{coord.AsDrawn: 0}
	for _, d := range defs {
		known[d.name] = 0
	}
	for i, r := range b.raw.Accepts {
		if _, ok := known[r.Scenario]; r.Scenario == "" || ok {
			continue
		}
		w := where{path: fmt.Sprintf("accept[%d]", i), element: fmt.Sprintf("accept %d", i+1)}
		b.fail(w, "scenario", "scenario = %q: no scenario of that name (%q is the study as drawn)%s", r.Scenario, coord.AsDrawn, b.closest(r.Scenario, known))
	}
}
