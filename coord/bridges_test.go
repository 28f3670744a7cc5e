package coord

import (
	"testing"

	"tripgrade/faults"
)

// TestIslandsFedAfterOpening: grid at G, a radial line G–A, two parallel
// lines A–B, a line B–C with a generator at C in the maximum case only.
// Opening a branch end that is the only path (a bridge) cuts off what lies
// beyond unless an infeed lies there; opening one of two parallel lines
// cuts off nothing. (Graph facts, checked by inspection of this network.)
func TestIslandsFedAfterOpening(t *testing.T) {
	n := &faults.Network{
		Buses:      []faults.Bus{{Name: "G"}, {Name: "A"}, {Name: "B"}, {Name: "C"}},
		Sources:    []faults.Source{{Name: "grid", Bus: 0}},
		Generators: []faults.Generator{{Name: "gen", Bus: 3, InMax: true}},
		Lines: []faults.Line{{Name: "GA", From: 0, To: 1}, {Name: "AB1", From: 1, To: 2},
			{Name: "AB2", From: 1, To: 2}, {Name: "BC", From: 2, To: 3}},
	}
	adj := make([][]int, len(n.Buses))
	for b := range n.Lines {
		f, to := n.BranchEnds(b)
		adj[f] = append(adj[f], b)
		adj[to] = append(adj[to], b)
	}
	is := newIslands(n, adj)
	if !is.bridge[0] || is.bridge[1] || is.bridge[2] || !is.bridge[3] {
		t.Fatalf("bridges %v, want GA and BC only", is.bridge)
	}
	cases := []struct {
		what string
		pt   faults.Point
		pl   faults.Place
		cs   faults.Case
		want bool
	}{
		{"bus B, GA opened at G, generator out", faults.Point{Branch: 0, End: faults.From}, faults.AtBus(2), faults.Min, false},
		{"bus B, GA opened at G, generator in", faults.Point{Branch: 0, End: faults.From}, faults.AtBus(2), faults.Max, true},
		{"bus B, AB1 opened at A", faults.Point{Branch: 1, End: faults.From}, faults.AtBus(2), faults.Min, true},
		{"on AB1, AB1 opened at A: fed through AB2 and B", faults.Point{Branch: 1, End: faults.From}, faults.OnBranch(1, 0.5), faults.Min, true},
		{"on BC, BC opened at B, generator out", faults.Point{Branch: 3, End: faults.From}, faults.OnBranch(3, 0), faults.Min, false},
		{"on BC, BC opened at B, generator in", faults.Point{Branch: 3, End: faults.From}, faults.OnBranch(3, 0), faults.Max, true},
		{"bus G, GA opened at A", faults.Point{Branch: 0, End: faults.To}, faults.AtBus(0), faults.Min, true},
	}
	for _, c := range cases {
		if got := is.fedAfter(c.pt, c.pl, c.cs); got != c.want {
			t.Errorf("%s: fed %v, want %v", c.what, got, c.want)
		}
	}
}
