package faults_test

import (
	"fmt"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"tripgrade/faults"
)

// rewire returns a copy of net in which every opened branch end is moved to
// a bus of its own that nothing else touches: the network a breaker opening
// leaves, built and factored from scratch. Branch and bus indices of net
// are kept (the new buses come last).
func rewire(net *faults.Network, open []faults.Point) *faults.Network {
	c := *net
	c.Buses = append([]faults.Bus(nil), net.Buses...)
	c.Lines = append([]faults.Line(nil), net.Lines...)
	c.Transformers = append([]faults.Transformer(nil), net.Transformers...)
	for i, pt := range open {
		from, to := net.BranchEnds(pt.Branch)
		at := from
		if pt.End == faults.To {
			at = to
		}
		c.Buses = append(c.Buses, faults.Bus{Name: fmt.Sprintf("open-%d", i), KV: net.Buses[at].KV})
		k := len(c.Buses) - 1
		switch {
		case !net.IsTransformer(pt.Branch) && pt.End == faults.From:
			c.Lines[pt.Branch].From = k
		case !net.IsTransformer(pt.Branch):
			c.Lines[pt.Branch].To = k
		case pt.End == faults.From:
			c.Transformers[pt.Branch-len(net.Lines)].From = k
		default:
			c.Transformers[pt.Branch-len(net.Lines)].To = k
		}
	}
	return &c
}

// TestSolveOpenMatchesRewiredNetwork checks the low-rank update of
// SolveOpen against a fresh factorization of the network with the opened
// branch ends rewired to buses of their own, on a generated meshed network
// with every winding connection: the currents at every measuring point and
// the voltages at every bus must agree (with a generator taken out as
// well in every other trial), for faults at buses, close in at
// branch ends (including the ends that were opened, which leaves the fault
// fed through its branch from the other end) and along lines, in both
// cases and all four kinds.
func TestSolveOpenMatchesRewiredNetwork(t *testing.T) {
	net, pts := generateNetwork(11, 160)
	set := faults.Settings{EarthFaultOhm: 5, PhaseFaultOhm: 0.3, EndTempC: 80, LineFractions: []float64{0.3}}
	eng, err := faults.New(net, set)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(5, 9))
	cols := eng.NewColumns(3) // small, so that columns are evicted and refilled
	// relTolOpen: the Woodbury update and a fresh factorization differ
	// only by rounding; the currents are compared relative to the largest
	// current of the fault, so tiny currents far away do not dominate.
	const relTolOpen = 1e-6
	checked := 0
	for trial := 0; trial < 100; trial++ {
		nOpen := 1 + rng.IntN(3)
		var open []faults.Point
		used := map[int]bool{}
		for len(open) < nOpen {
			pt := pts[rng.IntN(len(pts))]
			if used[pt.Branch] {
				continue
			}
			used[pt.Branch] = true
			open = append(open, pt)
		}
		ref := rewire(net, open)
		opening := faults.Opening{Ends: open}
		// Every other trial also takes a generator out, as its own
		// protection would.
		if trial%2 == 1 && len(net.Generators) > 0 {
			g := rng.IntN(len(net.Generators))
			opening.Generators = []int{g}
			ref.Generators = append([]faults.Generator(nil), ref.Generators...)
			ref.Generators[g].InMax, ref.Generators[g].InMin = false, false
		}
		refEng, err := faults.New(ref, set)
		if err != nil {
			continue // the opening leaves a part with no source: not comparable this way
		}
		// Faults: buses near the opened branches, both terminals of the
		// opened branches and a point along an opened line.
		var places []faults.Place
		for _, pt := range open {
			f, to := net.BranchEnds(pt.Branch)
			places = append(places, faults.AtBus(f), faults.AtBus(to), faults.OnBranch(pt.Branch, 0), faults.OnBranch(pt.Branch, 1))
			if !net.IsTransformer(pt.Branch) {
				places = append(places, faults.OnBranch(pt.Branch, 0.3))
			}
		}
		places = append(places, faults.AtBus(rng.IntN(len(net.Buses))))
		for _, pl := range places {
			for _, cs := range faults.Cases {
				for _, k := range faults.Kinds {
					f := eng.CaseFault(pl, k, cs)
					got, err := eng.SolveOpen(f, opening)
					if err != nil {
						t.Fatal(err)
					}
					// A column cache changes nothing but the work done
					// and the rounding (its entries come by backward
					// substitution, not by path products; the low-rank
					// update amplifies the difference where an opening
					// nearly splits the network, so 1e-7, well inside
					// the 1e-6 both keep to the rewired network).
					cached, err := eng.SolveOpenWith(f, opening, cols)
					if err != nil {
						t.Fatal(err)
					}
					cf, gf := cached.FaultCurrents(), got.FaultCurrents()
					ca, ga := cached.At(pts[0]), got.At(pts[0])
					for q := range 3 {
						if !closeRel(cf.Seq[q], gf.Seq[q], 1e-7) || !closeRel(ca.Seq[q], ga.Seq[q], 1e-7) {
							t.Fatalf("with a column cache: %v, without: %v", cf, gf)
						}
					}
					want, err := refEng.Solve(refEng.CaseFault(pl, k, cs))
					if err != nil {
						t.Fatal(err)
					}
					where := fmt.Sprintf("trial %d, %s %s at %+v, open %+v", trial, k, cs, pl, open)
					if got.Energised() != want.Energised() {
						t.Fatalf("%s: energised %v, rewired network says %v", where, got.Energised(), want.Energised())
					}
					if !want.Energised() {
						continue
					}
					scale := cmplx.Abs(want.FaultCurrents().Seq[1]) + cmplx.Abs(want.FaultCurrents().Seq[0])
					cmp := func(what string, g, w [3]complex128, sc float64) {
						for q := range g {
							if d := cmplx.Abs(g[q] - w[q]); d > relTolOpen*sc {
								t.Fatalf("%s: %s sequence %d = %v, rewired network %v", where, what, q, g[q], w[q])
							}
						}
					}
					cmp("fault current", got.FaultCurrents().Seq, want.FaultCurrents().Seq, scale)
					for _, pt := range pts {
						bus := busOf(net, pt)
						cmp(fmt.Sprintf("current at %+v", pt), got.At(pt).Seq, want.At(pt).Seq, scaleAt(eng, got, bus))
					}
					// The changes the fault makes to the bus voltages (the
					// pre-fault angle of a part the opening cut off from the
					// fault is arbitrary in the rewired network).
					for b := range net.Buses {
						dv := func(s faults.Solution) [3]complex128 {
							v, p := s.VoltageAt(b).Seq, s.Prefault(b).Seq
							return [3]complex128{v[0] - p[0], v[1] - p[1], v[2] - p[2]}
						}
						cmp(fmt.Sprintf("voltage change at %s", net.Buses[b].Name), dv(got), dv(want), net.Buses[b].KV*1000)
					}
					checked++
				}
			}
		}
	}
	if checked < 800 {
		t.Fatalf("only %d faults compared; the generated openings rarely kept every part fed", checked)
	}
	t.Logf("%d faults with open branch ends agree with the rewired networks", checked)
}

func busOf(net *faults.Network, pt faults.Point) int {
	f, to := net.BranchEnds(pt.Branch)
	if pt.End == faults.To {
		return to
	}
	return f
}

// scaleAt is the size of the fault's current referred to bus k.
func scaleAt(eng *faults.Engine, s faults.Solution, k int) float64 {
	fc := s.FaultCurrents()
	return (cmplx.Abs(fc.Seq[0]) + cmplx.Abs(fc.Seq[1]) + cmplx.Abs(fc.Seq[2])) * eng.BaseCurrentA(k) / eng.BaseCurrentA(s.FaultBus())
}

// closeRel reports whether a and b agree within rel of the larger.
func closeRel(a, b complex128, rel float64) bool {
	return cmplx.Abs(a-b) <= rel*max(cmplx.Abs(a), cmplx.Abs(b), 1e-300)
}
