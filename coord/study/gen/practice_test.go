package gen

import (
	"bytes"
	"math/rand/v2"
	"strings"
	"testing"
)

// TestPracticeLayout: laid out as in practice, the 33 kV buses form closed
// rings of three to seven, each fed by exactly one grid source and joined
// to no other; a primary's two units come from one 33 kV bus; every
// interconnector is a normally open switch; and the relays on 33 kV
// lines, at the far ends of 11 kV lines and on the LV side of parallel
// units carry forward-directional stages.
func TestPracticeLayout(t *testing.T) {
	o := Options{Buses: 2000, Seed: 5, Practice: true}
	g := &generator{rng: rand.New(rand.NewPCG(o.Seed, 0x51ad)), o: o}
	g.layout()
	// Union the 33 kV buses along the 33 kV lines and count each ring.
	parent := map[int]int{}
	var find func(int) int
	find = func(b int) int {
		if p, ok := parent[b]; ok && p != b {
			parent[b] = find(p)
			return parent[b]
		}
		parent[b] = b
		return b
	}
	degree := map[int]int{}
	for _, l := range g.lines {
		if l.kv > 20 {
			parent[find(l.from)] = find(l.to)
			degree[l.from]++
			degree[l.to]++
		}
	}
	size, sources := map[int]int{}, map[int]int{}
	for b, d := range degree {
		if d != 2 {
			t.Errorf("33 kV bus %s has %d lines, not 2 as in a ring", g.buses[b].name, d)
		}
		size[find(b)]++
	}
	for _, s := range g.srcs {
		sources[find(s)]++
	}
	for r, n := range size {
		if n < 3 || n > 7 || sources[r] != 1 {
			t.Errorf("a ring of %d buses with %d sources", n, sources[r])
		}
	}
	if len(size) < 30 {
		t.Errorf("%d rings for 2000 buses", len(size))
	}
	parallel := 0
	for i, tr := range g.trs {
		if tr.parallel {
			parallel++
			if i > 0 && g.trs[i-1].to == tr.to && g.trs[i-1].from != tr.from {
				t.Errorf("%s and %s feed one primary from two 33 kV buses", g.trs[i-1].name, tr.name)
			}
		}
	}
	if parallel == 0 || len(g.ties) == 0 {
		t.Fatalf("%d parallel units, %d interconnectors", parallel, len(g.ties))
	}
	for _, l := range g.lines {
		if l.kv < 20 {
			for _, tie := range g.ties {
				if l.from == tie[0] && l.to == tie[1] {
					t.Errorf("interconnector %s is a closed line", l.name)
				}
			}
		}
	}

	var out bytes.Buffer
	if err := Write(&out, o); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	if n := strings.Count(text, "closed = false"); n != len(g.ties) {
		t.Errorf("%d open switches, %d interconnectors", n, len(g.ties))
	}
	// Every 33 kV line has two relays of two directional stages, every
	// other line one at its far end; every parallel unit's LV relay two.
	lines33 := 0
	for _, l := range g.lines {
		if l.kv > 20 {
			lines33++
		}
	}
	want := 4*lines33 + 2*(len(g.lines)-lines33) + 2*parallel
	if n := strings.Count(text, `direction = "forward"`); n != want {
		t.Errorf("%d forward-directional stages, want %d", n, want)
	}
	// On an 11 kV line, the far-end relay looks into the line, the
	// sending end's is non-directional.
	far := map[string]string{}
	for _, l := range g.lines {
		if l.kv < 20 {
			far[l.name] = g.buses[l.to].name
		}
	}
	for _, block := range strings.Split(text, "[[relay]]")[1:] {
		var branch, at string
		for _, ln := range strings.Split(block, "\n") {
			if v, ok := strings.CutPrefix(ln, "branch = "); ok {
				branch = strings.Trim(v, `"`)
			}
			if v, ok := strings.CutPrefix(ln, "at = "); ok {
				at = strings.Trim(v, `"`)
			}
		}
		if end, ok := far[branch]; ok && (at == end) != strings.Contains(block, "direction") {
			t.Errorf("relay on %s at %s: directional %v", branch, at, strings.Contains(block, "direction"))
		}
	}
	if n := strings.Count(text, `curve = "definite"`); n != 2*parallel {
		t.Errorf("%d definite-time stages, want %d (the parallel units' directional stages)", n, 2*parallel)
	}
	if n := strings.Count(text, "neutral_ct = "); n != len(g.trs) {
		t.Errorf("%d standby earth-fault relays for %d transformers", n, len(g.trs))
	}
}
