package tcc

import (
	"fmt"
	"strings"

	"tripgrade/coord"
	"tripgrade/faults"
)

// Input is what the charts of a study are drawn from: the study, its
// topology, the result of coord.Check and the fault levels of
// coord.FaultLevels (one summary per device, in study order). The package
// reads them and computes no margin of its own.
type Input struct {
	Study    *coord.Study
	Topology *coord.Topology
	Result   *coord.Result
	Levels   []faults.PointSummary
}

// Atlas is the set of charts of one study: one per coordination path and
// one per failing pair, with a colour for every device that is the same
// in all of them.
type Atlas struct {
	in      Input
	paths   []Path
	failing []coord.Pair
	slots   []int // palette slot per device
	timers  []*coord.Timer
}

// NewAtlas prepares the charts of a study. It reports inputs that do not
// belong together (fault levels or pairs for devices the study lacks).
func NewAtlas(in Input) (*Atlas, error) {
	if in.Study == nil || in.Topology == nil || in.Result == nil {
		return nil, fmt.Errorf("tcc: the study, its topology and its check result are all needed")
	}
	n := len(in.Study.Devices)
	if len(in.Levels) != n {
		return nil, fmt.Errorf("tcc: %d fault-level summaries for %d devices", len(in.Levels), n)
	}
	for _, p := range in.Result.Pairs {
		if p.Upstream < 0 || p.Upstream >= n || p.Downstream < 0 || p.Downstream >= n {
			return nil, fmt.Errorf("tcc: pair %d→%d names a device outside the study's %d", p.Upstream, p.Downstream, n)
		}
	}
	a := &Atlas{in: in}
	a.paths = findPaths(in.Result.Pairs, n, MaxPaths)
	a.failing = failingPairs(in.Result, in.Study)
	groups := make([][]int, 0, len(a.paths)+len(a.failing))
	for _, p := range a.paths {
		groups = append(groups, p)
	}
	for _, p := range a.failing {
		groups = append(groups, []int{p.Downstream, p.Upstream})
	}
	a.slots = assignColours(n, groups)
	for i := range in.Study.Devices {
		a.timers = append(a.timers, coord.NewTimer(&in.Study.Devices[i]))
	}
	return a, nil
}

// Paths returns the study's coordination paths.
func (a *Atlas) Paths() []Path { return a.paths }

// FailingPairs returns the pairs whose grading fails.
func (a *Atlas) FailingPairs() []coord.Pair { return a.failing }

// Charts returns a chart for every coordination path, then one for every
// failing pair, named with unique, sanitised stems: "path-D--...--U" and
// "pair-D-under-U" (see Sanitise and Namer).
func (a *Atlas) Charts() []*Chart {
	var nm Namer
	var out []*Chart
	for _, p := range a.paths {
		c := a.pathChart(p)
		c.Name = nm.Unique(c.Name)
		out = append(out, c)
	}
	for _, p := range a.failing {
		c := a.pairChart(p)
		c.Name = nm.Unique(c.Name)
		out = append(out, c)
	}
	return out
}

// PathCharts returns the charts of the paths through device i (a device on
// no path gets a chart of its own), named as Charts names them.
func (a *Atlas) PathCharts(i int) []*Chart {
	var out []*Chart
	for _, c := range a.Charts() {
		if c.pair == nil && Path(c.Devices).Contains(i) {
			out = append(out, c)
		}
	}
	return out
}

// Device returns the index of the device named name, or −1.
func (a *Atlas) Device(name string) int {
	for i, d := range a.in.Study.Devices {
		if d.Name == name {
			return i
		}
	}
	return -1
}

func (a *Atlas) names(devs []int) []string {
	out := make([]string, len(devs))
	for k, i := range devs {
		out[k] = a.in.Study.Devices[i].Name
	}
	return out
}

// pathChart builds the chart of one path with the pairs along it.
func (a *Atlas) pathChart(p Path) *Chart {
	var pairs []coord.Pair
	for k := 0; k+1 < len(p); k++ {
		for _, q := range a.in.Result.Pairs {
			if q.Downstream == p[k] && q.Upstream == p[k+1] {
				pairs = append(pairs, q)
				break
			}
		}
	}
	names := a.names(p)
	c := newChart(a, p, pairs)
	c.Name = pathStem(names)
	c.Subtitle = "path " + strings.Join(names, " → ") + "  (downstream to source)"
	return c
}

// pairChart builds the chart of one pair alone.
func (a *Atlas) pairChart(p coord.Pair) *Chart {
	d, u := a.in.Study.Devices[p.Downstream].Name, a.in.Study.Devices[p.Upstream].Name
	c := newChart(a, []int{p.Downstream, p.Upstream}, []coord.Pair{p})
	c.Name = pairStem(d, u)
	c.Subtitle = "pair " + u + " over " + d + "  (failing grading margin)"
	pp := p
	c.pair = &pp
	return c
}

// kvOf returns the nominal voltage of the bus where device i sits.
func (a *Atlas) kvOf(i int) float64 {
	n := a.in.Study.Network
	return n.Buses[coord.DeviceBus(n, a.in.Study.Devices[i])].KV
}
