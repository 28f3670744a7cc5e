package faults

// Columns remembers columns of the bus impedance matrices, Z(x, u) for a
// few buses u and the buses x asked about: the entries a sequence of
// faults near one another keeps asking for (the fault's own node, the ends
// of the branches opened during a fault). It belongs to one goroutine;
// attach it to a solution with UseColumns. Each entry is one sparse dot
// product of the factor's elimination-tree paths when first asked.
type Columns struct {
	keys  []colKey
	vals  [][]complex128
	stamp [][]uint32
	gen   []uint32
	next  int
}

type colKey struct {
	net *seqNet
	u   int
}

// NewColumns returns a cache of up to n columns for the engine's network.
func (e *Engine) NewColumns(n int) *Columns {
	nb := len(e.net.Buses)
	c := &Columns{keys: make([]colKey, n), vals: make([][]complex128, n), stamp: make([][]uint32, n), gen: make([]uint32, n)}
	for i := range c.vals {
		c.vals[i] = make([]complex128, nb)
		c.stamp[i] = make([]uint32, nb)
	}
	return c
}

// z returns Z(x, u) of sequence network sn.
func (c *Columns) z(sn *seqNet, x, u int) complex128 {
	if c == nil {
		return sn.z(x, u)
	}
	slot := -1
	for i, k := range c.keys {
		if k.net == sn && k.u == u && c.gen[i] != 0 {
			slot = i
			break
		}
	}
	if slot < 0 {
		slot = c.next
		c.next = (c.next + 1) % len(c.keys)
		c.keys[slot] = colKey{sn, u}
		c.gen[slot]++
		if c.gen[slot] == 0 {
			clear(c.stamp[slot])
			c.gen[slot] = 1
		}
	}
	if c.stamp[slot][x] != c.gen[slot] {
		c.vals[slot][x] = sn.z(x, u)
		c.stamp[slot][x] = c.gen[slot]
	}
	return c.vals[slot][x]
}

// UseColumns returns a solution of the intact network with c attached as
// its column cache (nil detaches it); solutions derived from it by
// WithKind share it. A solution with open branch ends takes its cache from
// SolveOpenWith.
func (s Solution) UseColumns(c *Columns) Solution {
	if s.out == nil {
		s.cols = c
	}
	return s
}
