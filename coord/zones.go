package coord

import (
	"sort"

	"tripgrade/faults"
)

// Zone is the part of the network a device protects first: the branch it
// looks into (or, for a device looking into its bus, that bus) and
// everything beyond it away from the sources, up to the next devices that
// look the same way.
type Zone struct {
	Device int
	// IntoBus is true for a device that looks into its bus rather than its
	// branch (a transformer's LV incomer).
	IntoBus bool
	// Start is the fault just beyond the device: its largest through-fault.
	Start faults.Place
	// Buses and Branches are inside the zone.
	Buses    []int
	Branches []int
	// Next are the devices at the zone's far end, which the device backs up.
	Next []int
	// FarEnd are the fault places at the far end: where the next devices
	// sit (Boundary), and the open ends of the network.
	FarEnd   []faults.Place
	Boundary []faults.Place
}

// Topology holds each branch's downstream end and each device's zone.
type Topology struct {
	Downstream []faults.End // per branch
	Zones      []Zone       // per device
	// beyond lists, per device, every bus forward of it whatever devices
	// lie between (for the load through it).
	beyond [][]int
	// adj lists the branches at each bus.
	adj [][]int
	// ratioKV is each bus's voltage by rated winding ratios
	// (faults.Network.RatioKV), for referring currents across
	// transformers.
	ratioKV []float64
}

// NewTopology finds the downstream end of every branch from the fault
// currents and builds every device's zone.
func NewTopology(s *Study, eng *faults.Engine) (*Topology, error) {
	n := s.Network
	t := &Topology{Downstream: make([]faults.End, n.BranchCount())}
	for b := range t.Downstream {
		d, err := eng.Downstream(b)
		if err != nil {
			return nil, err
		}
		t.Downstream[b] = d
	}
	at := map[faults.Point][]int{}
	for i, d := range s.Devices {
		at[d.Point] = append(at[d.Point], i)
	}
	adj := make([][]int, len(n.Buses))
	for b := 0; b < n.BranchCount(); b++ {
		f, to := n.BranchEnds(b)
		adj[f] = append(adj[f], b)
		adj[to] = append(adj[to], b)
	}
	t.adj = adj
	t.ratioKV = n.RatioKV()
	w := walker{n: n, t: t, at: at, adj: adj}
	t.Zones = make([]Zone, len(s.Devices))
	t.beyond = make([][]int, len(s.Devices))
	for i, d := range s.Devices {
		t.Zones[i] = w.zone(i, d)
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

// IntoBranch reports whether a device at pt looks into its branch: it
// sits at the branch's upstream end.
func (t *Topology) IntoBranch(pt faults.Point) bool { return t.Downstream[pt.Branch] != pt.End }

type walker struct {
	n   *faults.Network
	t   *Topology
	at  map[faults.Point][]int
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

// incomers returns the devices at end e of branch b that look into that
// end's bus.
func (w *walker) incomers(b int, e faults.End) []int {
	var out []int
	pt := faults.Point{Branch: b, End: e}
	for _, d := range w.at[pt] {
		if !w.t.IntoBranch(pt) {
			out = append(out, d)
		}
	}
	return out
}

func (w *walker) zone(i int, d Device) Zone {
	z := Zone{Device: i}
	seenBus := map[int]bool{}
	seenNext := map[int]bool{}
	addNext := func(devs []int, place faults.Place) {
		for _, k := range devs {
			if k != i && !seenNext[k] {
				seenNext[k] = true
				z.Next = append(z.Next, k)
			}
		}
		z.FarEnd = append(z.FarEnd, place)
		z.Boundary = append(z.Boundary, place)
	}
	var queue []int
	enterBus := func(bus int) {
		if !seenBus[bus] {
			seenBus[bus] = true
			z.Buses = append(z.Buses, bus)
			queue = append(queue, bus)
		}
	}
	// cross walks branch b from its upstream end; arriving at the far bus
	// it stops at incomers there.
	cross := func(b int) {
		z.Branches = append(z.Branches, b)
		down := w.t.Downstream[b]
		far := pointBus(w.n, faults.Point{Branch: b, End: down})
		if inc := w.incomers(b, down); len(inc) > 0 {
			addNext(inc, faults.AtBus(far))
			return
		}
		enterBus(far)
	}
	if w.t.IntoBranch(d.Point) {
		z.Start = closeIn(d.Point.Branch, d.Point.End)
		cross(d.Point.Branch)
	} else {
		z.IntoBus = true
		bus := pointBus(w.n, d.Point)
		z.Start = faults.AtBus(bus)
		enterBus(bus)
	}
	for len(queue) > 0 {
		x := queue[0]
		queue = queue[1:]
		leaf := true
		for _, b := range w.adj[x] {
			if b == d.Point.Branch {
				continue
			}
			up := otherEnd(w.t.Downstream[b])
			if pointBus(w.n, faults.Point{Branch: b, End: up}) != x {
				continue // this branch leads towards the sources
			}
			leaf = false
			if devs := w.at[faults.Point{Branch: b, End: up}]; len(devs) > 0 {
				addNext(devs, closeIn(b, up))
				continue
			}
			cross(b)
		}
		if leaf && !w.n.Buses[x].Internal {
			z.FarEnd = append(z.FarEnd, faults.AtBus(x))
		}
	}
	sort.Ints(z.Next)
	return z
}

// beyond returns every bus forward of a device, through other devices.
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
