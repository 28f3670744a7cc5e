package study

import (
	"math"
	"strconv"

	"tripgrade/coord"
	"tripgrade/curves"
	"tripgrade/faults"
)

// builder turns the raw schema into the checked model, collecting every
// problem with its line.
type builder struct {
	*decoder
	raw    *rawFile
	net    *faults.Network
	st     *coord.Study
	bus    map[string]int // bus name → index
	branch map[string]int // line or transformer name → branch index

	unit3       map[string]int     // three-winding transformer name → index
	unitRaw     []where            // each generator's place, for its unit transformer
	starPath    map[string]string  // star branch name → its transformer3's table path
	starOf      map[string]starRef // star branch name → its transformer and winding
	stars       map[string]bool    // the internal star-point buses' names (internal)
	branchSeen  map[string]int     // branch names, for duplicates (values index namePaths)
	deviceSeen  map[string]int     // relay and fuse names, likewise
	relayRaw    []relayOrigin
	badRef      bool            // some element refers to a bus that does not exist
	branchBad   map[int]bool    // branches whose ends are already reported wrong
	badNames    map[string]bool // bus names reported unreadable
	csvUnread   bool            // the settings table could not be read at all
	csvBlamed   map[string]bool // settings a misspelt column of the table was meant to give
	suggestions int             // "did you mean" searches so far (closest)
	namePaths   []string        // where each named element is; the seen maps hold indexes into it

	// The file's own names and places, which a closed switch or a
	// scenario's outage would otherwise hide: the bus names by their
	// table's index, the end buses of each line and transformer as
	// written (by branch index) and the winding buses of each
	// three-winding transformer, and the table path of each branch.
	busRaw       map[string]int
	busOrigin    []int // per bus of the model, the table index of its first bus
	endNames     [][2]string
	windingNames [][3]string
	branchPaths  map[string]string
	switches     map[string]switchState // by name, as drawn
	// cfg is the scenario the study is built in (nil: as drawn), and
	// origins, per kind of table, the file's index of each table the
	// scenario keeps (nil: all kept); see scenario.go.
	cfg     *scenarioDef
	origins map[string][]int
	// csvCache holds the settings table as the first build read it, so
	// every scenario is built from the same bytes.
	csvCache []byte
	// dropped names the elements and devices the scenario being built
	// leaves out, which other tables may still name.
	dropped map[string]bool
}

// at locates the i-th element of the array of tables key as the study
// file has it, named name (see tableAt).
func (b *builder) at(key string, i int, name string) where {
	return tableAt(key, b.orig(key, i), name)
}

// orig returns the file's index of the i-th table of key that the
// configuration being built keeps.
func (b *builder) orig(key string, i int) int {
	if o, ok := b.origins[key]; ok {
		return o[i]
	}
	return i
}

// where locates an element for messages: the indexed table path in the
// study file whose keys give the line, or, for a row of a settings table,
// that file and row.
type where struct {
	path, element string
	file          string // set for rows of another file
	line          int
}

// at locates the i-th element of the array of tables key (bus, line, …),
// named name.
func tableAt(key string, i int, name string) where {
	return where{path: key + "[" + strconv.Itoa(i) + "]", element: key + " " + strconv.Quote(name)}
}

// fail reports a problem of the element at w, on the line of key. A key
// whose value was already refused (or that an unknown key was probably
// meant to be) gets no second message: whatever else is wrong with it
// follows from the first.
func (b *builder) fail(w where, key, format string, args ...any) {
	if w.file != "" {
		b.failures++
		if key != "" && b.csvBlamed[key] {
			return
		}
		b.errs = append(b.errs, &Error{File: w.file, Line: w.line, Element: clipText(w.element, maxEchoElement), Msg: message(format, args...)})
		return
	}
	if key != "" && b.blamed[join(w.path, key)] {
		b.failures++
		return
	}
	b.errorf(b.lines.key(w.path, key), w.element, format, args...)
}

// blamedAny reports whether any of the keys of w had its value refused.
func (b *builder) blamedAny(w where, keys ...string) bool {
	for _, k := range keys {
		if b.blamed[join(w.path, k)] {
			return true
		}
	}
	return false
}

// unread reports whether one of the arrays of tables keys could not be
// read at all ([line] written for [[line]], say): a name that is not
// found may then be in it, and the reference follows from that one
// problem.
func (b *builder) unread(keys ...string) bool {
	for _, k := range keys {
		if b.blamed[k] {
			return true
		}
	}
	return false
}

// busRef resolves a bus name given under key.
func (b *builder) busRef(w where, key, name string) (int, bool) {
	return b.busIn(b.bus, w, key, name)
}

// busIn resolves a bus name given under key in one of the maps of bus
// names (the model's buses, or the file's tables).
func (b *builder) busIn(buses map[string]int, w where, key, name string) (int, bool) {
	if name == "" {
		b.fail(w, key, "%s is missing (the name of a bus)", key)
		b.badRef = true
		return 0, false
	}
	k, ok := buses[name]
	if !ok {
		if !b.unread("bus") {
			b.fail(w, key, "%s = %q: no bus of that name%s", key, name, b.closest(name, buses))
		}
		b.badRef = true
	}
	return k, ok
}

// closest proposes the name nearest to an unknown one, as a message
// suffix. A suggestion costs a pass over every name, so a file with
// thousands of unknown names gets one for the first maxSuggestions only:
// every problem is still reported, and the load stays fast.
func (b *builder) closest(name string, names map[string]int) string {
	if b.suggestions >= maxSuggestions {
		return ""
	}
	b.suggestions++
	return suggest(name, names)
}

// maxSuggestions bounds the "did you mean" searches of one load.
const maxSuggestions = 100

// positive returns *p, requiring it present and > 0.
func (b *builder) positive(w where, key string, p *float64) float64 {
	if p == nil {
		b.fail(w, key, "%s is missing", key)
		return math.NaN()
	}
	if !(*p > 0) {
		b.fail(w, key, "%s must be > 0 (got %g)", key, *p)
		return math.NaN()
	}
	if !b.withinLimit(w, key, *p) {
		return math.NaN()
	}
	return *p
}

// optional returns *p or def, requiring lo <= *p <= hi when given
// (strictly above lo when open is true). An infinite hi stands for the
// key's physical limit (limits.go).
func (b *builder) optional(w where, key string, p *float64, def, lo, hi float64, open bool) float64 {
	if p == nil {
		return def
	}
	v := *p
	if math.IsInf(hi, 1) && !(v < lo || (open && v == lo)) && !b.withinLimit(w, key, v) {
		return def
	}
	if v < lo || v > hi || (open && v == lo) {
		op := "≥"
		if open {
			op = ">"
		}
		if math.IsInf(hi, 1) {
			b.fail(w, key, "%s must be %s %g (got %g)", key, op, lo, v)
		} else {
			b.fail(w, key, "%s must be %s %g and ≤ %g (got %g)", key, op, lo, hi, v)
		}
		return def
	}
	return v
}

func boolOr(p *bool, def bool) bool {
	if p == nil {
		return def
	}
	return *p
}

// buildBuses reads the buses and the switches, and gives the model one
// bus for each group of buses that closed switches tie together (see
// buildSwitches).
func (b *builder) buildBuses() {
	seen := map[string]int{}
	kvs := make([]float64, len(b.raw.Buses))
	for i, r := range b.raw.Buses {
		w := b.at("bus", i, r.Name)
		if b.named(w, r.Name, seen, "bus") {
			b.busRaw[r.Name] = i
		}
		kvs[i] = b.positive(w, "kv", r.KV)
		if kvs[i] > 2000 {
			b.fail(w, "kv", "kv = %g is not a plausible nominal voltage (line-to-line kV)", kvs[i])
		}
	}
	if len(b.raw.Buses) == 0 && !b.blamed["bus"] {
		b.errorf(0, "", "the study has no [[bus]]")
	}
	first := b.buildSwitches(kvs)
	index := make([]int, len(b.raw.Buses))
	for i, r := range b.raw.Buses {
		if g := first[i]; g != i {
			index[i] = index[g]
			b.net.Buses[index[i]].Name += mergedSeparator + r.Name
		} else {
			index[i] = len(b.net.Buses)
			b.net.Buses = append(b.net.Buses, faults.Bus{Name: r.Name, KV: kvs[i]})
			b.busOrigin = append(b.busOrigin, i)
		}
		if k, ok := b.busRaw[r.Name]; ok && k == i {
			b.bus[r.Name] = index[i]
		}
	}
}

func (b *builder) buildSources() {
	seen := map[string]int{}
	for i, r := range b.raw.Sources {
		w := b.at("source", i, r.Name)
		b.named(w, r.Name, seen, "source")
		bus, _ := b.busRef(w, "bus", r.Bus)
		s := faults.Source{Name: r.Name, Bus: bus}
		xr := b.optional(w, "x_r", r.XR, defaultSourceXR, 0, math.Inf(1), true)
		xrMin := b.optional(w, "x_r_min", r.XRMin, xr, 0, math.Inf(1), true)
		s.Max = b.strength(w, "max", r.SCMVAMax, r.R1OhmMax, r.X1OhmMax, xr)
		s.Min = b.strength(w, "min", r.SCMVAMin, r.R1OhmMin, r.X1OhmMin, xrMin)
		if s.Max.SCMVA > 0 && s.Min.SCMVA > s.Max.SCMVA {
			b.fail(w, "sc_mva_min", "sc_mva_min = %g is larger than sc_mva_max = %g", s.Min.SCMVA, s.Max.SCMVA)
		}
		z0Given := r.Z0Z1 != nil || r.R0OhmMax != nil || r.X0OhmMax != nil
		s.Earthed = boolOr(r.Earthed, true)
		switch {
		case s.Earthed && !z0Given:
			b.fail(w, "z0_z1", "an earthed source needs its zero-sequence impedance: z0_z1, or r0_ohm_max/x0_ohm_max (say earthed = false if it has no zero-sequence path)")
		case s.Earthed:
			s.Z0Z1 = b.optional(w, "z0_z1", r.Z0Z1, 0, 0, math.Inf(1), true)
			s.X0R0 = b.optional(w, "x0_r0", r.X0R0, 0, 0, math.Inf(1), true)
			if r.R0OhmMax != nil || r.X0OhmMax != nil {
				s.Max.Z0Ohm = b.ohms(w, "r0_ohm_max", "x0_ohm_max", r.R0OhmMax, r.X0OhmMax)
				s.Min.Z0Ohm = s.Max.Z0Ohm
				if r.R0OhmMin != nil || r.X0OhmMin != nil {
					s.Min.Z0Ohm = b.ohms(w, "r0_ohm_min", "x0_ohm_min", r.R0OhmMin, r.X0OhmMin)
				}
			} else if r.R0OhmMin != nil || r.X0OhmMin != nil {
				b.fail(w, "r0_ohm_min", "r0_ohm_min/x0_ohm_min need r0_ohm_max/x0_ohm_max too")
			}
		}
		b.net.Sources = append(b.net.Sources, s)
	}
}

// defaultSourceXR is the X/R of a grid equivalent when the study gives
// none: IEC 60909-0 allows R_Q = 0.1·X_Q for feeders above 35 kV without
// better data (from memory of the standard's network-feeder clause).
const defaultSourceXR = 10

// strength reads one case of a source: short-circuit MVA, or explicit ohms.
func (b *builder) strength(w where, cs string, mva, r, x *float64, xr float64) faults.Strength {
	mvaKey := "sc_mva_" + cs
	switch {
	case mva != nil && (r != nil || x != nil):
		b.fail(w, mvaKey, "give either %s or r1_ohm_%s/x1_ohm_%s, not both", mvaKey, cs, cs)
	case mva != nil:
		return faults.Strength{SCMVA: b.positive(w, mvaKey, mva), XR: xr}
	case r != nil || x != nil:
		return faults.Strength{Z1Ohm: b.ohms(w, "r1_ohm_"+cs, "x1_ohm_"+cs, r, x)}
	case !b.blamedAny(w, "r1_ohm_"+cs, "x1_ohm_"+cs):
		b.fail(w, mvaKey, "the %s-case strength is missing: give %s (or r1_ohm_%s and x1_ohm_%s)", longCase(cs), mvaKey, cs, cs)
	}
	return faults.Strength{}
}

func longCase(cs string) string {
	if cs == "max" {
		return "maximum"
	}
	return "minimum"
}

// ohms reads a resistance and reactance pair, both ≥ 0 and not both zero.
func (b *builder) ohms(w where, rKey, xKey string, r, x *float64) complex128 {
	rv := b.optional(w, rKey, r, 0, 0, math.Inf(1), false)
	xv := b.optional(w, xKey, x, 0, 0, math.Inf(1), false)
	if rv == 0 && xv == 0 {
		b.fail(w, xKey, "%s and %s cannot both be zero or missing", rKey, xKey)
	}
	return complex(rv, xv)
}

func (b *builder) buildGenerators() {
	seen := map[string]int{}
	for i, r := range b.raw.Generators {
		w := b.at("generator", i, r.Name)
		b.named(w, r.Name, seen, "generator")
		bus, ok := b.busRef(w, "bus", r.Bus)
		g := faults.Generator{Name: r.Name, Bus: bus}
		g.MVA = b.positive(w, "mva", r.MVA)
		g.KV = b.positive(w, "kv", r.KV)
		if ok && g.KV > 0 {
			b.matchKV(w, "kv", g.KV, bus)
		}
		g.XdPct = b.positive(w, "xd_pct", r.XdPct)
		if g.XdPct >= 100 {
			b.fail(w, "xd_pct", "xd_pct = %g %% is not a plausible sub-transient reactance", g.XdPct)
		}
		g.X2Pct = b.optional(w, "x2_pct", r.X2Pct, 0, 0, 100, true)
		g.RPct = b.optional(w, "r_pct", r.RPct, 0, 0, 100, true)
		if r.ROhm != nil {
			if r.RPct != nil {
				b.fail(w, "r_ohm", "give r_pct or r_ohm, not both")
			} else if rOhm := b.optional(w, "r_ohm", r.ROhm, 0, 0, math.Inf(1), true); rOhm > 0 && g.MVA > 0 && g.KV > 0 {
				g.RPct = rOhm / (g.KV * g.KV / g.MVA) * 100
			}
		}
		g.PF = b.optional(w, "pf", r.PF, defaultGeneratorPF, 0, 1, true)
		g.InMax = boolOr(r.InMax, true)
		g.InMin = boolOr(r.AlwaysRunning, false)
		earthed := boolOr(r.Earthed, false)
		g.Earth.Isolated = !earthed
		if earthed {
			if r.X0Pct == nil {
				b.fail(w, "earthed", "an earthed generator needs x0_pct (zero-sequence reactance)")
			}
			g.X0Pct = b.optional(w, "x0_pct", r.X0Pct, 0, 0, 100, true)
			g.Earth.ZOhm = complex(b.optional(w, "neutral_ohm", r.NeutralOhm, 0, 0, math.Inf(1), false),
				b.optional(w, "neutral_x_ohm", r.NeutralXOhm, 0, 0, math.Inf(1), false))
		} else if r.NeutralOhm != nil || r.NeutralXOhm != nil {
			b.fail(w, "neutral_ohm", "neutral_ohm is given but the generator is not earthed (add earthed = true)")
		}
		b.net.Generators = append(b.net.Generators, g)
		b.unitRaw = append(b.unitRaw, w)
	}
}

// defaultGeneratorPF is the rated power factor assumed for K_G when the
// study gives none (common practice for synchronous generators: 0.8).
const defaultGeneratorPF = 0.8

// kvTolerance is how far a rated winding voltage may sit from its bus's
// nominal voltage before it is taken for a mistake: distribution
// transformers are often rated 5–10 % above nominal (e.g. 433 V on a 400 V
// system).
const kvTolerance = 0.10

func (b *builder) matchKV(w where, key string, kv float64, bus int) {
	un := b.net.Buses[bus].KV
	if !(un > 0) {
		return
	}
	if math.Abs(kv/un-1) > kvTolerance {
		b.fail(w, key, "%s = %g kV does not match bus %q at %g kV (more than %g %% apart)", key, kv, b.net.Buses[bus].Name, un, kvTolerance*100)
	}
}

// cableWithstand builds a cable's adiabatic withstand from its conductor
// data, or nil when none is given.
func (b *builder) cableWithstand(w where, r rawLine, cable bool) curves.Characteristic {
	given := r.Conductor != "" || r.Insulation != "" || r.SizeMM2 != nil
	if !given {
		return nil
	}
	if !cable {
		b.fail(w, "conductor", "conductor data (conductor, insulation, size_mm2) are for cables: set type = \"cable\"")
		return nil
	}
	if r.Conductor == "" || r.Insulation == "" || r.SizeMM2 == nil {
		b.fail(w, "conductor", "give conductor, insulation and size_mm2 together")
		return nil
	}
	m, err := curves.ParseMaterial(r.Conductor)
	if err != nil {
		b.fail(w, "conductor", "%v", err)
	}
	ins, err2 := curves.ParseInsulation(r.Insulation)
	if err2 != nil {
		b.fail(w, "insulation", "%v", err2)
	}
	size := b.positive(w, "size_mm2", r.SizeMM2)
	if err != nil || err2 != nil || !(size > 0) {
		return nil
	}
	c, err := curves.NewCableWithstand(m, ins, size)
	if err != nil {
		b.fail(w, "size_mm2", "%v", err)
		return nil
	}
	return c
}
