// Package gen writes large synthetic study files for benchmarks and for
// measuring tripgrade as a user meets it (`/usr/bin/time -v tripgrade check
// big.toml`). The studies are invented and seeded: the same Options give
// byte-identical text. They are meant to load, solve and check; their
// settings are plausible but not graded, so a check finds failures.
//
// A study of N buses has a meshed 33 kV network (a ring with chords) fed by
// a few grid equivalents, 33/11 kV Dyn11 transformers with resistance
// earthing on the 11 kV side (some primaries fed from two 33 kV buses, so
// loops close through transformers), radial 11 kV feeders tied into loops
// by interconnectors, loads at most 11 kV buses, and a relay with a phase
// and a ground stage at every line end (optionally a fuse instead of the
// relay pair on the 11 kV spurs). Options.Practice lays the network and its
// protection out instead as an engineer would: 33 kV ring mains with
// directional relays, transformer protection and radial feeders.
package gen

import (
	"bufio"
	"fmt"
	"io"
	"math/rand/v2"
	"strconv"
)

// Options say what to generate. The zero value of every field but Buses is
// the default.
type Options struct {
	Buses int    // number of buses, at least MinBuses
	Seed  uint64 // seed of the random figures and the meshing
	// Fuses puts a fuse at the sending end of the 11 kV spurs instead of
	// relays at both ends.
	Fuses bool
	// Ranges declares a pickup range and a multiplier range on every
	// relay's inverse-time stage (for tripgrade propose --pickups).
	Ranges bool
	// Reach, when not zero, keeps the 33 kV meshing local: a chord joins
	// buses at most Reach places apart along the ring, and a primary's
	// second transformer comes from a 33 kV bus at most Reach places from
	// its first, as lines join neighbouring substations in a real
	// network; it must be at least 2. Zero (the default) draws both ends
	// anywhere on the ring, which makes the 33 kV network behave like a
	// random graph.
	Reach int
	// Practice lays the network and its protection out as an engineer
	// would before grading it with overcurrent relays (for measuring
	// tripgrade propose on a meshed network with directional relays):
	// the 33 kV buses in closed rings of about five, each fed by a grid
	// source of its own (ringMains), with forward-directional stages (67,
	// 67N) at both ends of every 33 kV line; a primary's second
	// transformer in parallel with its first; relays on every transformer
	// (transformerRelays); 11 kV feeders of one to three lines, whose
	// far-end relays look forward into their line, run radially with the
	// interconnectors as normally open switches; and every ground stage
	// inverse-time, so that the search sets its multiplier too. The
	// settings are still drawn at random, not graded, and Reach has no
	// meaning here.
	Practice bool
}

// MinBuses is the smallest study Write generates: one 33 kV ring of three
// buses, one primary and a feeder.
const MinBuses = 8

// Write writes the study described by o to w.
func Write(w io.Writer, o Options) error {
	if o.Buses < MinBuses {
		return fmt.Errorf("gen: %d buses requested, need at least %d", o.Buses, MinBuses)
	}
	if o.Reach < 0 || o.Reach == 1 {
		return fmt.Errorf("gen: reach %d: a chord needs at least 2 places along the ring (0: anywhere)", o.Reach)
	}
	if o.Practice && o.Reach != 0 {
		return fmt.Errorf("gen: reach %d: the 33 kV rings of a study laid out as in practice have no chords to keep local", o.Reach)
	}
	g := &generator{rng: rand.New(rand.NewPCG(o.Seed, 0x51ad)), o: o}
	g.layout()
	bw := bufio.NewWriterSize(w, 1<<16)
	g.w = bw
	g.write()
	return bw.Flush()
}

// bus, branch and device records of the generated network.
type bus struct {
	name string
	kv   float64
}

type line struct {
	name     string
	from, to int
	km       float64
	spur     bool // an 11 kV spur ending at a leaf bus
	kv       float64
}

type xfmr struct {
	name     string
	from, to int
	mva      float64
	zPct     float64 // drawn when written
	parallel bool    // another unit feeds the same primary (Practice)
}

type generator struct {
	rng   *rand.Rand
	o     Options
	w     *bufio.Writer
	buses []bus
	lines []line
	trs   []xfmr
	srcs  []int    // buses with a grid equivalent
	ties  [][2]int // normally open points between feeder ends (Practice)
	loads []int    // buses with a load
	count map[string]int
}

// local reports whether the 33 kV meshing is kept local (Options.Reach).
func (g *generator) local() bool { return g.o.Reach > 0 }

func (g *generator) uniform(lo, hi float64) float64 { return lo + (hi-lo)*g.rng.Float64() }

func (g *generator) name(prefix string) string {
	if g.count == nil {
		g.count = map[string]int{}
	}
	g.count[prefix]++
	return prefix + "-" + strconv.Itoa(g.count[prefix])
}

func (g *generator) addBus(prefix string, kv float64) int {
	g.buses = append(g.buses, bus{g.name(prefix), kv})
	return len(g.buses) - 1
}

func (g *generator) addLine(from, to int, kv float64, spur bool) {
	lo, hi := 0.3, 3.0
	if kv > 20 {
		lo, hi = 2, 12
	}
	g.lines = append(g.lines, line{name: g.name("L"), from: from, to: to, km: g.uniform(lo, hi), spur: spur, kv: kv})
}

// layout decides the buses and branches: about one bus in twelve at
// 33 kV, one in twelve a primary's 11 kV busbar, the rest on feeders.
func (g *generator) layout() {
	n := g.o.Buses
	n33 := max(3, n/12)
	nPrim := max(1, n/12)
	ring := make([]int, n33)
	for i := range ring {
		ring[i] = g.addBus("M33", 33)
	}
	if g.o.Practice {
		g.ringMains(ring)
	} else {
		g.meshedRing(ring)
	}
	prims := make([]int, nPrim)
	for i := range prims {
		prims[i] = g.addBus("P11", 11)
		hv := ring[i%n33]
		g.trs = append(g.trs, xfmr{name: g.name("T"), from: hv, to: prims[i], mva: []float64{10, 15, 20}[g.rng.IntN(3)]})
		if g.rng.Float64() < 0.2 { // a second transformer, from another 33 kV bus or in parallel
			span := n33 - 1
			if g.local() {
				span = min(span, g.o.Reach)
			}
			other := ring[(i+1+g.rng.IntN(span))%n33]
			if g.o.Practice { // parallel units of one substation
				other = hv
				g.trs[len(g.trs)-1].parallel = true
			}
			g.trs = append(g.trs, xfmr{name: g.name("T"), from: other, to: prims[i], mva: g.trs[len(g.trs)-1].mva, parallel: g.o.Practice})
		}
	}
	// Feeders: chains of 2 to 8 buses (1 to 3 in practice) from the
	// primaries in turn, with a spur now and then, until the bus budget is
	// spent.
	var feederEnds []int
	for k := 0; len(g.buses) < n; k++ {
		prev := prims[k%nPrim]
		length := 2 + g.rng.IntN(7)
		if g.o.Practice {
			length = 1 + g.rng.IntN(3)
		}
		for j := 0; j < length && len(g.buses) < n; j++ {
			b := g.addBus("F11", 11)
			g.addLine(prev, b, 11, false)
			g.loads = append(g.loads, b)
			if len(g.buses) < n && g.rng.Float64() < 0.15 {
				s := g.addBus("S11", 11)
				g.addLine(b, s, 11, true)
				g.loads = append(g.loads, s)
			}
			prev = b
		}
		feederEnds = append(feederEnds, prev)
	}
	// Interconnectors tie the ends of neighbouring feeders into loops.
	for i := 0; i+1 < len(feederEnds); i += 3 {
		if g.o.Practice {
			g.ties = append(g.ties, [2]int{feederEnds[i], feederEnds[i+1]})
			continue
		}
		g.addLine(feederEnds[i], feederEnds[i+1], 11, false)
	}
}

// meshedRing closes the 33 kV buses into one ring, meshes it with chords
// and puts the grid sources on it.
func (g *generator) meshedRing(ring []int) {
	n33 := len(ring)
	for i := range ring {
		g.addLine(ring[i], ring[(i+1)%n33], 33, false)
	}
	for i := 0; i < n33/6; i++ { // chords mesh the ring
		a, b := g.rng.IntN(n33), 0
		if g.local() {
			b = (a + 2 + g.rng.IntN(g.o.Reach-1)) % n33
		} else {
			b = g.rng.IntN(n33)
		}
		if a != b && (a+1)%n33 != b && (b+1)%n33 != a {
			g.addLine(ring[a], ring[b], 33, false)
		}
	}
	nsrc := min(max(1, g.o.Buses/5000+1), 8)
	for i := 0; i < nsrc; i++ {
		g.srcs = append(g.srcs, ring[i*n33/nsrc])
	}
}

// write prints the study as TOML.
func (g *generator) write() {
	p := g.printf
	p("# Generated by tripgrade's coord/study/gen: %d buses, seed %d. Invented data for\n", g.o.Buses, g.o.Seed)
	p("# benchmarks; the settings are not graded.\n\n")
	p("[study]\nname = \"generated %d buses, seed %d\"\nbase_mva = 100\n\n", g.o.Buses, g.o.Seed)
	p("[criteria]\nfault_resistance_ohm = 10\n\n")
	for _, b := range g.buses {
		p("[[bus]]\nname = %q\nkv = %s\n\n", b.name, num(b.kv))
	}
	for i, s := range g.srcs {
		p("[[source]]\nname = \"grid-%d\"\nbus = %q\nsc_mva_max = %s\nsc_mva_min = %s\nx_r = %s\nz0_z1 = %s\n\n",
			i+1, g.buses[s].name, num(round(g.uniform(800, 1500), 0)), num(round(g.uniform(300, 600), 0)),
			num(round(g.uniform(8, 15), 1)), num(round(g.uniform(0.8, 1.5), 2)))
	}
	for i, t := range g.trs {
		g.trs[i].zPct = round(g.uniform(8, 12), 2)
		p("[[transformer]]\nname = %q\nfrom = %q\nto = %q\nmva = %s\nkv_from = 33\nkv_to = 11\nz_pct = %s\nx_r = %s\nvector_group = \"Dyn11\"\nneutral_ohm_to = 12.7\n\n",
			t.name, g.buses[t.from].name, g.buses[t.to].name, num(t.mva), num(g.trs[i].zPct), num(round(g.uniform(12, 20), 1)))
	}
	for _, l := range g.lines {
		typ, r1, x1, r0, x0 := "cable", 0.16, 0.10, 0.64, 0.35
		if l.kv > 20 {
			typ, r1, x1, r0, x0 = "overhead", 0.16, 0.35, 0.45, 1.05
		}
		p("[[line]]\nname = %q\nfrom = %q\nto = %q\ntype = %q\nlength_km = %s\nr1_ohm_per_km = %s\nx1_ohm_per_km = %s\nr0_ohm_per_km = %s\nx0_ohm_per_km = %s\n\n",
			l.name, g.buses[l.from].name, g.buses[l.to].name, typ, num(round(l.km, 3)), num(r1), num(x1), num(r0), num(x0))
	}
	for i, t := range g.ties {
		p("[[switch]]\nname = \"NOP-%d\"\nfrom = %q\nto = %q\nclosed = false\n\n", i+1, g.buses[t[0]].name, g.buses[t[1]].name)
	}
	for _, b := range g.loads {
		p("[[load]]\nbus = %q\nmva = %s\n\n", g.buses[b].name, num(round(g.uniform(0.2, 1.5), 2)))
	}
	for _, l := range g.lines {
		if l.spur && g.o.Fuses {
			g.fuse(l)
			continue
		}
		g.relay(l, l.from)
		g.relay(l, l.to)
	}
	if g.o.Practice {
		for _, t := range g.trs {
			g.transformerRelays(t)
		}
	}
}

// relay writes a relay with a phase and a ground stage at one end of l:
// an inverse phase stage and a definite-time ground stage, or with
// Options.Practice two inverse stages, forward-directional on 33 kV lines.
func (g *generator) relay(l line, at int) {
	ct, pickup, ground := 400.0, 300.0, 60.0
	if l.kv > 20 {
		ct, pickup, ground = 800, 600, 120
	}
	dir := ""
	if g.o.Practice && (l.kv > 20 || at == l.to) {
		dir = "  direction = \"forward\"\n"
	}
	// 0.1–2 × the CT's rating in steps of 0.025 × it; TMS 0.05–1 in steps
	// of 0.01 (a numerical relay's usual ranges, invented).
	ranges := fmt.Sprintf("  pickup_range_a = [%s, %s, %s]\n  multiplier_range = [0.05, 1, 0.01]\n", num(0.1*ct), num(2*ct), num(0.025*ct))
	g.printf("[[relay]]\nname = %q\nbranch = %q\nat = %q\nct_primary_a = %s\nct_secondary_a = 1\nbreaker_s = 0.06\n",
		g.name("R"), l.name, g.buses[at].name, num(ct))
	g.printf("  [[relay.stage]]\n  measures = \"phase\"\n%s  curve = \"iec-si\"\n  pickup_a = %s\n  tms = %s\n",
		dir, num(pickup), num(round(g.uniform(0.05, 0.5), 2)))
	if g.o.Ranges {
		g.printf("%s", ranges)
	}
	if !g.o.Practice {
		g.printf("  [[relay.stage]]\n  measures = \"ground\"\n  curve = \"definite\"\n  pickup_a = %s\n  delay_s = %s\n\n",
			num(ground), num(round(g.uniform(0.2, 1.0), 2)))
		return
	}
	g.printf("  [[relay.stage]]\n  measures = \"ground\"\n%s  curve = \"iec-si\"\n  pickup_a = %s\n  tms = %s\n",
		dir, num(ground), num(round(g.uniform(0.05, 0.5), 2)))
	if g.o.Ranges {
		g.printf("%s", ranges)
	}
	g.printf("\n")
}

// fuse writes a 100 A fuse at the sending end of a spur, with invented
// melting and clearing curves.
func (g *generator) fuse(l line) {
	g.printf("[[fuse]]\nname = %q\nbranch = %q\nat = %q\nrating_a = 100\n", g.name("FU"), l.name, g.buses[l.from].name)
	g.printf("melt = [[200, 100], [300, 10], [600, 1], [1500, 0.1], [3000, 0.02]]\n")
	g.printf("clear = [[200, 130], [300, 13], [600, 1.4], [1500, 0.15], [3000, 0.04]]\n\n")
}

func (g *generator) printf(format string, args ...any) { fmt.Fprintf(g.w, format, args...) }

// num prints a figure as TOML: the shortest text that reads back exactly.
func num(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// round rounds v to the given number of decimals, so the text stays short.
func round(v float64, decimals int) float64 {
	p := 1.0
	for range decimals {
		p *= 10
	}
	return float64(int64(v*p+0.5)) / p
}
