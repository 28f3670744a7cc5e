package gen

import "math"

// transformerRelays writes, for Options.Practice, the protection of a
// 33/11 kV unit as a utility would set it by hand (invented figures,
// common practice): at the 33 kV end an inverse phase stage at 1.5 × the
// rated current, a high-set instantaneous stage above the largest current
// an 11 kV fault can drive through the unit (its impedance alone, with
// 30 % in hand), so that the 33 kV relays grade over it only at 11 kV
// fault levels, and a standby earth-fault stage on the neutral resistor's
// current, which sees the 11 kV earth faults the delta winding hides; at
// the 11 kV end an inverse phase and ground incomer and, where a second
// unit feeds the same busbar, forward-directional definite-time stages
// that look into the unit, so that the faulted unit's incomer opens first
// for a fault fed back through the busbar.
func (g *generator) transformerRelays(t xfmr) {
	ratedHV := t.mva * 1e3 / (math.Sqrt(3) * 33) // A
	ratedLV := ratedHV * 3
	through := ratedHV / (t.zPct / 100)
	tms := func() string { return num(round(g.uniform(0.05, 0.5), 2)) }
	step := func(v, s float64) string { return num(math.Ceil(v/s) * s) }
	g.printf("[[relay]]\nname = %q\nbranch = %q\nat = %q\nct_primary_a = %s\nct_secondary_a = 1\nbreaker_s = 0.08\nneutral_ct = %q\n",
		t.name+"-HV", t.name, g.buses[t.from].name, step(1.5*ratedHV, 100), t.name)
	g.printf("  [[relay.stage]]\n  measures = \"phase\"\n  curve = \"iec-si\"\n  pickup_a = %s\n  tms = %s\n", step(1.5*ratedHV, 10), tms())
	g.printf("  [[relay.stage]]\n  measures = \"phase\"\n  curve = \"instantaneous\"\n  pickup_a = %s\n", step(1.3*through, 100))
	g.printf("  [[relay.stage]]\n  label = \"51NS\"\n  measures = \"ground\"\n  curve = \"iec-si\"\n  pickup_a = 60\n  tms = %s\n\n", tms())
	ctLV := math.Ceil(1.5*ratedLV/200) * 200
	g.printf("[[relay]]\nname = %q\nbranch = %q\nat = %q\nct_primary_a = %s\nct_secondary_a = 1\nbreaker_s = 0.06\n",
		t.name+"-LV", t.name, g.buses[t.to].name, num(ctLV))
	g.printf("  [[relay.stage]]\n  measures = \"phase\"\n  curve = \"iec-si\"\n  pickup_a = %s\n  tms = %s\n", step(1.5*ratedLV, 10), tms())
	// The ground stages at 5 % of the CT's rating, the least its CT
	// measures well (common practice), since parallel units share the
	// 11 kV earth-fault current, which the 12.7 Ω neutral resistor and
	// 10 Ω of fault resistance hold to about 280 A.
	ground := step(0.05*ctLV, 10)
	g.printf("  [[relay.stage]]\n  measures = \"ground\"\n  curve = \"iec-si\"\n  pickup_a = %s\n  tms = %s\n", ground, tms())
	if t.parallel {
		g.printf("  [[relay.stage]]\n  measures = \"phase\"\n  direction = \"forward\"\n  curve = \"definite\"\n  pickup_a = %s\n  delay_s = 0.25\n", step(0.5*ratedLV, 10))
		g.printf("  [[relay.stage]]\n  measures = \"ground\"\n  direction = \"forward\"\n  curve = \"definite\"\n  pickup_a = %s\n  delay_s = 0.25\n", ground)
	}
	g.printf("\n")
}

// ringMains, for Options.Practice, closes the 33 kV buses into rings of
// five (the last one three to seven), each fed by a grid source at its
// first bus and joined to no other: the ring mains an engineer grades both
// ways round with directional relays.
func (g *generator) ringMains(ring []int) {
	const size = 5
	for start := 0; start < len(ring); {
		end := start + size
		if len(ring)-end < 3 { // too few left for a ring of their own
			end = len(ring)
		}
		g.srcs = append(g.srcs, ring[start])
		for i := start; i < end; i++ {
			next := i + 1
			if next == end {
				next = start
			}
			g.addLine(ring[i], ring[next], 33, false)
		}
		start = end
	}
}
