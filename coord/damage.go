package coord

import (
	"fmt"

	"tripgrade/curves"
	"tripgrade/faults"
)

// owners returns, per branch, the first device (in study order) whose
// zone contains it, or −1.
func (c *checker) owners() []int {
	own := make([]int, c.s.Network.BranchCount())
	for b := range own {
		own[b] = -1
	}
	for i, z := range c.topo.Zones {
		for _, b := range z.Branches {
			if own[b] < 0 {
				own[b] = i
			}
		}
	}
	return own
}

// damage: for every transformer and cable with withstand data, the device
// whose zone holds it clears every through-fault (transformer: faults at
// its low-voltage terminals; cable: every fault of the zone that flows
// through it) before the withstand time, over the solved faults and a
// sweep between them.
func (c *checker) damage() ([]Finding, error) {
	n := c.s.Network
	var out []Finding
	own := c.owners()
	for b, eq := range c.s.Equipment {
		if eq == nil || (eq.Damage[0] == nil && eq.Cable == nil) {
			continue
		}
		name := n.BranchName(b)
		dev := own[b]
		if dev < 0 {
			f := unchecked(Damage, "no device's zone holds it: it is unprotected in this study")
			f.Device, f.Other = "-", name
			out = append(out, f)
			continue
		}
		down := c.topo.Downstream[b]
		var withstand curves.Characteristic
		var places []faults.Place
		var at faults.Point
		if eq.Damage[0] != nil {
			side := 0
			if down == faults.To {
				side = 1
			}
			withstand = eq.Damage[side]
			places = []faults.Place{faults.AtBus(pointBus(n, faults.Point{Branch: b, End: down}))}
			at = faults.Point{Branch: b, End: down}
		} else {
			withstand = eq.Cable
			places = c.places[dev]
			at = faults.Point{Branch: b, End: otherEnd(down)}
		}
		f, err := c.damageOf(dev, name, withstand, places, at)
		if err != nil {
			return nil, err
		}
		out = append(out, f)
	}
	// Three-winding transformers have no through-fault withstand curve
	// here: say so rather than let their absence read as checked.
	for i := range n.Transformers3 {
		f := unchecked(Damage, "no through-fault withstand curve for a three-winding transformer: check its windings by hand")
		f.Device, f.Other = "-", n.Transformers3[i].Name
		if dev := own[n.StarBranch(i, faults.HV)]; dev >= 0 {
			f.Device = c.s.Devices[dev].Name
		}
		out = append(out, f)
	}
	return out, nil
}

func (c *checker) damageOf(dev int, equip string, withstand curves.Characteristic, places []faults.Place, at faults.Point) (Finding, error) {
	t := c.timers[dev]
	d := &c.s.Devices[dev]
	var pts []sample
	for _, cs := range faults.Cases {
		for _, k := range faults.Kinds {
			var group []sample
			for _, pl := range places {
				sol, err := c.sol.solve(pl, k, cs)
				if err != nil {
					return Finding{}, err
				}
				if !sol.Energised() {
					continue
				}
				eqA := sol.At(at).PhaseMaxA()
				if eqA <= 0 {
					continue
				}
				dp, dr := Measured(sol.At(d.Point))
				// The equipment current rides in the "upstream" slot so that
				// sweep scales it with the device's currents.
				group = append(group, sample{dp: dp, dr: dr, up: eqA, kind: k, cs: cs, place: PlaceName(c.s.Network, pl)})
			}
			pts = append(pts, group...)
			pts = append(pts, sweep(group)...)
		}
	}
	var worst *sample
	var worstT, worstW, worstMargin float64
	noTrip, undefined := 0, 0
	capped := false
	for i := range pts {
		s := pts[i]
		tw, stw := withstand.Time(s.up)
		if stw != curves.Operates {
			lim, ok := withstand.(curves.I2tLimit)
			if !ok || lim.MaxTimeS == 0 || lim.I2tA2S/(s.up*s.up) <= lim.MaxTimeS {
				continue // outside the withstand curve's range (below 2× a transformer's rating)
			}
			// Beyond the adiabatic limit's validity (IEC 60364-4-43: 5 s)
			// the cable withstands at least as long as the limit says; ask
			// for clearing within the validity time, which is safe.
			tw, capped = lim.MaxTimeS, true
		}
		tc, stc := t.Clearing(s.dp, s.dr, Nominal)
		switch stc {
		case curves.NoTrip:
			noTrip++
			continue
		case curves.Undefined:
			undefined++
			continue
		}
		if m := tw - tc; worst == nil || m < worstMargin-tieTolerance {
			worst, worstT, worstW, worstMargin = &pts[i], tc, tw, m
		}
	}
	if worst == nil {
		why := "the device does not operate for any through-fault where the withstand curve is defined"
		if undefined > 0 && noTrip == 0 {
			why = "the device's curve is not defined at the through-fault currents (outside a table's points)"
		}
		f := unchecked(Damage, why)
		f.Device, f.Other = d.Name, equip
		return f, nil
	}
	f := atMost(Damage, worstT, worstW, "s")
	f.Device, f.Other = d.Name, equip
	ref := FaultRef{Kind: worst.kind, Case: worst.cs, Place: worst.place, Interpolated: worst.interpolated,
		OtherA: worst.up, DeviceS: worstT, OtherS: worstW}
	ref.DeviceA, ref.DeviceQty = governing(t, worst.dp, worst.dr)
	f.Fault = &ref
	f.Note = "clearing time against the withstand time at the equipment's current"
	if noTrip > 0 {
		f.Note += fmt.Sprintf("; the device does not operate at %d through-fault points where the withstand curve is defined", noTrip)
		if f.Verdict == Pass {
			f.Verdict = Warn
		}
	}
	if undefined > 0 {
		f.Note += fmt.Sprintf("; %d points outside the device's curve were left out", undefined)
	}
	if capped {
		f.Note += "; where the adiabatic withstand exceeds its 5 s validity, clearing within 5 s is asked"
	}
	return f, nil
}
