package coord

import (
	"sort"

	"tripgrade/faults"
)

// Zone is the part of the network a device protects first: the faulted
// elements (buses and branches) for which it is the device that must
// clear the fault from its side, and the devices it backs up.
type Zone struct {
	Device int
	// IntoBus is true for a device whose zone starts at its bus rather
	// than in its branch (a transformer's LV incomer looking into the
	// busbar).
	IntoBus bool
	// Start is the fault just beyond the device: its largest through-fault.
	Start faults.Place
	// Buses and Branches are inside the zone.
	Buses    []int
	Branches []int
	// Next are the devices the device backs up: those it would have to
	// clear a fault for if they failed.
	Next []int
	// FarEnd are the fault places at the far end: where the next devices
	// sit (Boundary), and the open ends of the zone.
	FarEnd   []faults.Place
	Boundary []faults.Place
}

// Topology holds the direction of every branch (away from the grid
// sources) and each device's zone.
type Topology struct {
	// Downstream is, per branch, the end farther from the grid sources
	// (electrically, generators left out): the direction loads are fed in.
	Downstream []faults.End
	Zones      []Zone // per device
	// beyond lists, per device, every bus forward of it whatever devices
	// lie between (for the load through it).
	beyond [][]int
	// adj lists the branches at each bus.
	adj [][]int
	// ratioKV is each bus's voltage by rated winding ratios
	// (faults.Network.RatioKV), for referring currents across
	// transformers.
	ratioKV []float64
	// pairPlaces lists, per backup pair (upstream, downstream), the fault
	// places for which the upstream device backs the downstream one up.
	pairPlaces map[[2]int][]faults.Place
	// dist is each bus's electrical distance from the grid sources
	// (faults.Engine.SourceDistance).
	dist []float64
	// loadsAt lists, per bus, the study's loads there (indices into
	// Study.Loads, ascending).
	loadsAt [][]int
}

// Above reports whether device u sits nearer the grid sources than
// device d (generators left out): its branch reaches nearer them, or, on
// the same reach, its own end is the nearer one (the HV relay of a
// transformer above the LV incomer, which is above the feeders of its
// busbar). Two incomers of one busbar, or two feeders, are level.
func (t *Topology) Above(n *faults.Network, u, d Device) bool {
	if t.dist == nil {
		return true
	}
	key := func(dev Device) [2]float64 {
		f, to := n.BranchEnds(dev.Point.Branch)
		return [2]float64{min(t.dist[f], t.dist[to]), t.dist[DeviceBus(n, dev)]}
	}
	a, b := key(u), key(d)
	return a[0] < b[0] || a[0] == b[0] && a[1] < b[1]
}

// PairPlaces returns the fault places for which device u backs device d
// up in the maximum case (nil when the topology gives no such relation, as
// for a pair the study adds by hand). The minimum case's faults at the
// same places are the pair's too.
func (t *Topology) PairPlaces(u, d int) []faults.Place {
	return t.pairPlaces[[2]int{u, d}]
}

// NewTopology finds the direction of every branch and, fault by fault,
// every device's zone: for every fault of the maximum case (three-phase
// and, where it draws current, phase-to-earth), the devices that must
// clear it are, on every side that feeds it, the nearest device that
// operates for it — a directional stage only for current in its direction
// (forward: into its branch; reverse: into its bus), a non-directional
// one either way. Those faults make up the device's zone. Taking a device out and searching again gives the
// devices behind it on its side: its backups, which make the backup
// pairs. The direction of each branch comes from the grid sources alone,
// so embedded generation, whatever its size, changes no zone of a device
// it does not feed through.
func NewTopology(s *Study, eng *faults.Engine) (*Topology, error) {
	n := s.Network
	t := &Topology{Downstream: make([]faults.End, n.BranchCount()), loadsAt: make([][]int, len(n.Buses))}
	for i, l := range s.Loads {
		t.loadsAt[l.Bus] = append(t.loadsAt[l.Bus], i)
	}
	dist := eng.SourceDistance()
	t.dist = dist
	for b := range t.Downstream {
		f, to := n.BranchEnds(b)
		t.Downstream[b] = faults.To
		if dist[f] > dist[to] {
			t.Downstream[b] = faults.From
		}
	}
	adj := make([][]int, len(n.Buses))
	for b := 0; b < n.BranchCount(); b++ {
		f, to := n.BranchEnds(b)
		adj[f] = append(adj[f], b)
		adj[to] = append(adj[to], b)
	}
	t.adj = adj
	t.ratioKV = n.RatioKV()
	x := newNetIndex(s, eng, t.ratioKV, nil)
	rel, err := x.zonePass()
	if err != nil {
		return nil, err
	}
	t.Zones = rel.zones(x, t)
	t.pairPlaces = map[[2]int][]faults.Place{}
	for k, pls := range rel.pairs {
		t.pairPlaces[k] = sortedPlaces(pls)
	}
	w := walker{n: n, t: t, adj: adj}
	t.beyond = make([][]int, len(s.Devices))
	for i, d := range s.Devices {
		t.beyond[i] = w.beyond(d)
	}
	return t, nil
}

// Prepare builds the fault engine of a study and its topology: what every
// check, fault table and chart starts from.
func Prepare(s *Study) (*faults.Engine, *Topology, error) {
	eng, err := faults.New(s.Network, s.Faults)
	if err != nil {
		return nil, nil, err
	}
	t, err := NewTopology(s, eng)
	if err != nil {
		return nil, nil, err
	}
	return eng, t, nil
}

// IntoBranch reports whether a point sits at its branch's end nearer the
// grid sources (its branch leads away from them).
func (t *Topology) IntoBranch(pt faults.Point) bool { return t.Downstream[pt.Branch] != pt.End }

// relations are what the zone pass found: for each device the elements it
// must clear and the devices it backs up.
type relations struct {
	buses    []map[int]bool // per device
	branches []map[int]bool
	next     []map[int]bool
	pairs    map[[2]int]map[faults.Place]bool // (upstream, downstream) → fault places
}

func newRelations(nd int) *relations {
	r := &relations{buses: make([]map[int]bool, nd), branches: make([]map[int]bool, nd), next: make([]map[int]bool, nd),
		pairs: map[[2]int]map[faults.Place]bool{}}
	for i := 0; i < nd; i++ {
		r.buses[i], r.branches[i], r.next[i] = map[int]bool{}, map[int]bool{}, map[int]bool{}
	}
	return r
}

func (r *relations) merge(o *relations) {
	for i := range r.buses {
		for k := range o.buses[i] {
			r.buses[i][k] = true
		}
		for k := range o.branches[i] {
			r.branches[i][k] = true
		}
		for k := range o.next[i] {
			r.next[i][k] = true
		}
	}
	for k, pls := range o.pairs {
		for pl := range pls {
			r.pair(k[0], k[1], pl)
		}
	}
}

// pair records that u backs d up for the fault at place pl.
func (r *relations) pair(u, d int, pl faults.Place) {
	m, ok := r.pairs[[2]int{u, d}]
	if !ok {
		m = map[faults.Place]bool{}
		r.pairs[[2]int{u, d}] = m
	}
	m[pl] = true
}

// zonePass searches who must clear every maximum-case fault, and who
// backs each of them up, on every CPU.
func (x *netIndex) zonePass() (*relations, error) {
	nd := len(x.s.Devices)
	rels, err := overNodes(x, func() *relations { return newRelations(nd) }, func(ws *workspace, r *relations, _ int, n node) error {
		return x.zoneNode(ws, r, n)
	})
	if err != nil {
		return nil, err
	}
	total := newRelations(nd)
	for _, r := range rels {
		total.merge(r)
	}
	return total, nil
}

// zoneNode records the zone relations of one node's faults.
func (x *netIndex) zoneNode(ws *workspace, r *relations, nd node) error {
	eng := x.eng
	sol, err := eng.Solve(eng.CaseFault(nd.place, faults.LLL, faults.Max))
	if err != nil || !sol.Energised() {
		return err
	}
	sol = sol.Use(ws.sc)
	p := x.newProbe(&ws.intact, sol, nil)
	for _, ne := range nd.elems {
		v, err := x.elementView(ws, p, sol, ne, faults.Max)
		if err != nil {
			return err
		}
		big := faultSize(v.kinds[faults.LLL])
		for _, k := range []faults.Kind{faults.LLL, faults.LG} {
			if faultSize(v.kinds[k]) <= isolatedShare*big {
				continue
			}
			tt := ws.tables[0]
			tt.reset(v, k)
			sees := tt.operates
			cl := v.search(sees, nil)
			for _, d := range cl.must {
				if ne.el.bus >= 0 {
					r.buses[d][ne.el.bus] = true
				} else {
					r.branches[d][ne.el.branch] = true
				}
				out := map[int]bool{d: true}
				back := v.search(sees, func(e int) bool { return out[e] })
				for _, u := range back.must {
					if !contains(cl.must, u) {
						r.next[u][d] = true
						r.pair(u, d, ne.place)
					}
				}
			}
		}
	}
	return nil
}

// zones builds every device's Zone from the relations.
func (r *relations) zones(x *netIndex, t *Topology) []Zone {
	n := x.n
	out := make([]Zone, len(x.s.Devices))
	for i, d := range x.s.Devices {
		z := Zone{Device: i, Buses: keys(r.buses[i]), Branches: keys(r.branches[i]), Next: keys(r.next[i])}
		if r.branches[i][d.Point.Branch] || len(z.Buses) == 0 {
			z.Start = closeIn(d.Point.Branch, d.Point.End)
		} else {
			z.IntoBus = true
			z.Start = faults.AtBus(DeviceBus(n, d))
		}
		var ps placeSet
		for _, m := range z.Next {
			ps.add(startOf(x, r, m))
		}
		z.Boundary = append([]faults.Place(nil), ps.list...)
		// The zone's own ends: buses of the zone (or at the far end of its
		// branches) where no branch of the zone continues and no device it
		// backs up takes over.
		inZone := func(b int) bool { return r.branches[i][b] }
		nextAt := map[int]bool{}
		for _, m := range z.Next {
			nextAt[DeviceBus(n, x.s.Devices[m])] = true
		}
		ends := map[int]bool{}
		for _, b := range z.Branches {
			f, to := n.BranchEnds(b)
			ends[f], ends[to] = true, true
		}
		for _, k := range z.Buses {
			ends[k] = true
		}
		for _, k := range keys(ends) {
			if k == DeviceBus(n, d) && !z.IntoBus {
				continue
			}
			count := 0
			for _, b := range t.adj[k] {
				if inZone(b) {
					count++
				}
			}
			if count <= 1 && !nextAt[k] && !n.Buses[k].Internal {
				ps.add(faults.AtBus(k))
			}
		}
		z.FarEnd = ps.list
		if len(z.FarEnd) == 0 {
			z.FarEnd = []faults.Place{z.Start}
		}
		out[i] = z
	}
	return out
}

// startOf is the fault just beyond device m, as its zone starts.
func startOf(x *netIndex, r *relations, m int) faults.Place {
	d := x.s.Devices[m]
	if r.branches[m][d.Point.Branch] || len(r.buses[m]) == 0 {
		return closeIn(d.Point.Branch, d.Point.End)
	}
	return faults.AtBus(DeviceBus(x.n, d))
}

// sortedPlaces returns a set of places in a fixed order: buses, then
// branches by index and position.
func sortedPlaces(m map[faults.Place]bool) []faults.Place {
	out := make([]faults.Place, 0, len(m))
	for pl := range m {
		out = append(out, pl)
	}
	sort.Slice(out, func(i, j int) bool {
		a, b := out[i], out[j]
		if a.Branch != b.Branch {
			return a.Branch < b.Branch
		}
		if a.Bus != b.Bus {
			return a.Bus < b.Bus
		}
		return a.Frac < b.Frac
	})
	return out
}

func keys(m map[int]bool) []int {
	out := make([]int, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Ints(out)
	return out
}

type walker struct {
	n   *faults.Network
	t   *Topology
	adj [][]int
}

func pointBus(n *faults.Network, pt faults.Point) int {
	f, to := n.BranchEnds(pt.Branch)
	if pt.End == faults.From {
		return f
	}
	return to
}

func otherEnd(e faults.End) faults.End {
	if e == faults.From {
		return faults.To
	}
	return faults.From
}

// closeIn is the fault just inside branch b at end e.
func closeIn(b int, e faults.End) faults.Place {
	if e == faults.From {
		return faults.OnBranch(b, 0)
	}
	return faults.OnBranch(b, 1)
}

// beyond returns every bus forward of a device, through other devices,
// following the branches away from the grid sources.
func (w *walker) beyond(d Device) []int {
	seen := map[int]bool{}
	var out, queue []int
	visit := func(bus int) {
		if !seen[bus] {
			seen[bus] = true
			out = append(out, bus)
			queue = append(queue, bus)
		}
	}
	if w.t.IntoBranch(d.Point) {
		visit(pointBus(w.n, faults.Point{Branch: d.Point.Branch, End: w.t.Downstream[d.Point.Branch]}))
	} else {
		visit(pointBus(w.n, d.Point))
	}
	for len(queue) > 0 {
		x := queue[0]
		queue = queue[1:]
		for _, b := range w.adj[x] {
			if b == d.Point.Branch {
				continue
			}
			down := w.t.Downstream[b]
			if pointBus(w.n, faults.Point{Branch: b, End: otherEnd(down)}) == x {
				visit(pointBus(w.n, faults.Point{Branch: b, End: down}))
			}
		}
	}
	sort.Ints(out)
	return out
}

// Beyond returns every bus forward of device i, whatever devices lie
// between: the buses whose loads flow through it.
func (t *Topology) Beyond(i int) []int { return t.beyond[i] }

// ReferA returns a current of a amperes at bus from referred to bus to by
// the rated winding ratios of the transformers between them (the ratio the
// fault engine carries currents by), not by nominal bus voltages.
func (t *Topology) ReferA(a float64, from, to int) float64 {
	return a * t.ratioKV[from] / t.ratioKV[to]
}

// RatioKV returns bus k's voltage by rated winding ratios: the voltage to
// name when a current is referred to bus k with ReferA.
func (t *Topology) RatioKV(k int) float64 { return t.ratioKV[k] }

// BranchesAt returns the branches that end at bus k.
func (t *Topology) BranchesAt(k int) []int { return t.adj[k] }
