package sparse

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// benchSizes are the network sizes of the benchmarks, in buses.
var benchSizes = []int{1000, 10000, 100000}

// powerNetworkEdges returns a network shaped like a transmission and
// distribution system: a meshed core of about 5 % of the buses on a
// perturbed grid (a random spanning tree of the grid plus about a third of
// its other edges and a few diagonals, so loops of many sizes), with radial
// feeders of 5 to 40 buses, some with laterals, hanging off random core
// buses. Buses are then relabelled at random.
func powerNetworkEdges(n int, rng *rand.Rand) (es []edge, core int) {
	core = max(n/20, 4)
	side := int(math.Ceil(math.Sqrt(float64(core))))
	var cand []edge
	for i := 0; i < core; i++ {
		c := i % side
		if c+1 < side && i+1 < core {
			cand = append(cand, edge{i, i + 1})
		}
		if i+side < core {
			cand = append(cand, edge{i, i + side})
		}
		if c+1 < side && i+side+1 < core && rng.Float64() < 0.05 {
			cand = append(cand, edge{i, i + side + 1})
		}
	}
	// Kruskal on random weights gives a random spanning tree of the grid.
	rng.Shuffle(len(cand), func(a, b int) { cand[a], cand[b] = cand[b], cand[a] })
	root := make([]int, core)
	for i := range root {
		root[i] = i
	}
	var find func(int) int
	find = func(i int) int {
		if root[i] != i {
			root[i] = find(root[i])
		}
		return root[i]
	}
	for _, e := range cand {
		if a, b := find(e.i), find(e.j); a != b {
			root[a] = b
			es = append(es, e)
		} else if rng.Float64() < 0.35 {
			es = append(es, e)
		}
	}
	for next := core; next < n; {
		length := min(5+rng.IntN(36), n-next)
		first := next
		es = append(es, edge{rng.IntN(core), first})
		for t := first + 1; t < first+length; t++ {
			from := t - 1
			if rng.Float64() < 0.25 {
				from = first + rng.IntN(t-first) // a lateral
			}
			es = append(es, edge{from, t})
		}
		next += length
	}
	return relabel(es, n, rng), core
}

// powerNetwork builds a positive-sequence-like admittance matrix on
// powerNetworkEdges: lines 1/(r+jx), a small shunt (charging and load) at
// every bus and a strong source at a few buses.
func powerNetwork(n int, seed uint64) *Builder {
	rng := rand.New(rand.NewPCG(seed, 99))
	es, _ := powerNetworkEdges(n, rng)
	b := NewBuilder(n)
	for _, e := range es {
		y := 1 / complex(0.01+0.2*rng.Float64(), 0.05+0.5*rng.Float64())
		b.Add(e.i, e.j, -y)
		b.Add(e.i, e.i, y)
		b.Add(e.j, e.j, y)
	}
	for i := 0; i < n; i++ {
		b.Add(i, i, complex(0.01*rng.Float64(), 0.02*rng.Float64()))
	}
	for range max(n/2000, 1) {
		i := rng.IntN(n)
		b.Add(i, i, 5-50i)
	}
	return b
}

// benchFactor factors powerNetwork(n) once for the benchmarks that need a
// Factor, and reports its shape.
func benchFactor(b *testing.B, n int) *Factor {
	b.Helper()
	f, err := powerNetwork(n, 1).Factor()
	if err != nil {
		b.Fatal(err)
	}
	return f
}

func BenchmarkFactor(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			bld := powerNetwork(n, 1)
			var f *Factor
			b.ReportAllocs()
			for b.Loop() {
				var err error
				if f, err = bld.Factor(); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(f.NonZeros()), "nnzL")
		})
	}
}

func BenchmarkSolve(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			f := benchFactor(b, n)
			x := make([]complex128, n)
			b.ReportAllocs()
			for b.Loop() {
				x[n/2] = 1
				f.Solve(x)
			}
		})
	}
}

func BenchmarkColumn(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			f := benchFactor(b, n)
			dst := make([]complex128, n)
			k := 0
			b.ReportAllocs()
			for b.Loop() {
				f.Column(dst, k)
				k = (k + 7919) % n
			}
		})
	}
}

// BenchmarkAllDiagonalPath is Zₖₖ for every k through Path and Dot, the
// allocating form, one op being all n of them.
func BenchmarkAllDiagonalPath(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			f := benchFactor(b, n)
			ws := f.NewWorkspace()
			z := make([]complex128, n)
			total := 0
			b.ReportAllocs()
			for b.Loop() {
				total = 0
				for k := range z {
					p := f.Path(k, ws)
					z[k] = f.Dot(p, p)
					total += p.Len()
				}
			}
			b.ReportMetric(float64(total)/float64(n), "meanpath")
		})
	}
}

// BenchmarkAllDiagonalPathTo is the same with PathTo reusing one Path.
func BenchmarkAllDiagonalPathTo(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			f := benchFactor(b, n)
			ws := f.NewWorkspace()
			z := make([]complex128, n)
			var p Path
			b.ReportAllocs()
			for b.Loop() {
				for k := range z {
					f.PathTo(&p, k, ws)
					z[k] = f.Dot(p, p)
				}
			}
		})
	}
}

// BenchmarkAllDiagonalSweep is Zₖₖ for every k by Factor.Diagonal.
func BenchmarkAllDiagonalSweep(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			f := benchFactor(b, n)
			z := make([]complex128, n)
			b.ReportAllocs()
			for b.Loop() {
				f.Diagonal(z)
			}
		})
	}
}

// BenchmarkOrdering is the minimum degree ordering alone.
func BenchmarkOrdering(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			a := powerNetwork(n, 1).assemble()
			b.ReportAllocs()
			for b.Loop() {
				minimumDegree(a)
			}
		})
	}
}
