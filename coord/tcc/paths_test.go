package tcc

import (
	"reflect"
	"testing"

	"tripgrade/coord"
)

func TestFindPaths(t *testing.T) {
	pr := func(u, d int) coord.Pair { return coord.Pair{Upstream: u, Downstream: d} }
	cases := []struct {
		name  string
		pairs []coord.Pair
		n     int
		want  []Path
	}{
		{"radial chain", []coord.Pair{pr(0, 1), pr(1, 2)}, 3, []Path{{2, 1, 0}}},
		// Two incomers 1 and 2 (each backed by its HV relay 3, 4) feed
		// feeders 5 and 6: every feeder has a path through each incomer.
		{"parallel incomers",
			[]coord.Pair{pr(3, 1), pr(4, 2), pr(1, 5), pr(2, 5), pr(1, 6), pr(2, 6)}, 7,
			[]Path{{0}, {5, 1, 3}, {5, 2, 4}, {6, 1, 3}, {6, 2, 4}}},
		{"device in no pair", nil, 2, []Path{{0}, {1}}},
		// Every device backs someone up, so no path starts on its own;
		// the first device left over starts one that shows both.
		{"hand-made cycle", []coord.Pair{pr(0, 1), pr(1, 0)}, 2, []Path{{0, 1}}},
		{"self pair ignored", []coord.Pair{pr(0, 0), pr(0, 1)}, 2, []Path{{1, 0}}},
		{"duplicate pairs", []coord.Pair{pr(0, 1), pr(0, 1)}, 2, []Path{{1, 0}}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := findPaths(tc.pairs, tc.n, MaxPaths); !reflect.DeepEqual(got, tc.want) {
				t.Errorf("got %v, want %v", got, tc.want)
			}
		})
	}
}

func TestFindPathsCap(t *testing.T) {
	// Ten stages of two parallel devices: 2^10 paths from the one feeder.
	var pairs []coord.Pair
	n := 1 + 2*10
	prev := []int{0}
	for s := 0; s < 10; s++ {
		next := []int{1 + 2*s, 2 + 2*s}
		for _, d := range prev {
			for _, u := range next {
				pairs = append(pairs, coord.Pair{Upstream: u, Downstream: d})
			}
		}
		prev = next
	}
	got := findPaths(pairs, n, 5)
	if len(got) != 5 {
		t.Fatalf("%d paths, want the cap of 5", len(got))
	}
	for _, p := range got {
		if len(p) != 11 || p[0] != 0 {
			t.Errorf("path %v: want 11 devices from device 0", p)
		}
	}
}

func TestDropContained(t *testing.T) {
	got := dropContained([]Path{{1, 2, 3}, {2, 3}, {1, 2, 3}, {3, 4}, {5}})
	want := []Path{{1, 2, 3}, {3, 4}, {5}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("got %v, want %v", got, want)
	}
}

func TestAssignColours(t *testing.T) {
	// Devices 0–6 on one path need seven slots: the seventh shares the
	// slot held by the fewest of them; device 7 on a path of its own
	// takes the first slot.
	groups := [][]int{{0, 1, 2, 3, 4, 5, 6}, {7}}
	got := assignColours(8, groups)
	want := []int{0, 1, 2, 3, 4, 5, 0, 0}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("got %v, want %v", got, want)
	}
	// Devices drawn together differ whenever the palette allows.
	g2 := [][]int{{0, 2}, {1, 2}, {0, 3}}
	s := assignColours(4, g2)
	for _, g := range g2 {
		if s[g[0]] == s[g[1]] {
			t.Errorf("devices %d and %d share slot %d", g[0], g[1], s[g[0]])
		}
	}
}
