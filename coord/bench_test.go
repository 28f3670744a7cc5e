package coord_test

import (
	"bytes"
	"fmt"
	"os"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/study/gen"
	"tripgrade/curves"
	"tripgrade/faults"
)

// radialStudy builds a 33/11 kV substation with feeders × sections of
// cable, a standard-inverse relay with a ground stage at the start of
// every section and a load at every section end: a study with
// feeders·sections relays, for timing the checker.
func radialStudy(b *testing.B, feeders, sections int) *coord.Study {
	b.Helper()
	dyn11, _ := faults.ParseVectorGroup("Dyn11")
	n := &faults.Network{
		Buses:   []faults.Bus{{Name: "HV", KV: 33}, {Name: "BB", KV: 11}},
		Sources: []faults.Source{{Name: "grid", Bus: 0, Earthed: true, Z0Z1: 1, Max: faults.Strength{SCMVA: 1000, XR: 12}, Min: faults.Strength{SCMVA: 500, XR: 10}}},
		Transformers: []faults.Transformer{{Name: "T", From: 0, To: 1, MVA: 60, KVFrom: 33, KVTo: 11, ZPct: 12, XR: 25, Group: dyn11,
			NeutralTo: faults.Neutral{ZOhm: 6}}},
	}
	s := &coord.Study{Name: "bench", Network: n, Criteria: coord.DefaultCriteria()}
	stage := func(q coord.Quantity, pickupA, tms float64) coord.Stage {
		law, _ := curves.ShapeIECSI.Law()
		c, err := curves.NewInverseTime(law, pickupA, tms)
		if err != nil {
			b.Fatal(err)
		}
		return coord.Stage{Label: "51", Measures: q, Shape: curves.ShapeIECSI, PickupA: pickupA, Multiplier: tms, Curve: c}
	}
	for f := 0; f < feeders; f++ {
		prev := 1
		for k := 0; k < sections; k++ {
			bus := len(n.Buses)
			n.Buses = append(n.Buses, faults.Bus{Name: fmt.Sprintf("F%d-%d", f, k), KV: 11})
			n.Lines = append(n.Lines, faults.Line{Name: fmt.Sprintf("L%d-%d", f, k), From: prev, To: bus,
				Z1Ohm: complex(0.25, 0.2), Z0Ohm: complex(1, 0.6)})
			tms := 0.05 + 0.1*float64(sections-k)
			s.Devices = append(s.Devices, coord.Device{Name: fmt.Sprintf("R%d-%d", f, k), Kind: coord.Relay,
				Point:  faults.Point{Branch: len(n.Lines) - 1, End: faults.From},
				CT:     coord.CT{PrimaryA: 400, SecondaryA: 1, ThermalFactor: 1},
				Stages: []coord.Stage{stage(coord.Phase, 100+20*float64(sections-k), tms), stage(coord.Residual, 40, tms)}})
			s.Loads = append(s.Loads, coord.Load{Bus: bus, CurrentA: 5})
			prev = bus
		}
	}
	// The transformer branch index follows the lines.
	return s
}

func benchmarkCheck(b *testing.B, feeders, sections int) {
	s := radialStudy(b, feeders, sections)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		prepareAndCheck(b, s)
	}
	b.ReportMetric(float64(len(s.Devices)), "devices")
}

// prepareAndCheck builds the engine and topology of s and checks it.
func prepareAndCheck(b *testing.B, s *coord.Study) {
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		b.Fatal(err)
	}
	if _, err := coord.Check(s, eng, topo); err != nil {
		b.Fatal(err)
	}
}

func BenchmarkCheck100Devices(b *testing.B)  { benchmarkCheck(b, 20, 5) }
func BenchmarkCheck1000Devices(b *testing.B) { benchmarkCheck(b, 100, 10) }

// BenchmarkCheckMeshed runs the whole check (engine, topology, the
// fault-by-fault pass and every check) on generated meshed studies (package
// study/gen: 33 and 11 kV loops, a relay with phase and ground stages at
// every line end) of 1,000 and 10,000 buses; 50,000 with -benchtime 1x
// and TRIPGRADE_BENCH_50K=1, as it takes minutes. Each size is run with
// the 33 kV meshing local (chords and second transformers within 8 places
// along the ring, gen.Options.Reach, as in a real network) and drawn
// anywhere on the ring (a random graph, whose elimination separators grow
// with the network). Targets (issue 9): 10,000 buses within 10 s and
// 500 MB for the whole command, 50,000 within 90 s and 3 GB, on the 2-core
// build machine.
func BenchmarkCheckMeshed(b *testing.B) {
	sizes := []int{1000, 10000}
	if os.Getenv("TRIPGRADE_BENCH_50K") != "" {
		sizes = append(sizes, 50000)
	}
	for _, n := range sizes {
		for _, mesh := range []struct {
			name  string
			reach int
		}{{"local", 8}, {"random", 0}} {
			var buf bytes.Buffer
			if err := gen.Write(&buf, gen.Options{Buses: n, Seed: 1, Reach: mesh.reach}); err != nil {
				b.Fatal(err)
			}
			s, err := study.Parse("big.toml", buf.Bytes(), nil)
			if err != nil {
				b.Fatal(err)
			}
			b.Run(fmt.Sprintf("buses=%d/meshing=%s", n, mesh.name), func(b *testing.B) {
				for b.Loop() {
					prepareAndCheck(b, s)
				}
				b.ReportMetric(float64(len(s.Devices)), "devices")
			})
		}
	}
}

// BenchmarkCheckN1 runs the N-1 sweep of lines and transformers (issue 11)
// as `tripgrade check` does: the study as drawn and each single outage
// that leaves every bus a source, gathered into the worst findings over
// them. On the generated 1,000-bus study laid out as in practice
// (gen.Options.Practice: 33 kV ring mains, parallel units, radial 11 kV
// feeders with open points) 107 outages remain, in 17 islands, and each
// outage's check works out only its own island (see coord/reuse.go); the
// default generated study is one meshed island, where every outage is a
// whole check, and every 11 kV line of its closed feeder loops is an
// outage too (698 at 1,000 buses, about 12 minutes), so it runs at 200
// buses.
// Target: the 1,000-bus sweep well under a minute on the 2-core build
// machine, memory independent of the number of scenarios.
func BenchmarkCheckN1(b *testing.B) {
	for _, c := range []struct {
		name string
		o    gen.Options
	}{{"buses=1000/practice", gen.Options{Buses: 1000, Seed: 1, Practice: true}}, {"buses=200/default", gen.Options{Buses: 200, Seed: 1}}} {
		var buf bytes.Buffer
		if err := gen.Write(&buf, c.o); err != nil {
			b.Fatal(err)
		}
		src := bytes.Replace(buf.Bytes(), []byte("[study]\n"), []byte("[study]\nn_minus_1 = [\"line\", \"transformer\"]\n"), 1)
		s, err := study.Parse("n1.toml", src, nil)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(c.name, func(b *testing.B) {
			scenarios := 0
			for b.Loop() {
				eng, topo, err := coord.Prepare(s)
				if err != nil {
					b.Fatal(err)
				}
				w := coord.NewWorst()
				scenarios = 0
				err = coord.CheckScenarios(s, eng, topo, nil, func(ch coord.Checked) error {
					w.Add(ch.Study, ch.Result)
					scenarios++
					return nil
				})
				if err != nil {
					b.Fatal(err)
				}
				if len(w.Result().Findings) == 0 {
					b.Fatal("no findings")
				}
			}
			b.ReportMetric(float64(scenarios), "scenarios")
		})
	}
}
