package faults_test

import (
	"tripgrade/faults"
)

// generateMachineNetwork is generateNetwork with the elements of
// IEC 60909-0's fuller model added on top, for the cross-check: three-
// winding transformers (one closing a loop between the 132 kV core and a
// 33 kV region, one with a negative star branch, one with two earthed
// secondaries), asynchronous motors and motor groups at 11, 3.3 and 0.4 kV,
// and two power station units (with and without an on-load tap changer).
// The benchmarks keep generateNetwork's networks, so their figures stay
// comparable.
func generateMachineNetwork(seed uint64, nbus int) (*faults.Network, []faults.Point) {
	g, p := buildNetwork(seed, nbus)
	g.machines(p)
	return g.net, g.points()
}

// extraBus adds a bus outside the bus budget.
func (g *netGen) extraBus(prefix string, kv, angle float64) int {
	g.net.Buses = append(g.net.Buses, faults.Bus{Name: g.name(prefix), KV: kv})
	g.angle = append(g.angle, angle)
	return len(g.net.Buses) - 1
}

// unit3 adds a three-winding transformer on buses hv, mv, lv.
func (g *netGen) unit3(buses [3]int, kv [3]float64, pairs [3]faults.WindingPair, group string, neutral [3]faults.Neutral) {
	vg, err := faults.ParseVectorGroup3(group)
	if err != nil {
		panic(err)
	}
	g.net.AddTransformer3(faults.Transformer3{Name: g.name("T3W"), Buses: buses, KV: kv, Pairs: pairs, Group: vg, Neutral: neutral})
	g.angle = append(g.angle, g.angle[buses[0]]) // the star point, in the HV winding's frame
}

// machines adds the three-winding transformers, motors and power station
// units of generateMachineNetwork.
func (g *netGen) machines(p netParts) {
	// A 132/33/11 kV YNyn0d11 unit between the core and region 1 (whose
	// 132/33 kV transformers are YNyn0, so the loop's shifts agree), a motor
	// group on its tertiary busbar.
	c0, r1 := p.core[1], p.regions[1].buses[2]
	lv := g.extraBus("T3L", 11, normDeg(g.angle[c0]-330))
	g.unit3([3]int{c0, r1, lv}, [3]float64{132, 33, 11}, [3]faults.WindingPair{
		faults.HVMV: {MVA: 60, ZPct: 13, RPct: 0.35},
		faults.HVLV: {MVA: 20, ZPct: 11, RPct: 0.4},
		faults.MVLV: {MVA: 20, ZPct: 6, RPct: 0.45, Z0Pct: 5.2, R0Pct: 0.5},
	}, "YNyn0d11", [3]faults.Neutral{faults.HV: {}, faults.MV: {ZOhm: 19.05}})
	g.motor(lv, faults.Motor{MW: 0.9, KV: 11, PF: 0.86, Eff: 0.955, LockedRotor: 6, PolePairs: 2, Count: 3})

	// A radial 132/33/11 kV YNy0d5 unit with the pair data of the IEC TR
	// 60909-4 units scaled, whose MV star branch is negative, zero sequence
	// R(0) = R_HVMV, X(0) = 2.1·X_HVMV, a neutral reactor on the HV star; a
	// 33 kV line beyond and a 5 MW motor on the tertiary.
	c3 := p.core[3]
	mv := g.extraBus("T3M", 33, g.angle[c3])
	lv2 := g.extraBus("T3L", 11, normDeg(g.angle[c3]-150))
	z0, r0 := 44.097, 0.26
	g.unit3([3]int{c3, mv, lv2}, [3]float64{138, 34.5, 11}, [3]faults.WindingPair{
		faults.HVMV: {MVA: 90, ZPct: 21, RPct: 0.26, Z0Pct: z0, R0Pct: r0},
		faults.HVLV: {MVA: 13, ZPct: 10, RPct: 0.16, Z0Pct: z0 * 13 / 90, R0Pct: r0 * 13 / 90},
		faults.MVLV: {MVA: 13, ZPct: 7, RPct: 0.16, Z0Pct: z0 * 13 / 90, R0Pct: r0 * 13 / 90},
	}, "YNy0d5", [3]faults.Neutral{faults.HV: {ZOhm: complex(0, 5)}})
	far := g.extraBus("T3M", 33, g.angle[mv])
	g.line(mv, far, ohl33, 0)
	g.motor(lv2, faults.Motor{MW: 5, KV: 11, PF: 0.88, Eff: 0.975, LockedRotor: 5, PolePairs: 1})

	// A 33/11/3.3 kV Dyn11yn11 unit on region 0 with both secondaries
	// earthed (one through a resistor) and a motor pair at 3.3 kV.
	r0b := p.regions[0].buses[1]
	m11 := g.extraBus("T3M", 11, normDeg(g.angle[r0b]+30))
	l33 := g.extraBus("T3L", 3.3, normDeg(g.angle[r0b]+30))
	g.unit3([3]int{r0b, m11, l33}, [3]float64{33, 11, 3.3}, [3]faults.WindingPair{
		faults.HVMV: {MVA: 15, ZPct: 9, RPct: 0.6},
		faults.HVLV: {MVA: 5, ZPct: 7, RPct: 0.7},
		faults.MVLV: {MVA: 5, ZPct: 4, RPct: 0.6},
	}, "Dyn11yn11", [3]faults.Neutral{faults.MV: {ZOhm: 6}})
	g.motor(l33, faults.Motor{MW: 0.6, KV: 3.3, PF: 0.85, Eff: 0.95, LockedRotor: 6.5, PolePairs: 2, RX: 0.12, Count: 2})

	// A low-voltage motor group (R_M/X_M 0.42 by default) at the first
	// 400 V bus.
	for i, b := range g.net.Buses {
		if b.KV < 1 {
			g.motor(i, faults.Motor{MW: 0.25, KV: 0.4, PF: 0.84, Eff: 0.93, LockedRotor: 6, PolePairs: 2, Count: 4})
			break
		}
	}

	// Power station units: 200 MVA behind a 138/15.75 kV YNd11 unit
	// transformer with a neutral reactor and an on-load tap changer on the
	// core (K_S); 30 MVA behind a 34.5/10.5 kV Yd1 unit transformer without
	// one on region 2, running in the minimum case too (K_SO with p_T and
	// p_G).
	c4 := p.core[len(p.core)-2]
	gb := g.extraBus("GU", 15.75, 0)
	g.angle[gb] = g.transformer(c4, gb, trSpec{mva: 210, kvFrom: 138, kvTo: 15.75, zPct: 14, xr: 40, group: "YNd11",
		nFrom: faults.Neutral{ZOhm: complex(0, 15)}})
	g.net.Generators = append(g.net.Generators, faults.Generator{Name: g.name("GU"), Bus: gb, MVA: 200, KV: 15.75,
		XdPct: 18, RPct: 0.2, PF: 0.85, InMax: true, Earth: faults.Neutral{Isolated: true},
		Unit: &faults.StationUnit{Transformer: len(g.net.Transformers) - 1, OnLoadTapChanger: true}})
	r2 := p.regions[2].buses[0]
	gb2 := g.extraBus("GU", 10.5, 0)
	g.angle[gb2] = g.transformer(r2, gb2, trSpec{mva: 32, kvFrom: 34.5, kvTo: 10.5, zPct: 11, xr: 30, group: "Yd1"})
	g.net.Generators = append(g.net.Generators, faults.Generator{Name: g.name("GU"), Bus: gb2, MVA: 30, KV: 10.5,
		XdPct: 14, PF: 0.8, InMax: true, InMin: true, Earth: faults.Neutral{Isolated: true},
		Unit: &faults.StationUnit{Transformer: len(g.net.Transformers) - 1, TapPct: -2.5, PGPct: 5}})
}

// motor adds a motor or motor group at bus.
func (g *netGen) motor(bus int, m faults.Motor) {
	m.Name, m.Bus = g.name("M"), bus
	g.net.Motors = append(g.net.Motors, m)
}
