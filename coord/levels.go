package coord

import (
	"fmt"
	"math/cmplx"

	"tripgrade/faults"
)

// Places returns every fault place of a zone: the close-in fault beyond
// the device, each bus inside, both terminals and the Settings' interior
// positions of each branch inside, and the far-end places, without
// repeats and in a fixed order. The internal star point of a three-winding
// transformer is no place for a fault and is left out.
func (t *Topology) Places(z Zone, n *faults.Network, set faults.Settings) []faults.Place {
	var ps placeSet
	add := func(p faults.Place) {
		if !Fictitious(n, p) {
			ps.add(p)
		}
	}
	add(z.Start)
	fr := set.Fractions()
	for _, b := range z.Branches {
		up := otherEnd(t.Downstream[b])
		add(closeIn(b, up))
		if !n.IsTransformer(b) {
			for _, f := range fr {
				if up == faults.To {
					f = 1 - f
				}
				add(faults.OnBranch(b, f))
			}
		}
		add(closeIn(b, t.Downstream[b]))
	}
	for _, bus := range z.Buses {
		add(faults.AtBus(bus))
	}
	for _, p := range z.FarEnd {
		add(p)
	}
	return ps.list
}

// Fictitious reports whether a fault place lies on an internal node of the
// network (a three-winding transformer's star point, at the bus or close
// in at the star end of a winding): a node of the model, not of the plant.
func Fictitious(n *faults.Network, p faults.Place) bool {
	if p.IsBus() {
		return n.Buses[p.Bus].Internal
	}
	from, to := n.BranchEnds(p.Branch)
	switch p.Frac {
	case 0:
		return n.Buses[from].Internal
	case 1:
		return n.Buses[to].Internal
	}
	return false
}

// placeSet collects fault places without repeats, in the order added.
type placeSet struct {
	seen map[faults.Place]bool
	list []faults.Place
}

func (s *placeSet) add(p faults.Place) {
	if s.seen == nil {
		s.seen = map[faults.Place]bool{}
	}
	if !s.seen[p] {
		s.seen[p] = true
		s.list = append(s.list, p)
	}
}

// FaultLevels summarises the currents every device sees over the faults of
// its own zone ahead of it (see Ahead), both cases, every fault kind. The
// ground extremes of a relay on a neutral CT are of the neutral current its
// ground stages measure, not of the residual current at its own point.
func FaultLevels(s *Study, eng *faults.Engine, t *Topology) ([]faults.PointSummary, error) {
	pts := make([]faults.Point, len(s.Devices))
	for i, d := range s.Devices {
		pts[i] = d.Point
	}
	places := func(i int) []faults.Place {
		return t.Ahead(s.Network, s.Devices[i], t.Places(t.Zones[i], s.Network, s.Faults))
	}
	ground := func(i int) faults.GroundFunc {
		npt := s.Devices[i].NeutralCT
		if npt == nil {
			return nil
		}
		return func(sol faults.Solution, _ faults.Currents) float64 {
			return cmplx.Abs(neutralCurrent(sol, sol.At(*npt), *npt))
		}
	}
	return eng.AllPointsWith(pts, places, ground)
}

// Ahead keeps the fault places that lie ahead of device d, away from the
// grid sources, where its fault levels and charts look: a device at the
// source end of its branch leaves out faults at its own bus and at the
// other branches' terminals there; one at the far end (an LV incomer)
// leaves out faults on its own branch. Those are faults the device must
// clear only from behind (its transformer fed back through a parallel
// unit, its busbar fed by a generator beyond it). A zone with nothing
// ahead keeps every place.
func (t *Topology) Ahead(n *faults.Network, d Device, places []faults.Place) []faults.Place {
	bus := DeviceBus(n, d)
	into := t.IntoBranch(d.Point)
	var out []faults.Place
	for _, p := range places {
		switch {
		case into && p.IsBus():
			if p.Bus == bus {
				continue
			}
		case into && p.Branch != d.Point.Branch:
			if f, to := n.BranchEnds(p.Branch); p.Frac == 0 && f == bus || p.Frac == 1 && to == bus {
				continue
			}
		case !into && !p.IsBus() && p.Branch == d.Point.Branch:
			continue
		}
		out = append(out, p)
	}
	if len(out) == 0 {
		return places
	}
	return out
}

// PlaceName describes a fault place for reports: a bus name, "F1-OHL 50 %"
// for a point along a line (measured from its From end), "T1, KP-11 end"
// for a fault just inside a branch at one of its terminals.
func PlaceName(n *faults.Network, p faults.Place) string {
	if p.IsBus() {
		return n.Buses[p.Bus].Name
	}
	name := n.BranchName(p.Branch)
	from, to := n.BranchEnds(p.Branch)
	switch p.Frac {
	case 0:
		return name + ", " + n.Buses[from].Name + " end"
	case 1:
		return name + ", " + n.Buses[to].Name + " end"
	}
	return fmt.Sprintf("%s %.0f %%", name, p.Frac*100)
}

// placeNames names the fault places of one study as PlaceName does, from
// names made once: the grading and damage checks name every fault they
// solve, a thousand times over on a large study.
type placeNames struct {
	n     *faults.Network
	ends  [][2]string // a branch's close-in faults, at its From and To ends
	fracs []float64   // the study's line positions
	along [][]string  // a line's faults at those positions
}

func newPlaceNames(n *faults.Network, fracs []float64) *placeNames {
	p := &placeNames{n: n, ends: make([][2]string, n.BranchCount()), fracs: fracs, along: make([][]string, len(n.Lines))}
	for b := range p.ends {
		p.ends[b] = [2]string{PlaceName(n, faults.OnBranch(b, 0)), PlaceName(n, faults.OnBranch(b, 1))}
	}
	for b := range p.along {
		for _, f := range fracs {
			p.along[b] = append(p.along[b], PlaceName(n, faults.OnBranch(b, f)))
		}
	}
	return p
}

// name is PlaceName(n, pl).
func (p *placeNames) name(pl faults.Place) string {
	switch {
	case pl.IsBus():
		return p.n.Buses[pl.Bus].Name
	case pl.Frac == 0:
		return p.ends[pl.Branch][0]
	case pl.Frac == 1:
		return p.ends[pl.Branch][1]
	case pl.Branch < len(p.along):
		for i, f := range p.fracs {
			if f == pl.Frac {
				return p.along[pl.Branch][i]
			}
		}
	}
	return PlaceName(p.n, pl)
}
