package coord

import (
	"fmt"

	"tripgrade/faults"
)

// groupKinds are the fault kinds a stage group exists for: phase stages
// (and a fuse) the faults between phases, ground stages the line-to-earth
// fault, which in the minimum case carries the study's fault resistance.
// A double-line-to-earth fault drives phase currents like a fault between
// phases and is left to the phase stages; the coverage finding asks that
// some stage detect every kind.
func groupKinds(q Quantity) []faults.Kind {
	if q == Phase {
		return []faults.Kind{faults.LL, faults.LLL}
	}
	return []faults.Kind{faults.LG}
}

// minimum is the smallest current a device sees over a set of faults.
type minimum struct {
	a     float64
	found bool
	place faults.Place
	kind  faults.Kind
	// behindDelta: the smallest is an earth fault that drives no residual
	// current through the device, judged on its phase current.
	behindDelta bool
	// declared counts earth faults behind a delta winding that the device
	// leaves to the protection named by its EarthFaultsBy.
	declared int
}

// minFault finds the smallest current that device dev measures as q over
// the given places, for the kinds q exists for, in the minimum case.
// Faults that drive no current of that quantity through the device are
// left out. A phase group is also judged on the line-to-earth faults that
// drive no residual current through the device (behind a delta winding:
// across a Dyn or YNd unit only phase stages and fuses can see them),
// unless the device declares them cleared by other protection.
func (c *checker) minFault(dev int, q Quantity, places []faults.Place) (minimum, error) {
	var m minimum
	d := &c.s.Devices[dev]
	kinds := groupKinds(q)
	if q == Phase {
		kinds = append(kinds, faults.LG)
	}
	for _, pl := range places {
		for _, k := range kinds {
			sol, err := c.sol.solve(pl, k, faults.Min)
			if err != nil {
				return m, err
			}
			if !sol.Energised() {
				continue
			}
			ph, res := c.effective(dev, sol)
			a := ph
			if q == Residual {
				a = res
			}
			behind := q == Phase && k == faults.LG
			if behind && res > 0 {
				continue // the ground stages' fault, not the phase stages'
			}
			if a <= 0 {
				continue
			}
			if behind && d.EarthFaultsBy != "" {
				m.declared++
				continue
			}
			if !m.found || a < m.a*(1-tieTolerance) {
				m = minimum{a: a, found: true, place: pl, kind: k, behindDelta: behind, declared: m.declared}
			}
		}
	}
	return m, nil
}

// tieTolerance is the relative difference below which two figures count
// as equal, so the first fault in report order keeps its place whatever
// the rounding of the solves (theory makes some faults give equal
// currents, e.g. LL and LLL seen across a delta–star transformer).
const tieTolerance = 1e-9

// primarySensitivity: the smallest fault at the far end of the device's own
// zone, in the minimum case, is at least sensitivity_primary × the lowest
// pickup of each stage group; then whether some stage detects every fault
// kind of the zone (coverage.go).
func (c *checker) primarySensitivity(i int) ([]Finding, error) {
	d := &c.s.Devices[i]
	var out []Finding
	for _, q := range []Quantity{Phase, Residual} {
		pickup := d.Pickup(q)
		if pickup == 0 {
			continue
		}
		m, err := c.minFault(i, q, c.topo.Zones[i].FarEnd)
		if err != nil {
			return nil, err
		}
		beyondDelta := false
		if !m.found && q == Residual {
			// The far end lies beyond a delta winding: judge the stage on
			// the earth faults of its zone that it can see at all.
			if m, err = c.minFault(i, q, c.places[i]); err != nil {
				return nil, err
			}
			beyondDelta = m.found
		}
		f, err := c.sensitivityFinding(PrimarySensitivity, m, c.s.Criteria.SensitivityPrimary, pickup, q, i, -1)
		if err != nil {
			return nil, err
		}
		f.Device, f.Stage = d.Name, q.String()
		if beyondDelta {
			f.Note += "; the zone's far end drives no residual current through the device (it lies beyond a delta winding, or is fed with earth-fault current only from elsewhere), so the smallest earth fault of the zone that does is used"
		}
		out = append(out, f)
	}
	cov, err := c.coverage(i)
	if err != nil {
		return nil, err
	}
	if cov != nil {
		out = append(out, *cov)
	}
	return out, nil
}

// backupSensitivity: the smallest fault at the far end of the downstream
// device's zone is at least sensitivity_backup × the upstream pickup. A
// stage group that no fault there reaches at all (an upstream ground stage
// behind a delta winding) is not applicable and gives no finding; the
// upstream phase stages then answer for those earth faults.
func (c *checker) backupSensitivity(p Pair) ([]Finding, error) {
	u := &c.s.Devices[p.Upstream]
	var out []Finding
	for _, q := range []Quantity{Phase, Residual} {
		pickup := u.Pickup(q)
		if pickup == 0 {
			continue
		}
		m, err := c.minFault(p.Upstream, q, c.topo.Zones[p.Downstream].FarEnd)
		if err != nil {
			return nil, err
		}
		if !m.found && q == Residual {
			continue
		}
		if !m.found {
			// No current reaches the upstream device in the minimum case,
			// though it backs the other up in the maximum case: its side is
			// fed only by what the minimum case leaves out (a generator not
			// always running). There is then nothing for it to detect.
			if mx, err := c.maxFault(p.Upstream, q, c.topo.Zones[p.Downstream].FarEnd); err != nil {
				return nil, err
			} else if mx.found {
				continue
			}
		}
		f, err := c.sensitivityFinding(BackupSensitivity, m, c.s.Criteria.SensitivityBackup, pickup, q, p.Upstream, p.Downstream)
		if err != nil {
			return nil, err
		}
		f.Device, f.Other, f.Stage = c.s.Devices[p.Downstream].Name, u.Name, q.String()
		out = append(out, f)
	}
	return out, nil
}

// sensitivityFinding judges the smallest current m that device dev sees
// as q against factor × pickup. For a backup check down is the downstream
// device: the figure is then the upstream device's current (OtherA) and
// DeviceA is what the downstream device sees of the same fault.
func (c *checker) sensitivityFinding(ck CheckKind, m minimum, factor, pickup float64, q Quantity, dev, down int) (Finding, error) {
	d := &c.s.Devices[dev]
	if !m.found {
		note := fmt.Sprintf("no %s fault current reaches the device in the minimum case", q)
		switch {
		case m.declared > 0:
			note += fmt.Sprintf(" but the earth faults beyond a delta winding, which it leaves to \"%s\" (declared by the study)", d.EarthFaultsBy)
		case ck == PrimarySensitivity:
			note += " at the far end of its zone (fed only from elsewhere, as for a ring relay facing its source, or only by generators the minimum case leaves out); whether the faults it must clear are cleared, with the openings that send current to it, is the fault-clearing check's finding"
		}
		return unchecked(ck, note), nil
	}
	f := atLeast(ck, m.a, factor*pickup, "A")
	ref := FaultRef{Kind: m.kind, Case: faults.Min, Place: PlaceName(c.s.Network, m.place)}
	if down < 0 {
		ref.DeviceA, ref.DeviceQty = m.a, q
	} else {
		ref.OtherA, ref.OtherQty = m.a, q
		sol, err := c.sol.solve(m.place, m.kind, faults.Min)
		if err != nil {
			return f, err
		}
		ph, res, _ := c.measure(down, sol)
		ref.DeviceA, ref.DeviceQty = ph, Phase
		if q == Residual {
			ref.DeviceA, ref.DeviceQty = res, Residual
		}
	}
	f.Fault = &ref
	what := "pickup"
	if d.Kind == Fuse {
		what = "lowest melting current"
	}
	f.Note = fmt.Sprintf("%s %s A × %g", what, fmtA(pickup), factor)
	if m.behindDelta {
		f.Note += "; an earth fault beyond a delta winding drives no residual current through the device, so only its phase current can detect it"
	}
	if m.declared > 0 {
		f.Note += fmt.Sprintf("; earth faults beyond a delta winding are declared cleared by \"%s\" (see the every-kind finding)", d.EarthFaultsBy)
	}
	return f, nil
}

// fmtA formats a current in a note.
func fmtA(a float64) string {
	if a >= 100 {
		return fmt.Sprintf("%.0f", a)
	}
	return fmt.Sprintf("%.3g", a)
}
