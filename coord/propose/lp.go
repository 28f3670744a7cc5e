package propose

import (
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize/convex/lp"
)

// The linear programme, solved with gonum's simplex
// (gonum.org/v1/gonum/optimize/convex/lp):
//
//	minimise Σ x_i
//	subject to x_U − K·x_D ≥ B for every margin constraint,
//	           lo_i ≤ x_i ≤ hi_i.
//
// gonum's Simplex works on dense matrices and refactors the basis at
// every pivot, so its time grows with the cube of the rows; the search
// uses it for every connected group of multipliers of up to maxLPRows
// constraints and the label-correcting search (least.go), which gives the
// same optimum (the constraints are monotone), for larger groups. The
// tests hold the two, and scipy's linprog, to the same answer.

// maxLPRows is the largest group, in constraints and upper bounds, solved
// by the simplex.
const maxLPRows = 150

// lpTol is the simplex's tolerance on the reduced costs.
const lpTol = 1e-10

// components groups the variables that constraints link, each group in
// increasing order, groups by their first variable.
func (p *problem) components() [][]int {
	n := len(p.lo)
	parent := make([]int, n)
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	for _, e := range p.edges {
		if !e.dropped {
			a, b := find(e.u), find(e.d)
			if a != b {
				parent[max(a, b)] = min(a, b)
			}
		}
	}
	index := map[int]int{}
	var out [][]int
	for i := 0; i < n; i++ {
		r := find(i)
		g, ok := index[r]
		if !ok {
			g = len(out)
			index[r] = g
			out = append(out, nil)
		}
		out[g] = append(out[g], i)
	}
	return out
}

// solveLP solves the programme of one group of variables with gonum's
// simplex and returns their values in the group's order.
func (p *problem) solveLP(group []int) ([]float64, error) {
	at := map[int]int{}
	for j, v := range group {
		at[v] = j
	}
	var es []edge
	for _, ei := range p.groupEdges(group) {
		es = append(es, p.edges[ei])
	}
	n, m := len(group), len(es)
	// Columns: y = x − lo (n), an edge's surplus (m), an upper slack (n).
	// Rows: y_U − K·y_D − s = B + K·lo_D − lo_U; y_i + t_i = hi_i − lo_i.
	cols := 2*n + m
	a := mat.NewDense(m+n, cols, nil)
	b := make([]float64, m+n)
	c := make([]float64, cols)
	for j := 0; j < n; j++ {
		c[j] = 1
	}
	for r, e := range es {
		u, d := at[e.u], at[e.d]
		a.Set(r, u, 1)
		a.Set(r, d, a.At(r, d)-e.k)
		a.Set(r, n+r, -1)
		b[r] = e.b + e.k*p.lo[e.d] - p.lo[e.u]
	}
	for j, v := range group {
		a.Set(m+j, j, 1)
		a.Set(m+j, n+m+j, 1)
		b[m+j] = p.hi[v] - p.lo[v]
	}
	_, y, err := lp.Simplex(c, a, b, lpTol, nil)
	if err != nil {
		return nil, err
	}
	x := make([]float64, n)
	for j, v := range group {
		x[j] = p.lo[v] + math.Max(y[j], 0)
	}
	return x, nil
}

// groupEdges lists the edges within a group that are not dropped.
func (p *problem) groupEdges(group []int) []int {
	var out []int
	for _, v := range group {
		for _, ei := range p.byD[v] {
			if !p.edges[ei].dropped {
				out = append(out, ei)
			}
		}
	}
	return out
}

// solve returns the least continuous multipliers: by the label-correcting
// search, which also finds and drops the conflicts, then by the simplex
// for every group small enough. lpGroups counts the groups the simplex
// solved.
func (p *problem) solve() (x []float64, lpGroups int, err error) {
	x, err = p.continuous()
	if err != nil {
		return nil, 0, err
	}
	for _, g := range p.components() {
		rows := len(g) + len(p.groupEdges(g))
		if len(g) < 2 || rows > maxLPRows {
			continue
		}
		y, err := p.solveLP(g)
		if err != nil {
			// The simplex failed numerically: the search's values stand.
			continue
		}
		for j, v := range g {
			x[v] = y[j]
		}
		lpGroups++
	}
	return x, lpGroups, nil
}
