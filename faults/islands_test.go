package faults_test

import (
	"fmt"
	"strings"
	"testing"

	"tripgrade/faults"
	"tripgrade/faults/randnet"
)

// joinNetworks returns one network holding a and then b, apart: b's buses
// follow a's (renamed), and its elements refer to them.
func joinNetworks(a, b *faults.Network) *faults.Network {
	off := len(a.Buses)
	n := &faults.Network{BaseMVA: a.BaseMVA}
	n.Buses = append(append(n.Buses, a.Buses...), b.Buses...)
	for i := off; i < len(n.Buses); i++ {
		n.Buses[i].Name = "b-" + n.Buses[i].Name
	}
	n.Lines = append(n.Lines, a.Lines...)
	for _, l := range b.Lines {
		l.Name, l.From, l.To = "b-"+l.Name, l.From+off, l.To+off
		n.Lines = append(n.Lines, l)
	}
	n.Transformers = append(n.Transformers, a.Transformers...)
	for _, t := range b.Transformers {
		t.Name, t.From, t.To = "b-"+t.Name, t.From+off, t.To+off
		n.Transformers = append(n.Transformers, t)
	}
	n.Sources = append(n.Sources, a.Sources...)
	for _, s := range b.Sources {
		s.Name, s.Bus = "b-"+s.Name, s.Bus+off
		n.Sources = append(n.Sources, s)
	}
	n.Generators = append(n.Generators, a.Generators...)
	for _, g := range b.Generators {
		g.Name, g.Bus = "b-"+g.Name, g.Bus+off
		n.Generators = append(n.Generators, g)
	}
	n.Earthings = append(n.Earthings, a.Earthings...)
	for _, e := range b.Earthings {
		e.Name, e.Bus = "b-"+e.Name, e.Bus+off
		n.Earthings = append(n.Earthings, e)
	}
	return n
}

// partFigures prints, to the last bit, every fault current and every
// branch-end current and voltage of the faults at the buses of one part of
// network n: buses first..first+count−1, and the branches whose names
// mine takes.
func partFigures(n *faults.Network, set faults.Settings, first, count int, mine func(name string) bool) (string, error) {
	eng, err := faults.New(n, set)
	if err != nil {
		return "", err
	}
	var b strings.Builder
	for k := first; k < first+count; k++ {
		for _, cs := range faults.Cases {
			for _, kind := range faults.Kinds {
				sol, err := eng.Solve(eng.CaseFault(faults.AtBus(k), kind, cs))
				if err != nil {
					return "", err
				}
				fmt.Fprintf(&b, "%s %v %v: %v\n", n.Buses[k].Name, cs, kind, sol.FaultCurrents())
				for br := 0; br < n.BranchCount(); br++ {
					if !mine(n.BranchName(br)) {
						continue
					}
					for _, end := range []faults.End{faults.From, faults.To} {
						r := sol.Response(faults.Point{Branch: br, End: end})
						fmt.Fprintf(&b, "  %s %v: %v %v\n", n.BranchName(br), end, r.Currents(sol), r.Voltages(sol))
					}
				}
			}
		}
	}
	return b.String(), nil
}

// TestPartsAreSolvedApart checks what the N-1 sweep's reuse of islands
// (coord/reuse.go) stands on: the faults of one connected part of a
// network give the same figures to the last bit whatever another part
// holds, so a line out of service in one part changes nothing in another,
// though it shifts the indices of the branches after it. It joins two
// random networks and takes out, in turn, every line of the second part
// whose outage leaves it connected.
func TestPartsAreSolvedApart(t *testing.T) {
	checked := 0
	for seed := uint64(1); seed <= 30 && checked < 20; seed++ {
		a, set := randnet.Network(randnet.Options{Buses: 12, Seed: seed})
		b, _ := randnet.Network(randnet.Options{Buses: 10, Seed: seed + 100})
		for _, order := range []string{"a first", "b first"} {
			join := func(b *faults.Network) (*faults.Network, int, func(string) bool) {
				if order == "a first" {
					return joinNetworks(a, b), 0, func(s string) bool { return !strings.HasPrefix(s, "b-") }
				}
				return joinNetworks(b, a), len(b.Buses), func(s string) bool { return strings.HasPrefix(s, "b-") }
			}
			whole, first, mine := join(b)
			want, err := partFigures(whole, set, first, len(a.Buses), mine)
			if err != nil {
				continue // a random network the engine refuses (see randnet)
			}
			parts := len(distinct(b.PartLabels()))
			for i := range b.Lines {
				out := *b
				out.Lines = append(append([]faults.Line(nil), b.Lines[:i]...), b.Lines[i+1:]...)
				if len(distinct(out.PartLabels())) != parts {
					continue
				}
				j, _, _ := join(&out)
				got, err := partFigures(j, set, first, len(a.Buses), mine)
				if err != nil {
					continue
				}
				checked++
				if got != want {
					t.Errorf("seed %d, %s, line %s of the other part out: the part's figures moved", seed, order, b.Lines[i].Name)
				}
			}
		}
	}
	if checked < 20 {
		t.Fatalf("%d outages compared, want at least 20", checked)
	}
}

func distinct(labels []int) map[int]bool {
	m := map[int]bool{}
	for _, l := range labels {
		m[l] = true
	}
	return m
}
