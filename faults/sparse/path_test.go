package sparse

import (
	"math/rand/v2"
	"sync"
	"testing"
)

// A Path must sit on the elimination tree: it starts at k's position,
// climbs parent by parent, and so is ascending and ends at a root.
func TestPathFollowsEliminationTree(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, _ := tc.build(t, 21)
			ws := f.NewWorkspace()
			for k := 0; k < tc.n; k++ {
				p := f.Path(k, ws)
				if p.Len() == 0 || p.pos[0] != f.pinv[k] {
					t.Fatalf("Path(%d) starts at %v, want position %d", k, p.pos, f.pinv[k])
				}
				if p.val[0] != 1 {
					t.Errorf("Path(%d) = %v at its start, want 1 (L is unit triangular)", k, p.val[0])
				}
				for m := 1; m < p.Len(); m++ {
					if p.pos[m] != f.parent[p.pos[m-1]] {
						t.Fatalf("Path(%d): position %d follows %d, want its parent %d", k, p.pos[m], p.pos[m-1], f.parent[p.pos[m-1]])
					}
				}
				if last := p.pos[p.Len()-1]; f.parent[last] != -1 {
					t.Errorf("Path(%d) ends at %d, which is not a root", k, last)
				}
				for i, v := range ws.x {
					if v != 0 {
						t.Fatalf("after Path(%d) the workspace holds %v at %d, want all zero", k, v, i)
					}
				}
			}
		})
	}
}

// PathTo must give what Path gives, whether it reuses storage or grows it.
func TestPathToReusesStorage(t *testing.T) {
	tc := caseNamed(t, "mesh-250-duplicates") // paths of many lengths
	f, _ := tc.build(t, 22)
	ws := f.NewWorkspace()
	var p Path
	for k := 0; k < tc.n; k++ {
		f.PathTo(&p, k, ws)
		want := f.Path(k, ws)
		if p.Len() != want.Len() {
			t.Fatalf("PathTo(%d): length %d, want %d", k, p.Len(), want.Len())
		}
		for m := range want.pos {
			if p.pos[m] != want.pos[m] || p.val[m] != want.val[m] {
				t.Fatalf("PathTo(%d)[%d] = (%d, %v), want (%d, %v)", k, m, p.pos[m], p.val[m], want.pos[m], want.val[m])
			}
		}
	}
}

// Paths and Dots computed by many goroutines on one Factor must equal the
// serial ones exactly: the arithmetic is the same, only the scheduling
// differs. Run under -race to check that the Factor is only read.
func TestConcurrentPaths(t *testing.T) {
	tc := caseNamed(t, "mesh-250-duplicates")
	f, _ := tc.build(t, 23)
	n := tc.n
	pair := func(k int) int { return (7*k + 3) % n }
	serial := make([]complex128, n)
	ws := f.NewWorkspace()
	for k := range serial {
		serial[k] = f.Dot(f.Path(k, ws), f.Path(pair(k), ws))
	}
	const workers = 4
	got := make([][]complex128, workers)
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			ws := f.NewWorkspace()
			rng := rand.New(rand.NewPCG(uint64(w), 24))
			got[w] = make([]complex128, n)
			col := make([]complex128, n)
			for _, k := range rng.Perm(n) {
				got[w][k] = f.Dot(f.Path(k, ws), f.Path(pair(k), ws))
				if k%50 == 0 {
					f.Column(col, k) // Column and Solve allocate their own scratch
				}
			}
		}()
	}
	wg.Wait()
	for w := range got {
		for k := range serial {
			if got[w][k] != serial[k] {
				t.Fatalf("worker %d: Dot(Path(%d), Path(%d)) = %v, serial %v", w, k, pair(k), got[w][k], serial[k])
			}
		}
	}
}

func TestPathPanicsOnForeignWorkspace(t *testing.T) {
	small, _ := caseNamed(t, "pair").build(t, 25)
	large, _ := caseNamed(t, "path-50").build(t, 25)
	tests := []struct {
		name string
		ws   *Workspace
	}{
		{"nil", nil},
		{"zero-value", &Workspace{}},
		{"other-size", small.NewWorkspace()},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			defer func() {
				if recover() == nil {
					t.Errorf("Path with a %s workspace did not panic", tt.name)
				}
			}()
			large.Path(0, tt.ws)
		})
	}
}

func caseNamed(t *testing.T, name string) testCase {
	t.Helper()
	for _, tc := range testCases {
		if tc.name == name {
			return tc
		}
	}
	t.Fatalf("no test case %q", name)
	return testCase{}
}

// Dot takes the common tail of two paths by bisection; it must give,
// bit for bit, the sum over the positions the two paths share taken in
// ascending order (the merge of the two sorted lists), for every pair of
// a network's indices, in forests and isolated buses too.
func TestDotIsTheSumOverSharedPositions(t *testing.T) {
	for _, tc := range testCases {
		t.Run(tc.name, func(t *testing.T) {
			f, _ := tc.build(t, 23)
			ws := f.NewWorkspace()
			paths := make([]Path, tc.n)
			for k := range paths {
				paths[k] = f.Path(k, ws)
			}
			for i := range paths {
				for k := range paths {
					a, b := paths[i], paths[k]
					var want complex128
					shared := 0
					for p, q := 0, 0; p < a.Len() && q < b.Len(); {
						switch {
						case a.pos[p] < b.pos[q]:
							p++
						case a.pos[p] > b.pos[q]:
							q++
						default:
							want += a.val[p] * b.val[q] * f.dinv[a.pos[p]]
							shared++
							p++
							q++
						}
					}
					if got := f.Dot(a, b); got != want {
						t.Fatalf("Dot(Path(%d), Path(%d)) = %v, want %v (%d shared positions)", i, k, got, want, shared)
					}
				}
			}
		})
	}
}
