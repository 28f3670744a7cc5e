package coord_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/propose"
	"tripgrade/curves"
	"tripgrade/faults"
	"tripgrade/faults/randnet"
)

// FuzzCheck runs every check on random meshed networks (package randnet,
// element values over the whole range a study file accepts) with random
// relays and fuses at random branch ends. In extreme runs their settings
// go far beyond what a study file accepts (a TMS of 1e308, a pickup of
// 1e-300 A), as a program building a Study in code may give them, so that
// figures overflow. Whatever the figures, the checker never panics, and no
// finding whose figures are not all finite numbers is a PASS or a FAIL: it
// is WARN "not checked".
func FuzzCheck(f *testing.F) {
	for seed := range uint64(6) {
		f.Add(seed, uint8(3+seed), seed%3 == 0, seed*7)
	}
	f.Fuzz(func(t *testing.T, seed uint64, size uint8, extreme bool, devSeed uint64) {
		s, eng, topo, ok := fuzzStudy(seed, 2+int(size)%10, devSeed, extreme)
		if !ok {
			return // the engine refuses the network: FuzzEngine's concern
		}
		r, err := coord.Check(s, eng, topo)
		if err != nil {
			t.Fatalf("check: %v", err)
		}
		for _, x := range r.Findings {
			if bad := nonFiniteFigure(x); bad != "" && x.Verdict != coord.Warn {
				t.Errorf("%v %s %s: %v with %s (note %q)", x.Check, x.Device, x.Stage, x.Verdict, bad, x.Note)
			}
		}
	})
}

// fuzzStudy builds a random meshed network of the given size (package
// randnet) with random devices (addDevices) and prepares it; ok is false
// when the engine refuses the network.
func fuzzStudy(seed uint64, buses int, devSeed uint64, extreme bool) (s *coord.Study, eng *faults.Engine, topo *coord.Topology, ok bool) {
	n, set := randnet.Network(randnet.Options{Buses: buses, Seed: seed, Extreme: extreme})
	s = &coord.Study{Name: "fuzz", Network: n, Faults: set, Criteria: coord.DefaultCriteria(),
		Equipment: make([]*coord.Equipment, n.BranchCount())}
	addDevices(s, rand.New(rand.NewPCG(devSeed, 0xc0de)), extreme)
	eng, topo, err := coord.Prepare(s)
	return s, eng, topo, err == nil
}

// nonFiniteFigure names a figure of x that is not a finite number.
func nonFiniteFigure(x coord.Finding) string {
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	if x.Valid && (bad(x.Measured) || bad(x.Required) || bad(x.Margin)) {
		return fmt.Sprintf("measured %v, required %v, margin %v", x.Measured, x.Required, x.Margin)
	}
	if ft := x.Fault; ft != nil && (bad(ft.DeviceA) || bad(ft.OtherA)) {
		return fmt.Sprintf("currents %v, %v", ft.DeviceA, ft.OtherA)
	}
	if ft := x.Fault; ft != nil && x.Check.Timed() && (bad(ft.DeviceS) || bad(ft.OtherS)) {
		return fmt.Sprintf("times %v, %v", ft.DeviceS, ft.OtherS)
	}
	return ""
}

// addDevices puts relays (and a fuse now and then) at random branch ends,
// with loads at random buses.
func addDevices(s *coord.Study, r *rand.Rand, extreme bool) {
	n := s.Network
	span := func(typical, lo, hi float64) float64 {
		if !extreme {
			return typical * (0.5 + r.Float64())
		}
		switch x := r.Float64(); {
		case x < 0.15:
			return lo
		case x < 0.3:
			return hi
		}
		return math.Min(hi, math.Exp(math.Log(lo)+(math.Log(hi)-math.Log(lo))*r.Float64()))
	}
	used := map[faults.Point]bool{}
	for k := range 1 + r.IntN(2*n.BranchCount()) {
		pt := faults.Point{Branch: r.IntN(n.BranchCount()), End: faults.End(r.IntN(2))}
		if used[pt] {
			continue
		}
		used[pt] = true
		d := coord.Device{Name: fmt.Sprintf("D%d", k), Kind: coord.Relay, Point: pt,
			CT: coord.CT{PrimaryA: span(400, 1, math.MaxFloat64), SecondaryA: 1, ThermalFactor: 1}, BreakerS: 0.06}
		if r.Float64() < 0.15 {
			d.Kind = coord.Fuse
			d.RatingA = span(100, 1e-300, math.MaxFloat64)
			var err1, err2 error
			d.Melt, err1 = curves.NewTable("melt", []curves.Point{{CurrentA: 2 * d.RatingA, TimeS: 100}, {CurrentA: 20 * d.RatingA, TimeS: 0.02}})
			d.Clear, err2 = curves.NewTable("clear", []curves.Point{{CurrentA: 2 * d.RatingA, TimeS: 130}, {CurrentA: 20 * d.RatingA, TimeS: 0.04}})
			if err1 == nil && err2 == nil { // a rating near the largest number has no table
				s.Devices = append(s.Devices, d)
			}
			continue
		}
		for j := range 1 + r.IntN(3) {
			q := coord.Quantity(r.IntN(2))
			pickup := span(300, 1e-300, math.MaxFloat64)
			st := coord.Stage{Label: fmt.Sprintf("S%d", j), Measures: q, PickupA: pickup}
			set := curves.StageSettings{PickupA: pickup}
			switch r.IntN(3) {
			case 0:
				st.Shape, st.Multiplier = curves.ShapeIECSI, span(0.1, 1e-300, math.MaxFloat64)
				set.Shape, set.Multiplier = st.Shape, st.Multiplier
			case 1:
				st.Shape, st.DelayS = curves.ShapeDefinite, span(0.3, 1e-300, math.MaxFloat64)
				set.Shape, set.DelayS = st.Shape, st.DelayS
			default:
				st.Shape = curves.ShapeInstantaneous
				set.Shape = st.Shape
			}
			c, err := curves.NewStage(set)
			if err != nil {
				panic(fmt.Sprintf("%+v: %v", set, err)) // the settings above are all valid
			}
			st.Curve = c
			d.Stages = append(d.Stages, st)
		}
		s.Devices = append(s.Devices, d)
	}
	for range r.IntN(3) {
		s.Loads = append(s.Loads, coord.Load{Bus: r.IntN(len(n.Buses)), CurrentA: span(50, 1e-300, math.MaxFloat64)})
	}
}

// FuzzPropose runs the multiplier search (coord/propose), with the
// checker's margins handed to it, on random meshed networks with random
// relays and fuses of typical figures: it never panics, and every
// multiplier it proposes lies on a step of its range, within the range.
func FuzzPropose(f *testing.F) {
	for seed := range uint64(4) {
		f.Add(seed, uint8(4+seed), seed*5)
	}
	f.Fuzz(func(t *testing.T, seed uint64, size uint8, devSeed uint64) {
		s, eng, topo, ok := fuzzStudy(seed, 2+int(size)%8, devSeed, false)
		if !ok {
			return // the engine refuses the network: FuzzEngine's concern
		}
		pr, err := propose.Propose(s, eng, topo, propose.Settings{MaxRounds: 2})
		if err != nil {
			return // nothing to search, or the search did not settle: said to the user
		}
		for i, v := range pr.Vars {
			x, r := pr.X[i], v.Range
			k := (x - r.Min) / r.Step
			if x < r.Min || x > r.Max+1e-12 || math.Abs(k-math.Round(k)) > 1e-6 {
				t.Errorf("%s stage %d: proposed multiplier %v, range %v:%v:%v", s.Devices[v.Device].Name, v.Stage, x, r.Min, r.Max, r.Step)
			}
		}
	})
}
