package faults

// Scratch caches the transfer impedances of one solution's fault node to
// the buses asked about, so that many measuring points and voltages of one
// fault place share them. It belongs to one goroutine; attach it to a
// solution with Solution.Use, which empties it.
type Scratch struct {
	stamp []uint32
	val   [][3]complex128
	gen   uint32
}

// NewScratch returns an empty cache for the engine's network.
func (e *Engine) NewScratch() *Scratch {
	nb := len(e.net.Buses)
	return &Scratch{stamp: make([]uint32, nb), val: make([][3]complex128, nb)}
}

// Use returns the solution with sc attached as its transfer-impedance
// cache, emptied. Solutions derived from the result by WithKind share the
// cache (the transfer impedances depend only on the place, the case and
// the open branch ends); a solution of another place needs Use again.
func (s Solution) Use(sc *Scratch) Solution {
	sc.gen++
	if sc.gen == 0 {
		clear(sc.stamp)
		sc.gen = 1
	}
	s.sc = sc
	return s
}

// transfer returns Z_xf in sequence q, computing all three sequences of
// bus x on the first request.
func (sc *Scratch) transfer(s *Solution, q, x int) complex128 {
	if sc.stamp[x] != sc.gen {
		nets := &s.e.cases[s.fault.Case]
		var v [3]complex128
		for r := range v {
			if r == neg && nets[neg] == nets[pos] && (s.out == nil || s.out.seq[neg] == s.out.seq[pos]) {
				v[neg] = v[pos]
				continue
			}
			if s.open[r] {
				continue
			}
			v[r] = s.transferUncached(r, x)
		}
		sc.val[x], sc.stamp[x] = v, sc.gen
	}
	return sc.val[x][q]
}

// Share returns the solution with sc attached as it is, without emptying
// it: for a fault at the same electrical node, in the same case and with
// the same open branch ends as the solution sc was last attached to by
// Use (a bus fault and the close-in faults of the branches at that bus).
func (s Solution) Share(sc *Scratch) Solution {
	s.sc = sc
	return s
}

// Node returns the fault node's electrical identity: two solutions with
// equal nodes (and the same case and open branch ends) have the same
// transfer impedances. A bus fault and a close-in fault at that bus share
// a node; a fault along a line has its own.
func (s Solution) Node() (i, j int, p float64) { return s.i, s.j, s.p }
