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
			if got := findPaths(tc.pairs, tc.n, MaxPaths, nil); !reflect.DeepEqual(got, tc.want) {
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
	got := findPaths(pairs, n, 5, nil)
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

func TestAssignStyles(t *testing.T) {
	// Devices 0–6 on one chart: six colours, then the first colour again
	// with the next line pattern; device 7 on a chart of its own takes
	// the first look.
	groups := [][]int{{0, 1, 2, 3, 4, 5, 6}, {7}}
	got := assignStyles(8, groups)
	want := []int{0, 1, 2, 3, 4, 5, 6, 0}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("got %v, want %v", got, want)
	}
	if s := styleOf(got[6]); s.Colour != 0 || s.Dash != 1 {
		t.Errorf("the seventh device looks %+v, want colour 0 dashed", s)
	}
	// Devices drawn together differ in colour whenever the palette allows.
	g2 := [][]int{{0, 2}, {1, 2}, {0, 3}}
	s := assignStyles(4, g2)
	for _, g := range g2 {
		if styleOf(s[g[0]]).Colour == styleOf(s[g[1]]).Colour {
			t.Errorf("devices %d and %d share colour %d", g[0], g[1], styleOf(s[g[0]]).Colour)
		}
	}
	// As many devices as looks, all on one chart: every look once.
	all := make([]int, styleCount)
	for i := range all {
		all[i] = i
	}
	s = assignStyles(styleCount, [][]int{all})
	seen := map[int]bool{}
	for _, k := range s {
		if seen[k] {
			t.Fatalf("look %d given twice among %d devices drawn together", k, styleCount)
		}
		seen[k] = true
	}
}

func TestChunkKeepsChartsWithinTheLooks(t *testing.T) {
	devs := make([]int, 80)
	for i := range devs {
		devs[i] = i
	}
	parts := chunk(section{devs: devs, below: -1, above: -1})
	next := 0
	for k, p := range parts {
		if len(p.devs) > maxChartDevices {
			t.Errorf("part %d has %d devices, more than %d", k, len(p.devs), maxChartDevices)
		}
		if p.devs[0] != next {
			t.Errorf("part %d starts at device %d, want %d (one device overlapping the part below)", k, p.devs[0], next)
		}
		next = p.devs[len(p.devs)-1]
		if p.overlapTop != (k < len(parts)-1) {
			t.Errorf("part %d overlapTop %v", k, p.overlapTop)
		}
	}
	if next != 79 {
		t.Errorf("the parts end at device %d, want 79", next)
	}
}
