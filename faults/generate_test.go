package faults_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"tripgrade/faults"
)

// The generator below builds synthetic but realistic networks for the
// cross-check against an independent computation and for the benchmarks:
// a meshed 132 kV core with grid equivalents, meshed 33 kV regions fed
// through 132/33 kV transformers (some in parallel, some from two different
// 132 kV buses, so loops close through transformers), 33/11 kV primary
// substations, radial 11 kV feeders with a few normally closed
// interconnectors, 11/0.4 kV distribution transformers with short 400 V
// feeders, and a few special zones (Yy0 11/3.3 kV, Yd11 11/6.6 kV and Dd0
// 33/11 kV) that exercise the other winding connections. The figures are
// typical catalogue values, randomised within a plausible band.

// minGeneratedBuses is the smallest bus count generateNetwork accepts: the
// fixed part (core, regions, special zones, primaries) needs about 60.
const minGeneratedBuses = 100

// lineType is a family of lines or cables at one voltage, per km at 20 °C.
type lineType struct {
	r1, x1, r0, x0 float64 // Ω/km
	kmLo, kmHi     float64 // length range
}

// Typical sequence impedances: overhead lines at 132 and 33 kV, XLPE cables
// at 11, 6.6 and 3.3 kV and PVC cables at 400 V.
var (
	ohl132   = lineType{0.07, 0.40, 0.21, 1.20, 8, 40}
	ohl33    = lineType{0.16, 0.35, 0.45, 1.05, 2, 12}
	cable11  = lineType{0.20, 0.10, 0.80, 0.35, 0.2, 2.5}
	cableMV  = lineType{0.25, 0.11, 1.00, 0.40, 0.2, 1.5}
	cableLV  = lineType{0.40, 0.08, 1.60, 0.30, 0.03, 0.25}
	angleTol = 1e-9 // degrees; zone angles are multiples of 30°, so any mismatch is gross
)

// netGen holds the state of one generation: the network so far, each bus's
// zone angle (so loops are closed only where the phase shifts agree), and
// the number of buses still to place.
type netGen struct {
	rng   *rand.Rand
	net   *faults.Network
	angle []float64 // positive-sequence zone angle of each bus, degrees
	left  int
	count map[string]int // per-prefix counters for unique names
}

// generateNetwork returns a seeded synthetic network of exactly nbus buses
// and measuring points at one or both ends of most branches.
func generateNetwork(seed uint64, nbus int) (*faults.Network, []faults.Point) {
	g, _ := buildNetwork(seed, nbus)
	return g.net, g.points()
}

// netParts are the parts of a generated network that later additions
// attach to.
type netParts struct {
	core      []int
	regions   []region
	primaries []primary
}

// buildNetwork generates the network of generateNetwork, before its
// measuring points are drawn.
func buildNetwork(seed uint64, nbus int) (*netGen, netParts) {
	if nbus < minGeneratedBuses {
		panic(fmt.Sprintf("generateNetwork: %d buses requested, need at least %d", nbus, minGeneratedBuses))
	}
	g := &netGen{
		rng:   rand.New(rand.NewPCG(seed, 0x7219)),
		net:   &faults.Network{BaseMVA: 100},
		left:  nbus,
		count: map[string]int{},
	}
	var p netParts
	p.core = g.transmission(max(5, nbus/45))
	p.regions = g.regions(p.core, max(3, len(p.core)/2))
	p.primaries = g.primaries(p.regions)
	g.generators(p.core, p.primaries)
	g.specialZones(p.primaries, p.regions)
	g.feeders(p.primaries)
	g.interconnect(p.primaries)
	g.lvGenerator()
	return g, p
}

// uniform returns a random value in [lo, hi).
func (g *netGen) uniform(lo, hi float64) float64 { return lo + (hi-lo)*g.rng.Float64() }

// chance reports true with probability p.
func (g *netGen) chance(p float64) bool { return g.rng.Float64() < p }

// name returns a unique element name with the given prefix.
func (g *netGen) name(prefix string) string {
	g.count[prefix]++
	return fmt.Sprintf("%s-%d", prefix, g.count[prefix])
}

// bus adds a bus at the given angle and takes it from the budget.
func (g *netGen) bus(prefix string, kv, angle float64) int {
	if g.left == 0 {
		panic("generateNetwork: bus budget exhausted by the fixed part of the network")
	}
	g.left--
	g.net.Buses = append(g.net.Buses, faults.Bus{Name: g.name(prefix), KV: kv})
	g.angle = append(g.angle, angle)
	return len(g.net.Buses) - 1
}

// line adds a line of type lt between two buses of one voltage, with
// the impedances randomised by ±15 % and the given end-of-fault
// temperature (0: the Settings' value).
func (g *netGen) line(from, to int, lt lineType, endC float64) {
	km := g.uniform(lt.kmLo, lt.kmHi)
	s := func(v float64) float64 { return v * km * g.uniform(0.85, 1.15) }
	g.net.Lines = append(g.net.Lines, faults.Line{
		Name:     g.name("L"),
		From:     from,
		To:       to,
		Z1Ohm:    complex(s(lt.r1), s(lt.x1)),
		Z0Ohm:    complex(s(lt.r0), s(lt.x0)),
		EndTempC: endC,
	})
}

// trSpec is the rating of a transformer to add.
type trSpec struct {
	mva, kvFrom, kvTo float64
	zPct, xr          float64
	group             string
	nFrom, nTo        faults.Neutral
	notCorrected      bool
}

// transformer adds a transformer; From must be the HV side. It returns the
// angle of the LV side given the HV side's, the LV side lagging by 30° per
// clock hour (IEC 60076-1).
func (g *netGen) transformer(from, to int, s trSpec) float64 {
	vg, err := faults.ParseVectorGroup(s.group)
	if err != nil {
		panic(err)
	}
	g.net.Transformers = append(g.net.Transformers, faults.Transformer{
		Name: g.name("T"), From: from, To: to, MVA: s.mva, KVFrom: s.kvFrom, KVTo: s.kvTo,
		ZPct: s.zPct, XR: s.xr, Z0Pct: 0.85 * s.zPct, X0R0: 0.8 * s.xr,
		Group: vg, NeutralFrom: s.nFrom, NeutralTo: s.nTo, NotCorrected: s.notCorrected,
	})
	return normDeg(g.angle[from] - 30*float64(vg.Clock))
}

// normDeg maps an angle to (−180°, 180°].
func normDeg(d float64) float64 {
	d = math.Mod(d, 360)
	if d <= -180 {
		d += 360
	} else if d > 180 {
		d -= 360
	}
	return d
}

// transmission builds the 132 kV core: a ring with chords and one double
// circuit, and grid equivalents at a few buses, one given in ohms.
func (g *netGen) transmission(n int) []int {
	buses := make([]int, n)
	for i := range buses {
		buses[i] = g.bus("B132", 132, 0)
	}
	for i := range buses {
		g.line(buses[i], buses[(i+1)%n], ohl132, 0)
	}
	for c := 0; c < max(2, n/3); c++ {
		i := g.rng.IntN(n)
		j := (i + 2 + g.rng.IntN(n-3)) % n // never a ring neighbour
		g.line(buses[i], buses[j], ohl132, 0)
	}
	g.line(buses[0], buses[1], ohl132, 0) // second circuit of a double line
	for i := 0; i < n; i += 6 {
		g.gridSource(buses[i], false)
	}
	g.gridSource(buses[n/2], true)
	return buses
}

// gridSource adds an earthed 132 kV grid equivalent from its short-circuit
// power, or from explicit ohms.
func (g *netGen) gridSource(bus int, ohms bool) {
	sk := g.uniform(2500, 8000)
	xr := g.uniform(8, 15)
	src := faults.Source{
		Name: g.name("GRID"), Bus: bus, Earthed: true,
		Z0Z1: g.uniform(0.9, 1.6),
		Max:  faults.Strength{SCMVA: sk, XR: xr},
		Min:  faults.Strength{SCMVA: sk * g.uniform(0.4, 0.7), XR: 0.9 * xr},
	}
	if g.chance(0.5) {
		src.X0R0 = g.uniform(3, 8)
	}
	if ohms {
		src.Max = faults.Strength{Z1Ohm: complex(0.45, 5.1), Z0Ohm: complex(1.1, 7.9)}
		src.Min = faults.Strength{Z1Ohm: complex(0.9, 9.4), Z0Ohm: complex(2.0, 12.5)}
	}
	g.net.Sources = append(g.net.Sources, src)
}

// region is a meshed 33 kV network fed from the 132 kV core.
type region struct {
	buses []int
	angle float64
}

// regionStyle is how a 33 kV region is fed and earthed.
type regionStyle struct {
	group    string // of the 132/33 kV transformers
	zigzag   bool   // the 33 kV side is delta: earth it with a zig-zag
	neutralT faults.Neutral
}

// regions builds 33 kV meshes. Each is fed by two parallel transformers at
// one 132 kV bus and, in most regions, a third at another 132 kV bus, all
// of the region's vector group, so loops close through the core.
func (g *netGen) regions(core []int, n int) []region {
	styles := []regionStyle{
		{group: "YNd11", zigzag: true},
		{group: "YNyn0", neutralT: faults.Neutral{ZOhm: 19.05}},
		{group: "YNd1", zigzag: true},
		{group: "YNyn0", neutralT: faults.Neutral{ZOhm: complex(0, 12)}},
	}
	out := make([]region, n)
	for r := range out {
		st := styles[r%len(styles)]
		hv1 := core[(2*r)%len(core)]
		spec := trSpec{mva: g.uniform(45, 90), kvFrom: 132, kvTo: 33, zPct: g.uniform(12, 16), xr: g.uniform(25, 40),
			group: st.group, nTo: st.neutralT}
		if r == 0 {
			spec.nFrom = faults.Neutral{ZOhm: complex(0, 8)} // a neutral reactor on the 132 kV star
		}
		m := 4 + g.rng.IntN(4)
		bs := make([]int, m)
		ang := normDeg(g.angle[hv1] - 30*float64(mustGroup(st.group).Clock))
		for i := range bs {
			bs[i] = g.bus("B33", 33, ang)
		}
		for i := range bs {
			g.line(bs[i], bs[(i+1)%m], ohl33, 0)
		}
		if m > 4 {
			g.line(bs[0], bs[m/2], ohl33, 0)
		}
		g.transformer(hv1, bs[0], spec)
		g.transformer(hv1, bs[0], spec) // a parallel unit: same clock number
		if r%4 != 3 {
			hv2 := core[(2*r+1+len(core)/2)%len(core)]
			spec.mva = g.uniform(45, 90)
			g.transformer(hv2, bs[m/2], spec)
		}
		if st.zigzag {
			g.net.Earthings = append(g.net.Earthings, faults.Earthing{
				Name: g.name("ZZ"), Bus: bs[0], Z0Ohm: complex(0.9, 6.5), NeutralZ: 12.7})
		}
		if r%3 == 1 {
			sk := g.uniform(300, 600)
			g.net.Sources = append(g.net.Sources, faults.Source{
				Name: g.name("GRID33"), Bus: bs[1], Earthed: false,
				Max: faults.Strength{SCMVA: sk, XR: 6}, Min: faults.Strength{SCMVA: 0.5 * sk, XR: 5}})
		}
		out[r] = region{buses: bs, angle: ang}
	}
	return out
}

// mustGroup parses a vector group the generator spells itself.
func mustGroup(s string) faults.VectorGroup {
	vg, err := faults.ParseVectorGroup(s)
	if err != nil {
		panic(err)
	}
	return vg
}

// primary is a 33/11 kV substation: its 11 kV bus and the tips of its
// feeders.
type primary struct {
	bus    int
	region int
	tips   []int // the last bus of each feeder
	all    []int // every 11 kV bus of its feeders
}

// primaries adds a 33/11 kV substation at every 33 kV bus: Dyn11 or Dyn1
// (by region, so interconnectors within a region stay phase-consistent),
// some with two parallel units, some with an off-nominal 33/11.5 kV ratio,
// the 11 kV star solid, resistance- or reactance-earthed. The first one of
// the second region is a Dd0 unit feeding an unearthed 11 kV system.
func (g *netGen) primaries(regions []region) []primary {
	var out []primary
	for r, reg := range regions {
		group := "Dyn11"
		if r%3 == 2 {
			group = "Dyn1"
		}
		for i, b33 := range reg.buses {
			spec := trSpec{mva: g.uniform(7.5, 24), kvFrom: 33, kvTo: 11, zPct: g.uniform(7, 10), xr: g.uniform(12, 20), group: group}
			if g.chance(0.3) {
				spec.kvTo = 11.5
			}
			switch g.rng.IntN(3) {
			case 0:
				spec.nTo = faults.Neutral{ZOhm: complex(g.uniform(6, 13), 0)}
			case 1:
				spec.nTo = faults.Neutral{ZOhm: complex(0, g.uniform(1, 4))}
			}
			if r == 1 && i == 0 {
				spec.group = "Dd0"
			}
			ang := normDeg(g.angle[b33] - 30*float64(mustGroup(spec.group).Clock))
			b11 := g.bus("B11", 11, ang)
			g.transformer(b33, b11, spec)
			if g.chance(0.3) {
				g.transformer(b33, b11, spec)
			}
			out = append(out, primary{bus: b11, region: r})
		}
	}
	return out
}

// generators adds synchronous machines: at every fifth primary's 11 kV
// bus (10.5 or 11 kV rated, some in the maximum case only, some with the
// IEC 60909-0 fictitious resistance), and one behind a YNd11 unit
// transformer (not K_T-corrected) on the 132 kV core.
func (g *netGen) generators(core []int, prim []primary) {
	for i := 0; i < len(prim); i += 5 {
		gen := faults.Generator{
			Name: g.name("G"), Bus: prim[i].bus, MVA: g.uniform(5, 30), KV: 11,
			XdPct: g.uniform(12, 20), X0Pct: g.uniform(5, 8), PF: g.uniform(0.8, 0.9),
			InMax: true, InMin: i%10 == 0,
			Earth: faults.Neutral{ZOhm: complex(g.uniform(20, 60), 0)},
		}
		gen.X2Pct = 1.05 * gen.XdPct
		if i%15 == 5 {
			gen.KV = 10.5
			gen.RPct = 0.6
			gen.Earth = faults.Neutral{Isolated: true}
		}
		g.net.Generators = append(g.net.Generators, gen)
	}
	hv := core[len(core)-1]
	b := g.bus("GEN11", 11, 0)
	g.angle[b] = g.transformer(hv, b, trSpec{mva: 120, kvFrom: 132, kvTo: 11, zPct: 13, xr: 45, group: "YNd11", notCorrected: true})
	g.net.Generators = append(g.net.Generators, faults.Generator{
		Name: g.name("G"), Bus: b, MVA: 110, KV: 11, XdPct: 16, X2Pct: 17, X0Pct: 7, PF: 0.85,
		InMax: true, InMin: false, Earth: faults.Neutral{Isolated: true},
	})
}

// specialZones adds a Yy0 11/3.3 kV and a Yd11 11/6.6 kV transformer, each
// feeding a short delta- or unearthed-star-fed system earthed by a zig-zag
// earthing transformer.
func (g *netGen) specialZones(prim []primary, regions []region) {
	zones := []struct {
		group string
		kv    float64
	}{{"Yy0", 3.3}, {"Yd11", 6.6}}
	for i, z := range zones {
		hv := prim[(3*i+1)%len(prim)].bus
		spec := trSpec{mva: g.uniform(4, 8), kvFrom: 11, kvTo: z.kv, zPct: g.uniform(6, 8), xr: g.uniform(8, 12), group: z.group}
		ang := normDeg(g.angle[hv] - 30*float64(mustGroup(z.group).Clock))
		a := g.bus(fmt.Sprintf("B%g", z.kv), z.kv, ang)
		g.transformer(hv, a, spec)
		b := g.bus(fmt.Sprintf("B%g", z.kv), z.kv, ang)
		g.line(a, b, cableMV, 250)
		g.net.Earthings = append(g.net.Earthings, faults.Earthing{
			Name: g.name("ZZ"), Bus: a, Z0Ohm: complex(0.5, 3), NeutralZ: complex(float64(i)*5, 0)})
	}
}

// feeders spends the rest of the bus budget on radial 11 kV feeders, one
// bus at a time round the primaries, mostly extending a feeder's tip and
// sometimes branching, with an 11/0.4 kV transformer and a short 400 V
// feeder at some buses.
func (g *netGen) feeders(prim []primary) {
	for k := 0; g.left > 0; k++ {
		p := &prim[k%len(prim)]
		tip := -1 // index in p.tips of the feeder being extended; −1 for a new one
		from := p.bus
		switch {
		case len(p.tips) < 2 || g.chance(0.15):
		case g.chance(0.1):
			from = p.all[g.rng.IntN(len(p.all))]
		default:
			tip = g.rng.IntN(len(p.tips))
			from = p.tips[tip]
		}
		b := g.bus("B11", 11, g.angle[p.bus])
		endC := 0.0
		if g.chance(0.5) {
			endC = 250 // XLPE short-circuit limit
		}
		g.line(from, b, cable11, endC)
		p.all = append(p.all, b)
		if tip < 0 {
			p.tips = append(p.tips, b)
		} else {
			p.tips[tip] = b
		}
		if g.left > 0 && g.chance(0.2) {
			g.distribution(b)
		}
	}
}

// distribution adds an 11/0.4 kV transformer (Dyn11, some Dyn1 and some
// with an 11/0.42 kV ratio) at bus hv and up to two 400 V cable sections.
func (g *netGen) distribution(hv int) {
	spec := trSpec{mva: g.uniform(0.315, 1.6), kvFrom: 11, kvTo: 0.4, zPct: g.uniform(4, 6), xr: g.uniform(4, 9), group: "Dyn11"}
	if g.chance(0.25) {
		spec.group = "Dyn1"
	}
	if g.chance(0.3) {
		spec.kvTo = 0.42
	}
	lv := g.bus("B04", 0.4, 0)
	g.angle[lv] = g.transformer(hv, lv, spec)
	prev := lv
	for s := g.rng.IntN(3); s > 0 && g.left > 0; s-- {
		b := g.bus("B04", 0.4, g.angle[lv])
		g.line(prev, b, cableLV, 160) // PVC short-circuit limit
		prev = b
	}
}

// interconnect closes some 11 kV feeders onto a feeder of another primary
// of the same region and zone angle, making loops through two 33/11 kV
// transformers and the 33 kV mesh.
func (g *netGen) interconnect(prim []primary) {
	for i := 0; i+1 < len(prim); i += 4 {
		a, b := prim[i], prim[i+1]
		if a.region != b.region || len(a.all) == 0 || len(b.all) == 0 ||
			math.Abs(g.angle[a.bus]-g.angle[b.bus]) > angleTol {
			continue
		}
		g.line(a.all[len(a.all)-1], b.all[len(b.all)-1], cable11, 0)
	}
}

// lvGenerator adds a 400 V standby generator, in service in the maximum
// case only, at the first 400 V bus.
func (g *netGen) lvGenerator() {
	for i, b := range g.net.Buses {
		if b.KV < 1 {
			g.net.Generators = append(g.net.Generators, faults.Generator{
				Name: g.name("G"), Bus: i, MVA: 0.5, KV: 0.4, XdPct: 14, X0Pct: 4, PF: 0.8,
				InMax: true, InMin: false,
			})
			return
		}
	}
}

// points puts measuring points at both ends of most branches, at the From
// end only of some, and none on a few; on a winding of a three-winding
// transformer at its terminal only (the other end is the internal star
// point).
func (g *netGen) points() []faults.Point {
	var pts []faults.Point
	for b := 0; b < g.net.BranchCount(); b++ {
		_, _, star := g.net.Star(b)
		switch u := g.rng.Float64(); {
		case star && u < 0.95:
			pts = append(pts, faults.Point{Branch: b, End: faults.From})
		case u < 0.85:
			pts = append(pts, faults.Point{Branch: b, End: faults.From}, faults.Point{Branch: b, End: faults.To})
		case u < 0.95:
			pts = append(pts, faults.Point{Branch: b, End: faults.From})
		}
	}
	return pts
}

// TestGenerateNetwork checks that the generated networks have what the
// cross-check and the benchmarks rely on: the requested size, loops, every
// vector group asked for, neutral impedances, off-nominal ratios,
// zig-zags, parallel transformers, heated lines, generators out of service
// in the minimum case, and that the engine accepts them.
func TestGenerateNetwork(t *testing.T) {
	for _, n := range []int{minGeneratedBuses, 240, 1000} {
		net, pts := generateNetwork(1, n)
		if len(net.Buses) != n {
			t.Errorf("%d buses requested, got %d", n, len(net.Buses))
		}
		if _, err := faults.New(net, faults.Settings{}); err != nil {
			t.Fatalf("%d buses: New: %v", n, err)
		}
		// Independent loops of a connected graph: branches − buses + 1.
		if loops := net.BranchCount() - n + 1; loops < 5 {
			t.Errorf("%d buses: %d independent loops, want at least 5", n, loops)
		}
		if len(pts) < net.BranchCount() {
			t.Errorf("%d buses: %d points on %d branches, want most branches at both ends", n, len(pts), net.BranchCount())
		}
		groups := map[string]bool{}
		var offNominal, parallel, neutralZ bool
		seen := map[[2]int]bool{}
		for _, tr := range net.Transformers {
			groups[tr.Group.String()] = true
			if tr.KVTo != net.Buses[tr.To].KV {
				offNominal = true
			}
			if seen[[2]int{tr.From, tr.To}] {
				parallel = true
			}
			seen[[2]int{tr.From, tr.To}] = true
			if tr.NeutralFrom.ZOhm != 0 || tr.NeutralTo.ZOhm != 0 {
				neutralZ = true
			}
		}
		for _, want := range []string{"Dyn11", "Dyn1", "YNd11", "YNd1", "YNyn0", "Yy0", "Dd0", "Yd11"} {
			if !groups[want] {
				t.Errorf("%d buses: no %s transformer", n, want)
			}
		}
		var heated, maxOnly bool
		for _, l := range net.Lines {
			heated = heated || l.EndTempC > 0
		}
		for _, gen := range net.Generators {
			maxOnly = maxOnly || (gen.InMax && !gen.InMin)
		}
		for what, ok := range map[string]bool{
			"off-nominal ratio": offNominal, "parallel transformers": parallel,
			"neutral impedance": neutralZ, "zig-zag earthing": len(net.Earthings) > 0,
			"heated line": heated, "maximum-only generator": maxOnly,
		} {
			if !ok {
				t.Errorf("%d buses: no %s", n, what)
			}
		}
	}
}
