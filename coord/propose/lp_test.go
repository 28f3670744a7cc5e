package propose

import (
	"bytes"
	"encoding/json"
	"math"
	"os/exec"
	"testing"

	"tripgrade/coord/study/gen"
	"tripgrade/faults/numpytest"
)

// lpTolerance is the agreement asked of the label-correcting search,
// gonum's simplex and scipy's linprog on the same programme: all three
// stop within 1e-10 of the optimum on these sizes, so 1e-6 leaves room
// for the simplexes' tolerances and nothing for a wrong answer.
const lpTolerance = 1e-6

// TestLeastMatchesLinprog: the least multipliers of generated radial and
// meshed studies with tens of relays, found by the label-correcting
// search and by gonum's simplex, against an independent solve of the same
// constraints by scipy.optimize.linprog (HiGHS; Debian python3-scipy),
// run by testdata/linprog.py.
func TestLeastMatchesLinprog(t *testing.T) {
	py := numpytest.Interpreter(t, "the linprog cross-check", "numpy", "scipy.optimize")
	var meshed, small bytes.Buffer
	if err := gen.Write(&meshed, gen.Options{Buses: 40, Seed: 3}); err != nil {
		t.Fatal(err)
	}
	if err := gen.Write(&small, gen.Options{Buses: 14, Seed: 5}); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		src  []byte
	}{
		{"radial-1", radialStudy(1, 30)},
		{"radial-2", radialStudy(2, 45)},
		{"meshed-40", meshed.Bytes()},
		{"meshed-14", small.Bytes()},
	}
	simplexGroups := 0
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, p := problemOf(t, tc.name+".toml", tc.src, Settings{DefaultTMS: continuousTMS})
			if len(p.vars) < 10 || len(p.edges) < 20 {
				t.Fatalf("%d multipliers and %d constraints: want tens of each", len(p.vars), len(p.edges))
			}
			least, err := p.continuous()
			if err != nil {
				t.Fatal(err)
			}
			want := linprog(t, py, p)
			for i := range least {
				if d := math.Abs(least[i] - want[i]); d > lpTolerance {
					t.Errorf("multiplier %d: label correcting %.9f, linprog %.9f", i, least[i], want[i])
				}
			}
			// gonum's simplex on every group it takes.
			lpDone := 0
			for _, g := range p.components() {
				// The command keeps the simplex to groups of maxLPRows;
				// here it takes larger ones too, to cross-check them.
				if len(g) < 2 || len(g)+len(p.groupEdges(g)) > 4*maxLPRows {
					continue
				}
				y, err := p.solveLP(g)
				if err != nil {
					t.Fatalf("simplex on a group of %d: %v", len(g), err)
				}
				lpDone++
				for j, v := range g {
					if d := math.Abs(y[j] - want[v]); d > lpTolerance {
						t.Errorf("multiplier %d: gonum simplex %.9f, linprog %.9f", v, y[j], want[v])
					}
				}
			}
			simplexGroups += lpDone
			t.Logf("%d multipliers, %d constraints, %d conflicts, %d groups by the simplex", len(p.vars), len(p.edges), len(p.conflicts), lpDone)
		})
	}
	if simplexGroups == 0 {
		t.Errorf("no group was small enough for the simplex")
	}
}

// continuousTMS is a TMS range without steps, so the least multipliers
// are the programme's optimum itself.
var continuousTMS = DefaultTMSRange

func init() { continuousTMS.Step = 0 }

// linprog solves the problem's programme (the constraints left after the
// search dropped the conflicting ones) with scipy.
func linprog(t *testing.T, py string, p *problem) []float64 {
	t.Helper()
	in := struct {
		Lo, Hi []float64
		Edges  [][4]float64
	}{Lo: p.lo, Hi: p.hi}
	for _, e := range p.edges {
		if !e.dropped {
			in.Edges = append(in.Edges, [4]float64{float64(e.u), float64(e.d), e.k, e.b})
		}
	}
	data, err := json.Marshal(map[string]any{"lo": in.Lo, "hi": in.Hi, "edges": in.Edges})
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(py, "testdata/linprog.py")
	cmd.Stdin = bytes.NewReader(data)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("linprog.py: %v\n%s", err, stderr.String())
	}
	var res struct {
		Status int
		X      []float64
	}
	if err := json.Unmarshal(out, &res); err != nil {
		t.Fatal(err)
	}
	if res.Status != 0 || len(res.X) != len(p.lo) {
		t.Fatalf("linprog status %d with %d values for %d multipliers", res.Status, len(res.X), len(p.lo))
	}
	return res.X
}
