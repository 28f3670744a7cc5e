package faults

import (
	"fmt"
	"math/cmplx"
	"sort"
)

// Opening is what has been disconnected from the network during a fault:
// branch ends whose breakers (or fuses) have opened, and sources and
// generators (by index into the Network's lists) that their own
// protection has taken out.
type Opening struct {
	Ends       []Point
	Sources    []int
	Generators []int
}

// Empty reports whether nothing is open.
func (o Opening) Empty() bool { return len(o.Ends)+len(o.Sources)+len(o.Generators) == 0 }

// SolveOpen solves fault f with the breakers at the given branch ends
// open (and the given sources and generators out): the network a fault
// sees after the first devices have cleared their part of it. A branch open at one end hangs from its other bus and
// carries only what its own shunt paths draw (a YNd transformer still
// earths its star side); a branch open at both ends is out of the network.
// A fault on a branch whose open end separates it from its bus is fed
// through the branch from the other end only; a fault cut off from every
// source is not energised.
//
// The intact factorization is reused: opening branch ends changes each
// sequence admittance matrix by a term of rank at most two per branch, so
// the impedance entries of the changed network follow from those of the
// intact one by the Sherman–Morrison–Woodbury identity,
// Z' = Z − Z_U (I + ΔY_UU Z_UU)⁻¹ ΔY_UU Z_U, with U the buses at the ends
// of the opened branches (Golub & Van Loan, Matrix Computations, §2.1.4).
// A part of the network left with no path to earth makes the small matrix
// singular; it is then earthed through an admittance 1e-9 of the removed
// one, which leaves the rest unchanged to that order and makes the fault's
// impedance in the cut-off part practically infinite.
func (e *Engine) SolveOpen(f Fault, o Opening) (Solution, error) {
	return e.SolveOpenWith(f, o, nil)
}

// SolveOpenWith is SolveOpen with a column cache for the impedance entries
// it needs (nil: none); the solution keeps it.
func (e *Engine) SolveOpenWith(f Fault, o Opening, cols *Columns) (Solution, error) {
	if o.Empty() {
		s, err := e.Solve(f)
		return s.UseColumns(cols), err
	}
	n := e.net
	for _, pt := range o.Ends {
		if pt.Branch < 0 || pt.Branch >= n.BranchCount() || pt.End > To {
			return Solution{}, fmt.Errorf("open branch end %+v out of range", pt)
		}
	}
	for _, i := range o.Sources {
		if i < 0 || i >= len(n.Sources) {
			return Solution{}, fmt.Errorf("source %d out of range", i)
		}
	}
	for _, i := range o.Generators {
		if i < 0 || i >= len(n.Generators) {
			return Solution{}, fmt.Errorf("generator %d out of range", i)
		}
	}
	s, err := e.Solve(f)
	if err != nil || !s.live {
		return s, err
	}
	s.cols = cols
	of := newOutageFault(e, &s, o)
	dead := func() (Solution, error) {
		s.live, s.iseq, s.out = false, [3]complex128{}, nil
		return s, nil
	}
	if of.isolated {
		return dead()
	}
	s.out = of
	for q := range s.zff {
		intact := s.zff[q]
		s.open[q], s.zff[q] = of.seq[q].open, of.seq[q].zff
		// An impedance grown beyond any real network's: the fault is cut
		// off from every path to earth in that sequence (a part earthed
		// only through the regularising admittance).
		if !s.open[q] && cmplx.Abs(s.zff[q]) > isolatedGrowth*cmplx.Abs(intact) {
			s.open[q], of.seq[q].open = true, true
		}
	}
	if s.open[pos] {
		return dead()
	}
	return s.WithKind(f.Kind, f.ZOhm), nil
}

// isolatedGrowth is how much the positive-sequence Thevenin impedance of a
// fault may grow when branch ends open before the fault counts as cut off
// from every source: a weak remaining infeed raises it by a factor of tens
// or hundreds, a part earthed only through the regularising admittance by
// about 1e9.
const isolatedGrowth = 1e6

// regularise is the admittance, relative to the largest removed one, that
// earths a part of a sequence network left floating by an opening.
const regularise = 1e-9

// singularPivot is the smallest pivot, relative to the largest entry, of
// the small Woodbury matrix before it counts as singular.
const singularPivot = 1e-11

// outageFault is one fault in a network with branch ends open.
type outageFault struct {
	e       *Engine
	openEnd map[Point]bool
	removed map[int]bool // branches with an open end
	off     Opening
	cols    *Columns
	// sep is the faulted branch when an open end separates the fault from
	// its own bus (−1 otherwise): the fault is then fed through conn from
	// bus feed.
	sep      int
	sepEnd   End // the end of sep that is fed
	feed     int
	isolated bool
	seq      [3]*outageSeq
}

// outageSeq is the changed network of one sequence, for one fault.
type outageSeq struct {
	sn   *seqNet
	cols *Columns
	conn block // for a separated fault: ff at the fault node, tt at the feed bus
	u    []int
	w    [][]complex128 // (I + ΔY_UU Z_UU)⁻¹ ΔY_UU
	open bool
	zff  complex128
	// transfer(x) = alpha·(wi·Z_xi + wj·Z_xj − Σ_k Z_{x,u[k]}·g[k])
	i, j   int
	wi, wj complex128
	g      []complex128
	alpha  complex128
}

func newOutageFault(e *Engine, s *Solution, o Opening) *outageFault {
	n := e.net
	of := &outageFault{e: e, openEnd: map[Point]bool{}, removed: map[int]bool{}, sep: -1, off: o, cols: s.cols}
	for _, pt := range o.Ends {
		of.openEnd[pt] = true
		of.removed[pt.Branch] = true
	}
	pl := s.fault.Place
	if !pl.IsBus() && of.removed[pl.Branch] {
		b := pl.Branch
		oF, oT := of.openEnd[Point{b, From}], of.openEnd[Point{b, To}]
		cutFrom := oF && pl.Frac < 1 // the fault node has lost the From side
		cutTo := oT && pl.Frac > 0
		from, to := n.BranchEnds(b)
		switch {
		case cutFrom && (cutTo || (pl.Frac == 0 && oT)):
			of.isolated = true
			return of
		case cutTo && pl.Frac == 1 && oF:
			of.isolated = true
			return of
		case cutFrom:
			of.sep, of.sepEnd, of.feed = b, To, to
		case cutTo:
			of.sep, of.sepEnd, of.feed = b, From, from
		}
	}
	for q := range of.seq {
		if q == neg && e.cases[s.fault.Case][neg] == e.cases[s.fault.Case][pos] {
			of.seq[neg] = of.seq[pos]
			continue
		}
		of.seq[q] = of.build(s, q)
	}
	return of
}

// stubAdmittance returns what a branch open at one end draws at its other
// end: the Schur complement of its block with the open end floating.
func stubAdmittance(blk block, closed End) complex128 {
	a, d := blk.tt, blk.ff // a: floating end, d: closed end
	if closed == To {
		a, d = blk.ff, blk.tt
	}
	if a == 0 {
		return d
	}
	return d - blk.ft*blk.ft/a
}

// build prepares sequence q of the changed network for fault s.
func (of *outageFault) build(s *Solution, q int) *outageSeq {
	n := of.e.net
	sn := of.e.cases[s.fault.Case][q]
	os := &outageSeq{sn: sn, cols: of.cols}
	// ΔY on the buses of the opened branches (a handful of entries: the
	// buses are found by a linear search).
	type entry struct {
		a, b int
		y    complex128
	}
	var dy []entry
	add := func(a, b int, y complex128) {
		if y != 0 && sn.row[a] >= 0 && sn.row[b] >= 0 {
			dy = append(dy, entry{a, b, y})
		}
	}
	branches := make([]int, 0, len(of.removed))
	for b := range of.removed {
		branches = append(branches, b)
	}
	sort.Ints(branches)
	ymax := 0.0
	for _, b := range branches {
		blk := sn.branch[b]
		f, t := n.BranchEnds(b)
		add(f, f, -blk.ff)
		add(t, t, -blk.tt)
		add(f, t, -blk.ft)
		add(t, f, -blk.ft)
		for _, y := range []complex128{blk.ff, blk.ft, blk.tt} {
			ymax = max(ymax, cmplx.Abs(y))
		}
		oF, oT := of.openEnd[Point{b, From}], of.openEnd[Point{b, To}]
		switch {
		case b == of.sep || (oF && oT):
		case oF:
			add(t, t, stubAdmittance(blk, To))
		default:
			add(f, f, stubAdmittance(blk, From))
		}
	}
	// Sources and generators taken out.
	for _, i := range of.off.Sources {
		bus := n.Sources[i].Bus
		add(bus, bus, -sn.srcY[i])
		ymax = max(ymax, cmplx.Abs(sn.srcY[i]))
	}
	for _, i := range of.off.Generators {
		bus := n.Generators[i].Bus
		add(bus, bus, -sn.genY[i])
		ymax = max(ymax, cmplx.Abs(sn.genY[i]))
	}
	index := func(x int) int {
		for k, u := range os.u {
			if u == x {
				return k
			}
		}
		os.u = append(os.u, x)
		return len(os.u) - 1
	}
	for _, e := range dy {
		index(e.a)
		index(e.b)
	}
	sort.Ints(os.u)
	m := len(os.u)
	dY := make([][]complex128, m)
	for k := range dY {
		dY[k] = make([]complex128, m)
	}
	for _, e := range dy {
		dY[index(e.a)][index(e.b)] += e.y
	}
	zuu := make([][]complex128, m)
	for a := range zuu {
		zuu[a] = make([]complex128, m)
		for b := a; b < m; b++ {
			zuu[a][b] = os.cols.z(sn, os.u[a], os.u[b])
		}
		for b := 0; b < a; b++ {
			zuu[a][b] = zuu[b][a]
		}
	}
	os.w = woodbury(dY, zuu, complex(regularise*ymax, 0))

	// The fault node in the changed network.
	if of.sep < 0 {
		os.i, os.j, os.wi, os.wj, os.alpha = s.i, s.j, complex(1-s.p, 0), complex(s.p, 0), 1
		if s.p == 0 {
			os.wi, os.wj = 1, 0
		}
		if s.open[q] {
			os.open = true
			return os
		}
		os.g = os.apply(func(x int) complex128 { return os.wi*os.cols.z(sn, x, os.i) + os.wj*os.cols.z(sn, x, os.j) })
		zp := func(a, b int) complex128 { return os.zChanged(a, b) }
		if s.p == 0 {
			os.zff = zp(s.i, s.i)
		} else {
			p := complex(s.p, 0)
			zl := sn.series[s.fault.Place.Branch]
			os.zff = (1-p)*(1-p)*zp(s.i, s.i) + p*p*zp(s.j, s.j) + 2*p*(1-p)*zp(s.i, s.j) + p*(1-p)*zl
		}
		return os
	}
	// A fault separated from its bus: fed from bus feed through conn.
	blk := sn.branch[of.sep]
	if n.IsTransformer(of.sep) {
		os.conn = blk
		if of.sepEnd == From { // fed from From: the fault node is the To terminal
			os.conn = block{ff: blk.tt, ft: blk.ft, tt: blk.ff}
		}
	} else {
		z := sn.series[of.sep]
		frac := s.fault.Place.Frac
		zs := complex(1-frac, 0) * z // fed from To
		if of.sepEnd == From {
			zs = complex(frac, 0) * z
		}
		os.conn = seriesBlock(zs, 1)
	}
	a, c, d := os.conn.ff, os.conn.ft, os.conn.tt
	os.i, os.j, os.wi = of.feed, of.feed, 1
	if a == 0 {
		os.open = true
		return os
	}
	if sn.row[of.feed] < 0 {
		// The feed bus has no path to earth in this sequence: only the
		// branch's own shunt path at the fault side remains.
		den := a
		if d != 0 {
			den = a - c*c/d
		}
		if den == 0 {
			os.open = true
			return os
		}
		os.zff = 1 / den
		return os
	}
	os.g = os.apply(func(x int) complex128 { return os.cols.z(sn, x, of.feed) })
	zee := os.zChanged(of.feed, of.feed)
	zpp := zee / (1 + d*zee)
	den := a - c*c*zpp
	if den == 0 {
		os.open = true
		return os
	}
	os.zff = 1 / den
	os.alpha = -c * os.zff / (1 + d*zee)
	return os
}

// apply returns W·v_U, with v evaluated at the change's buses.
func (os *outageSeq) apply(v func(x int) complex128) []complex128 {
	m := len(os.u)
	vu := make([]complex128, m)
	for k, x := range os.u {
		vu[k] = v(x)
	}
	g := make([]complex128, m)
	for a := 0; a < m; a++ {
		for b := 0; b < m; b++ {
			g[a] += os.w[a][b] * vu[b]
		}
	}
	return g
}

// zChanged returns Z'_ab of the changed network.
func (os *outageSeq) zChanged(a, b int) complex128 {
	z := os.cols.z(os.sn, a, b)
	m := len(os.u)
	if m == 0 || os.sn.row[a] < 0 || os.sn.row[b] < 0 {
		return z
	}
	zb := make([]complex128, m)
	for k, x := range os.u {
		zb[k] = os.cols.z(os.sn, x, b)
	}
	for k, x := range os.u {
		var t complex128
		for l := range zb {
			t += os.w[k][l] * zb[l]
		}
		z -= os.cols.z(os.sn, a, x) * t
	}
	return z
}

// transfer returns Z'_xf in this sequence.
func (os *outageSeq) transfer(x int) complex128 {
	sn := os.sn
	if os.open || os.alpha == 0 || sn.row[x] < 0 {
		return 0
	}
	z := os.wi * os.cols.z(sn, x, os.i)
	if os.wj != 0 {
		z += os.wj * os.cols.z(sn, x, os.j)
	}
	for k, u := range os.u {
		z -= os.cols.z(sn, x, u) * os.g[k]
	}
	return os.alpha * z
}

func (of *outageFault) transfer(q, x int) complex128 { return of.seq[q].transfer(x) }

// branchCurrent gives the current of sequence q at a point on an opened
// branch (done false for the other branches, which follow the intact
// formula with the changed transfer impedances).
func (of *outageFault) branchCurrent(s *Solution, q int, pt Point) (complex128, bool) {
	b := pt.Branch
	if !of.removed[b] {
		return 0, false
	}
	if of.openEnd[pt] {
		return 0, true
	}
	os := of.seq[q]
	from, to := of.e.net.BranchEnds(b)
	here := from
	if pt.End == To {
		here = to
	}
	dv := complex128(0)
	if os.sn.row[here] >= 0 {
		dv = -s.transfer(q, here)
	}
	if b == of.sep {
		if os.open {
			return 0, true
		}
		// Current from the feed bus into the branch towards the fault node.
		return os.conn.ft*(-os.zff) + os.conn.tt*dv, true
	}
	cur := stubAdmittance(os.sn.branch[b], pt.End) * dv
	pl := s.fault.Place
	if pl.Branch == b && ((pl.Frac == 0 && pt.End == From) || (pl.Frac == 1 && pt.End == To)) {
		cur += 1 // the fault itself, just beyond this end's current transformer
	}
	return cur, true
}

// woodbury returns (I + ΔY·Z)⁻¹·ΔY for small dense matrices, earthing every
// bus of the change through eps when the matrix is singular (a part of the
// network left floating).
func woodbury(dY, z [][]complex128, eps complex128) [][]complex128 {
	m := len(dY)
	if m == 0 {
		return nil
	}
	for try := 0; try < 2; try++ {
		s := make([][]complex128, m)
		for a := range s {
			s[a] = make([]complex128, 2*m)
			for b := 0; b < m; b++ {
				var t complex128
				for k := 0; k < m; k++ {
					t += dY[a][k] * z[k][b]
				}
				if a == b {
					t++
				}
				s[a][b] = t
				s[a][m+b] = dY[a][b]
			}
		}
		if gaussJordan(s, m) {
			w := make([][]complex128, m)
			for a := range w {
				w[a] = s[a][m:]
			}
			return w
		}
		for a := 0; a < m; a++ {
			dY[a][a] += eps
		}
	}
	// Still singular: leave the network unchanged rather than divide by
	// zero (cannot happen once every bus of the change is earthed).
	w := make([][]complex128, m)
	for a := range w {
		w[a] = make([]complex128, m)
	}
	return w
}

// gaussJordan reduces the m×2m augmented matrix [S | B] to [I | S⁻¹B] with
// partial pivoting; false when S is singular.
func gaussJordan(s [][]complex128, m int) bool {
	scale := 0.0
	for a := 0; a < m; a++ {
		for b := 0; b < m; b++ {
			scale = max(scale, cmplx.Abs(s[a][b]))
		}
	}
	for col := 0; col < m; col++ {
		p := col
		for r := col + 1; r < m; r++ {
			if cmplx.Abs(s[r][col]) > cmplx.Abs(s[p][col]) {
				p = r
			}
		}
		if cmplx.Abs(s[p][col]) <= singularPivot*scale {
			return false
		}
		s[col], s[p] = s[p], s[col]
		inv := 1 / s[col][col]
		for c := col; c < 2*m; c++ {
			s[col][c] *= inv
		}
		for r := 0; r < m; r++ {
			if r == col || s[r][col] == 0 {
				continue
			}
			f := s[r][col]
			for c := col; c < 2*m; c++ {
				s[r][c] -= f * s[col][c]
			}
		}
	}
	return true
}
