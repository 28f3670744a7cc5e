package propose

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/study/gen"
	"tripgrade/faults"
)

// generated writes the study gen.Write makes of o, reads it and prepares
// its engine and topology.
func generated(tb testing.TB, o gen.Options) (*coord.Study, *faults.Engine, *coord.Topology) {
	tb.Helper()
	var src bytes.Buffer
	if err := gen.Write(&src, o); err != nil {
		tb.Fatal(err)
	}
	s, err := study.Parse("gen.toml", src.Bytes(), nil)
	if err != nil {
		tb.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		tb.Fatal(err)
	}
	return s, eng, topo
}

// problemOf loads a study from text, runs the checker with the
// collector at the study's settings and returns the constraint set.
func problemOf(t *testing.T, name string, src []byte, o Settings) (*coord.Study, *problem) {
	t.Helper()
	s, err := study.Parse(name, src, nil)
	if err != nil {
		t.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	vars, index, err := variables(s, o)
	if err != nil {
		t.Fatal(err)
	}
	col := newCollector(newLinearizer(s, index, multipliers(s, vars)), vars)
	if _, err := coord.CheckWith(s, eng, topo, coord.Options{Margins: col.margin}); err != nil {
		t.Fatal(err)
	}
	return s, build(col)
}

// radialStudy writes a seeded radial 11 kV study: a tree of cables from
// one grid equivalent, a relay at the sending end of every cable with an
// IEC standard inverse phase stage and an IEC very inverse ground stage,
// pickups falling away from the source. Invented data.
func radialStudy(seed uint64, cables int) []byte {
	rng := rand.New(rand.NewPCG(seed, 99))
	var b bytes.Buffer
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p("[study]\nname = \"radial %d\"\n\n[criteria]\nfault_resistance_ohm = 5\n\n", seed)
	p("[[bus]]\nname = \"B0\"\nkv = 11\n\n")
	p("[[source]]\nname = \"grid\"\nbus = \"B0\"\nsc_mva_max = 250\nsc_mva_min = 150\nx_r = 10\nz0_z1 = 1\n\n")
	depth := []int{0}
	for i := 1; i <= cables; i++ {
		parent := rng.IntN(i)
		if depth[parent] >= 5 {
			parent = 0
		}
		depth = append(depth, depth[parent]+1)
		p("[[bus]]\nname = \"B%d\"\nkv = 11\n\n", i)
		p("[[line]]\nname = \"C%d\"\nfrom = \"B%d\"\nto = \"B%d\"\ntype = \"cable\"\nlength_km = %.2f\nr1_ohm_per_km = 0.16\nx1_ohm_per_km = 0.1\nr0_ohm_per_km = 0.64\nx0_ohm_per_km = 0.35\n\n",
			i, parent, i, 0.3+1.5*rng.Float64())
		p("[[relay]]\nname = \"R%d\"\nbranch = \"C%d\"\nat = \"B%d\"\nct_primary_a = 400\nct_secondary_a = 1\nbreaker_s = 0.06\n", i, i, parent)
		pick := 480 - 70*float64(depth[i])
		p("  [[relay.stage]]\n  measures = \"phase\"\n  curve = \"iec-si\"\n  pickup_a = %g\n  tms = %.2f\n", pick, 0.05+0.4*rng.Float64())
		p("  [[relay.stage]]\n  measures = \"ground\"\n  curve = \"iec-vi\"\n  pickup_a = %g\n  tms = %.2f\n\n", 100-12*float64(depth[i]), 0.05+0.4*rng.Float64())
	}
	return b.Bytes()
}
