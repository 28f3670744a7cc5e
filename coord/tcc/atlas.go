package tcc

import (
	"fmt"
	"slices"
	"strings"
	"sync"

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

// Atlas is the set of charts of one study: for every coordination path a
// phase-fault chart (split at a transformer when one axis would stretch
// too far) and an earth-fault chart for each part of the path that
// zero-sequence current can reach, and a chart for every failing pair,
// with a look for every device that is the same in all of them where the
// palette allows.
type Atlas struct {
	in      Input
	paths   []Path
	failing []coord.Pair
	specs   []chartSpec
	slots   []int // look per device (see assignStyles)
	timers  []*coord.Timer
	mu      sync.Mutex // guards routes, which charts fill as they are drawn
	routes  map[routeKey][]int
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
	if len(in.Topology.Zones) != n {
		return nil, fmt.Errorf("tcc: a topology of %d devices for a study of %d", len(in.Topology.Zones), n)
	}
	for _, p := range in.Result.Pairs {
		if p.Upstream < 0 || p.Upstream >= n || p.Downstream < 0 || p.Downstream >= n {
			return nil, fmt.Errorf("tcc: pair %d→%d names a device outside the study's %d", p.Upstream, p.Downstream, n)
		}
	}
	a := &Atlas{in: in, routes: map[routeKey][]int{}}
	for i := range in.Study.Devices {
		a.timers = append(a.timers, coord.NewTimer(&in.Study.Devices[i]))
	}
	a.paths = findPaths(in.Result.Pairs, n, MaxPaths, func(p coord.Pair) bool {
		return in.Topology.Above(in.Study.Network, in.Study.Devices[p.Upstream], in.Study.Devices[p.Downstream])
	})
	a.failing = failingPairs(in.Result, in.Study)
	a.specs = a.chartSpecs()
	groups := make([][]int, len(a.specs))
	for k, sp := range a.specs {
		groups[k] = sp.members(a)
	}
	a.slots = assignStyles(n, groups)
	return a, nil
}

// Paths returns the study's coordination paths.
func (a *Atlas) Paths() []Path { return a.paths }

// FailingPairs returns the pairs whose grading fails.
func (a *Atlas) FailingPairs() []coord.Pair { return a.failing }

// Charts returns every chart of the study: for each coordination path its
// phase-fault charts and its earth-fault charts, then one for every
// failing pair, named with unique, sanitised stems (see Sanitise and
// Namer): "path-D--...--U" for a phase-fault chart, the same with
// "-earth" for an earth-fault chart, "pair-D-under-U" for a failing pair.
// A chart two paths share is drawn once.
func (a *Atlas) Charts() []*Chart {
	var nm Namer
	out := make([]*Chart, len(a.specs))
	for k, sp := range a.specs {
		c := newChart(a, sp)
		c.Name = nm.Unique(c.Name)
		out[k] = c
	}
	for k, c := range out {
		c.elsewhere = a.elsewhere(k, out)
	}
	return out
}

// PathCharts returns the charts of the coordination paths that draw device
// i (phase-fault and earth-fault charts), named as Charts names them.
func (a *Atlas) PathCharts(i int) []*Chart {
	var out []*Chart
	for _, c := range a.Charts() {
		if c.pair == nil && slices.Contains(c.Devices, i) {
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

// bus returns the bus where device i sits.
func (a *Atlas) bus(i int) int {
	return coord.DeviceBus(a.in.Study.Network, a.in.Study.Devices[i])
}

// busFor returns the bus whose voltage device i's currents of quantity q
// are at: its own bus, but for the ground stages of a relay on a
// transformer's neutral CT the star-side bus of that transformer, whose
// earth faults drive the neutral current they measure.
func (a *Atlas) busFor(i int, q coord.Quantity) int {
	d := &a.in.Study.Devices[i]
	if q == coord.Residual && d.NeutralCT != nil {
		return endBus(a.in.Study.Network, d.NeutralCT.Branch, d.NeutralCT.End)
	}
	return a.bus(i)
}

// kvOf returns the nominal voltage of device i's currents of quantity q
// (busFor).
func (a *Atlas) kvOf(i int, q coord.Quantity) float64 {
	return a.in.Study.Network.Buses[a.busFor(i, q)].KV
}

// hasPhase reports whether device i answers to phase current: a fuse, or
// a relay with a phase stage.
func (a *Atlas) hasPhase(i int) bool {
	d := &a.in.Study.Devices[i]
	return d.Kind == coord.Fuse || d.Pickup(coord.Phase) > 0
}

// hasGround reports whether device i is a relay with a ground (residual)
// stage.
func (a *Atlas) hasGround(i int) bool {
	d := &a.in.Study.Devices[i]
	return d.Kind == coord.Relay && d.Pickup(coord.Residual) > 0
}

// seesResidual reports whether device i has a ground stage and residual
// current reaches it from some fault of its zone.
func (a *Atlas) seesResidual(i int) bool {
	x := a.in.Levels[i].ResidualMax
	return a.hasGround(i) && x.Found && x.A > 0
}

// elsewhere lists, for chart k, the pairs of two of its devices whose
// margins are drawn on another chart (at the other kind of fault), with
// that chart's name.
func (a *Atlas) elsewhere(k int, charts []*Chart) []string {
	c := charts[k]
	if c.pair != nil {
		return nil
	}
	s := a.in.Study
	var out []string
	seen := map[coord.Pair]bool{}
	for _, o := range charts {
		if o == c || o.pair != nil {
			continue
		}
		for _, p := range o.Pairs {
			if seen[p] || slices.Contains(c.Pairs, p) ||
				!slices.Contains(c.Devices, p.Downstream) || !slices.Contains(c.Devices, p.Upstream) {
				continue
			}
			seen[p] = true
			out = append(out, fmt.Sprintf("%s over %s: worst margin at %s faults, drawn on %s",
				s.Devices[p.Upstream].Name, s.Devices[p.Downstream].Name, kindWord(o.Kind), o.Name))
		}
	}
	return out
}

// kindWord names a chart's kind in a sentence.
func kindWord(q coord.Quantity) string {
	if q == coord.Residual {
		return "earth"
	}
	return "phase"
}

// chartTitle names a chart's kind in its title.
func chartTitle(q coord.Quantity) string {
	if q == coord.Residual {
		return "earth-fault curves (residual current 3I0)"
	}
	return "phase-fault curves"
}

// join writes device names from downstream to source.
func join(names []string) string { return strings.Join(names, " → ") }
