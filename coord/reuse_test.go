package coord_test

import (
	"bytes"
	"fmt"
	"os"
	"regexp"
	"strings"
	"sync"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/study/gen"
	"tripgrade/faults"
)

// islandStudy joins studies of the repository into one study file of
// several islands: the first whole (its [study] table sets the N-1
// sweep), the element tables of the others after it with every name
// they define prefixed, so that nothing of one refers to another. The
// islands between them hold parallel transformers, a ring, a generator
// with its own protection, fuses, a three-winding transformer and
// directional stages.
func islandStudy(t *testing.T, first string, others ...string) []byte {
	t.Helper()
	src, err := os.ReadFile(first)
	if err != nil {
		t.Fatal(err)
	}
	out := append([]byte(nil), src...)
	header := regexp.MustCompile(`^\[[a-z_0-9]+\]\s*$`)
	defined := regexp.MustCompile(`(?m)^\s*name\s*=\s*"([^"]*)"`)
	quoted := regexp.MustCompile(`"([^"]*)"`)
	for i, path := range others {
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		var keep []string
		in := false
		for _, line := range strings.Split(string(src), "\n") {
			switch {
			case strings.HasPrefix(line, "[["):
				in = true
			case header.MatchString(line):
				in = false
			}
			if in {
				keep = append(keep, line)
			}
		}
		body := strings.Join(keep, "\n")
		names := map[string]bool{}
		for _, m := range defined.FindAllStringSubmatch(body, -1) {
			names[m[1]] = true
		}
		prefix := fmt.Sprintf("i%d-", i+2)
		body = quoted.ReplaceAllStringFunc(body, func(q string) string {
			if n := q[1 : len(q)-1]; names[n] {
				return `"` + prefix + n + `"`
			}
			return q
		})
		out = append(append(out, "\n\n"...), body...)
	}
	return out
}

// splitIsland is an island of two grid sources joined by one line: its
// outage splits the island in two, each with a source (invented data).
const splitIsland = `
[[bus]]
name = "XS-1"
kv = 33

[[bus]]
name = "XS-2"
kv = 33

[[source]]
name = "xs-grid-1"
bus = "XS-1"
sc_mva_max = 500
sc_mva_min = 250
x_r = 10
z0_z1 = 1

[[source]]
name = "xs-grid-2"
bus = "XS-2"
sc_mva_max = 300
sc_mva_min = 150
x_r = 10
z0_z1 = 1

[[line]]
name = "XS-TIE"
from = "XS-1"
to = "XS-2"
type = "overhead"
length_km = 6
r1_ohm_per_km = 0.19
x1_ohm_per_km = 0.37
r0_ohm_per_km = 0.42
x0_ohm_per_km = 1.2

[[relay]]
name = "XS-R1"
branch = "XS-TIE"
at = "XS-1"
ct_primary_a = 400
ct_secondary_a = 1
  [[relay.stage]]
  measures = "phase"
  curve = "iec-si"
  pickup_a = 300
  tms = 0.2
  [[relay.stage]]
  measures = "ground"
  curve = "iec-si"
  pickup_a = 80
  tms = 0.2

[[relay]]
name = "XS-R2"
branch = "XS-TIE"
at = "XS-2"
ct_primary_a = 400
ct_secondary_a = 1
  [[relay.stage]]
  measures = "phase"
  curve = "iec-si"
  pickup_a = 300
  tms = 0.2
  [[relay.stage]]
  measures = "ground"
  curve = "iec-si"
  pickup_a = 80
  tms = 0.2
`

// resultText prints everything of a result, every figure to the last
// bit (%v of a float64 is the shortest text that reads back to it).
func resultText(r *coord.Result) string {
	var b strings.Builder
	fmt.Fprintf(&b, "pairs %+v\nexcluded %+v\nnotes %q\n", r.Pairs, r.Excluded, r.Notes)
	for _, f := range r.Findings {
		ref, acc := f.Fault, f.Acceptance
		f.Fault, f.Acceptance = nil, nil
		fmt.Fprintf(&b, "%+v", f)
		if ref != nil {
			fmt.Fprintf(&b, " fault %+v", *ref)
		}
		if acc != nil {
			fmt.Fprintf(&b, " accepted %+v", *acc)
		}
		b.WriteByte('\n')
	}
	return b.String()
}

// TestOutageReusesUntouchedIslands checks every outage of the N-1 sweep
// of two studies of several islands, as CheckScenarios checks it (the
// outage's island worked out, every other island's findings taken from
// the study as drawn), against the whole check of the study in that
// configuration (the scenario's study built afresh, as if edited by
// hand): the two agree in every finding, figure, note and pair (also
// where the outage splits an island in two: splitIsland). It also
// asks that each outage works out only part of the network, so that the
// comparison is of the two ways and not of one with itself.
func TestOutageReusesUntouchedIslands(t *testing.T) {
	var practice bytes.Buffer
	if err := gen.Write(&practice, gen.Options{Buses: 180, Seed: 4, Practice: true}); err != nil {
		t.Fatal(err)
	}
	studies := map[string][]byte{
		"joined": append(islandStudy(t, "../testdata/scenarios/ashcombe-ring.toml", "../testdata/scenarios/n1-mesh.toml",
			"../examples/kestrel-park.toml", "../testdata/machines/three-winding.toml"), splitIsland...),
		"practice": bytes.Replace(practice.Bytes(), []byte("[study]\n"), []byte("[study]\nn_minus_1 = [\"line\", \"transformer\"]\n"), 1),
	}
	for _, name := range []string{"joined", "practice"} {
		t.Run(name, func(t *testing.T) {
			s, err := study.Parse(name+".toml", studies[name], os.DirFS("../testdata/machines"))
			if err != nil {
				t.Fatal(err)
			}
			eng, topo, err := coord.Prepare(s)
			if err != nil {
				t.Fatal(err)
			}
			byName := map[string]coord.Scenario{}
			for _, sc := range s.Scenarios {
				byName[sc.Name] = sc
			}
			outages := 0
			err = coord.CheckScenarios(s, eng, topo, nil, func(c coord.Checked) error {
				sc, ok := byName[c.Scenario]
				if !ok || !sc.Outage {
					return nil // the study as drawn, or a scenario of its own
				}
				if len(sc.Out) == 0 {
					t.Errorf("%s: the outage names no element", sc.Name)
					return nil
				}
				outages++
				st, err := sc.Build()
				if err != nil {
					return err
				}
				if in, total := coord.RegionShare(s, sc, st); !(in > 0 && in < total) {
					t.Errorf("%s: works out %d of %d buses: nothing taken over", sc.Name, in, total)
				}
				e2, t2, err := coord.Prepare(st)
				if err != nil {
					return err
				}
				whole, err := coord.Check(st, e2, t2)
				if err != nil {
					return err
				}
				whole.Tag(sc.Name)
				if got, want := resultText(c.Result), resultText(whole); got != want {
					t.Errorf("%s: the sweep's check differs from the whole check of the edited study:\n%s", sc.Name, firstDiff(got, want))
				}
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
			if outages < 5 {
				t.Errorf("%d outages checked, want at least 5", outages)
			}
		})
	}
}

// firstDiff shows the first line where two texts differ.
func firstDiff(got, want string) string {
	g, w := strings.Split(got, "\n"), strings.Split(want, "\n")
	for i := 0; i < min(len(g), len(w)); i++ {
		if g[i] != w[i] {
			return fmt.Sprintf("line %d\n got: %s\nwant: %s", i+1, g[i], w[i])
		}
	}
	return fmt.Sprintf("%d lines, want %d", len(g), len(w))
}

// marginSet gathers margin samples (coord.Options.Margins) as text, by
// device and place names, every figure to the last bit.
type marginSet struct {
	mu  sync.Mutex
	n   map[string]int
	all int
}

func newMarginSet() *marginSet { return &marginSet{n: map[string]int{}} }

// hook returns the receiver of the margins of a check of st.
func (m *marginSet) hook(st *coord.Study) func(*coord.MarginSample) {
	return func(ms *coord.MarginSample) {
		c := *ms
		up := "-"
		if c.Up >= 0 {
			up = st.Devices[c.Up].Name
		}
		down := st.Devices[c.Down].Name
		where := coord.PlaceName(st.Network, c.Place)
		c.Up, c.Down, c.Place = 0, 0, faults.Place{}
		k := fmt.Sprintf("%s %s %s %+v", up, down, where, c)
		m.mu.Lock()
		m.n[k]++
		m.all++
		m.mu.Unlock()
	}
}

// TestOutageMarginsTakenOverAreTheStudys checks what propose relies on
// when the sweep takes islands over: every margin the whole check of an
// outage judges is either one the sweep's check of that outage hands on
// too, or one the check of the study as drawn hands on, figure for
// figure (propose keeps, of equal constraints, the one of the study as
// drawn). So dropping those margins loses no constraint.
func TestOutageMarginsTakenOverAreTheStudys(t *testing.T) {
	src := islandStudy(t, "../testdata/scenarios/ashcombe-ring.toml", "../testdata/scenarios/n1-mesh.toml",
		"../examples/kestrel-park.toml", "../testdata/machines/three-winding.toml")
	s, err := study.Parse("joined.toml", src, os.DirFS("../testdata/machines"))
	if err != nil {
		t.Fatal(err)
	}
	eng, topo, err := coord.Prepare(s)
	if err != nil {
		t.Fatal(err)
	}
	sweep := map[string]*marginSet{}
	var mu sync.Mutex
	opts := func(name string, st *coord.Study) coord.Options {
		m := newMarginSet()
		mu.Lock()
		sweep[name] = m
		mu.Unlock()
		return coord.Options{Margins: m.hook(st)}
	}
	err = coord.CheckScenariosWith(s, eng, topo, nil, opts, func(coord.Checked) error { return nil })
	if err != nil {
		t.Fatal(err)
	}
	drawn := sweep[coord.AsDrawn]
	outages := 0
	for _, sc := range s.Scenarios {
		if !sc.Outage {
			continue
		}
		outages++
		st, err := sc.Build()
		if err != nil {
			t.Fatal(err)
		}
		e2, t2, err := coord.Prepare(st)
		if err != nil {
			t.Fatal(err)
		}
		whole := newMarginSet()
		if _, err := coord.CheckWith(st, e2, t2, coord.Options{Margins: whole.hook(st)}); err != nil {
			t.Fatal(err)
		}
		got := sweep[sc.Name]
		if got.all == 0 || got.all >= whole.all {
			t.Errorf("%s: the sweep hands on %d margins, the whole check %d: nothing taken over", sc.Name, got.all, whole.all)
		}
		for k, n := range got.n {
			if whole.n[k] < n {
				t.Errorf("%s: the sweep hands on a margin the whole check does not judge: %s", sc.Name, k)
				break
			}
		}
		for k, n := range whole.n {
			if got.n[k] < n && drawn.n[k] == 0 {
				t.Errorf("%s: a margin of the whole check is neither handed on by the sweep nor judged as drawn: %s", sc.Name, k)
				break
			}
		}
	}
	if outages < 5 {
		t.Errorf("%d outages, want at least 5", outages)
	}
}
