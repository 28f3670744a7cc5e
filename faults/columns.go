package faults

import "tripgrade/faults/sparse"

// Columns remembers columns of the bus impedance matrices, Z(x, u) for a
// few buses u and the buses x asked about: the entries a sequence of
// faults near one another keeps asking for (the fault's own node, the ends
// of the branches opened during a fault). Each column is evaluated lazily
// by partial backward substitution (sparse.Column): an entry costs only
// the part of its elimination-tree path no earlier entry of the column
// has computed. It belongs to one goroutine; attach it to a solution with
// UseColumns.
type Columns struct {
	per  int
	nets []*seqNet // the sequence networks with columns, their sets beside
	sets []*columnSet
}

// columnSet is one sequence network's columns, reused round robin.
type columnSet struct {
	bus  []int // the bus each column is of; −1 unused
	cols []*sparse.Column
	next int
}

// NewColumns returns a cache of up to n columns per sequence network.
func (e *Engine) NewColumns(n int) *Columns {
	return &Columns{per: max(n, 1)}
}

// z returns Z(x, u) of sequence network sn.
func (c *Columns) z(sn *seqNet, x, u int) complex128 {
	if c == nil {
		return sn.z(x, u)
	}
	rx, ru := sn.row[x], sn.row[u]
	if rx < 0 || ru < 0 {
		return 0
	}
	var set *columnSet
	for i, n := range c.nets { // a handful: the sequences of the cases and states in use
		if n == sn {
			set = c.sets[i]
			break
		}
	}
	if set == nil {
		set = &columnSet{bus: make([]int, c.per), cols: make([]*sparse.Column, c.per)}
		for i := range set.bus {
			set.bus[i] = -1
		}
		c.nets, c.sets = append(c.nets, sn), append(c.sets, set)
	}
	slot := -1
	for i, b := range set.bus {
		if b == u {
			slot = i
			break
		}
	}
	if slot < 0 {
		slot = set.next
		set.next = (set.next + 1) % len(set.bus)
		if set.cols[slot] == nil {
			set.cols[slot] = sn.fac.NewColumn()
		}
		set.cols[slot].Reset(int(ru))
		set.bus[slot] = u
	}
	return set.cols[slot].At(int(rx))
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
