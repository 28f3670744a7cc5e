package coord_test

import (
	"math"
	"strings"
	"sync"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/curves"
)

// TestMarginRuleMatchesChecks holds the margins hook (Options.Margins) to
// the checks that hand the margins out: for every margin of the Fenwick
// Quay example (relays over relays and over a fuse) and of Kestrel Park
// (directional stages, neutral CTs, opening sequences), the linear rule
// Alpha·tUp − Beta·tDown − Gamma gives the checker's own margin minus the
// margin it required, and, at a single fault, the fastest of each
// relay's stages, each timed at StageCurrentA, gives the checker's time.
func TestMarginRuleMatchesChecks(t *testing.T) {
	for _, path := range []string{"../examples/fenwick-quay.toml", "../examples/kestrel-park.toml"} {
		s, err := study.Load(path)
		if err != nil {
			t.Fatal(err)
		}
		eng, topo, err := coord.Prepare(s)
		if err != nil {
			t.Fatal(err)
		}
		timers := make([]*coord.Timer, len(s.Devices))
		for i := range s.Devices {
			timers[i] = coord.NewTimer(&s.Devices[i])
		}
		var mu sync.Mutex
		seen := map[coord.CheckKind]int{}
		var bad []string
		hook := func(ms *coord.MarginSample) {
			mu.Lock()
			defer mu.Unlock()
			seen[ms.Check]++
			if ms.Up < 0 {
				// A clearing or damage bound: tDown + breaker ≤ the maximum
				// clearing time or the withstand time, −tDown ≥ breaker −
				// that time.
				if d := -ms.Beta*ms.DownS0 - ms.Gamma - (ms.RequiredS - ms.MarginS); math.Abs(d) > 1e-9 && len(bad) < 5 {
					bad = append(bad, ms.Check.String()+" rule")
				}
				if ms.Check == coord.Damage && ms.Equipment == "" && len(bad) < 5 {
					bad = append(bad, "damage bound without its equipment")
				}
			} else if d := ms.Alpha*ms.UpS0 - ms.Beta*ms.DownS0 - ms.Gamma - (ms.MarginS - ms.RequiredS); math.Abs(d) > 1e-9 {
				if len(bad) < 5 {
					bad = append(bad, ms.Check.String()+" rule: "+s.Devices[ms.Up].Name+" over "+s.Devices[ms.Down].Name)
				}
			}
			if ms.Sequence || ms.UpBand != coord.Nominal {
				return
			}
			type side struct {
				dev int
				at  coord.Operating
				t   float64
			}
			sides := []side{{ms.Down, ms.DownAt, ms.DownS0}}
			if ms.Up >= 0 {
				sides = append(sides, side{ms.Up, ms.UpAt, ms.UpS0})
			}
			for _, side := range sides {
				d := &s.Devices[side.dev]
				if d.Kind != coord.Relay {
					continue
				}
				best := math.Inf(1)
				for i, st := range d.Stages {
					if x, status := st.Curve.Time(timers[side.dev].StageCurrentA(i, side.at)); status == curves.Operates && x < best {
						best = x
					}
				}
				if math.Abs(best-side.t) > 1e-9*math.Max(1, side.t) && len(bad) < 5 {
					bad = append(bad, ms.Check.String()+" stage times of "+d.Name)
				}
			}
		}
		if _, err := coord.CheckWith(s, eng, topo, coord.Options{Margins: hook}); err != nil {
			t.Fatal(err)
		}
		for _, b := range bad {
			t.Errorf("%s: %s disagrees with the checker", path, b)
		}
		kinds := []coord.CheckKind{coord.Grading, coord.Discrimination, coord.Clearing}
		if strings.Contains(path, "kestrel") {
			kinds = append(kinds, coord.Damage) // its transformers declare withstand
		}
		for _, k := range kinds {
			if seen[k] == 0 {
				t.Errorf("%s: no %s margin handed out", path, k)
			}
		}
		t.Logf("%s: %v", path, seen)
	}
}
