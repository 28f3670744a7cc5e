package coord

import (
	"fmt"

	"tripgrade/faults"
)

// quantityKinds are the fault kinds a stage group must detect: phase stages
// the phase-to-phase faults, ground stages the earth faults.
func quantityKinds(q Quantity) []faults.Kind {
	if q == Phase {
		return []faults.Kind{faults.LL, faults.LLL}
	}
	return []faults.Kind{faults.LG, faults.LLG}
}

// minimum is the smallest current a device sees over a set of faults.
type minimum struct {
	a     float64
	found bool
	ref   FaultRef
}

// minFault finds the smallest current that device dev measures as q over
// the given places, for the kinds q must detect, in the minimum case.
// Faults that drive no current of that quantity through the device (an
// earth fault beyond a delta winding) are left out.
func (c *checker) minFault(dev int, q Quantity, places []faults.Place) (minimum, error) {
	var m minimum
	for _, pl := range places {
		for _, k := range quantityKinds(q) {
			sol, err := c.sol.solve(pl, k, faults.Min)
			if err != nil {
				return m, err
			}
			if !sol.Energised() {
				continue
			}
			ph, res := Measured(sol.At(c.s.Devices[dev].Point))
			a := ph
			if q == Residual {
				a = res
			}
			if a <= 0 {
				continue
			}
			if !m.found || a < m.a*(1-tieTolerance) {
				m = minimum{a: a, found: true, ref: FaultRef{Kind: k, Case: faults.Min, Place: PlaceName(c.s.Network, pl), DeviceA: a, DeviceQty: q}}
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
// pickup of each stage group.
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
		f := c.sensitivityFinding(PrimarySensitivity, m, c.s.Criteria.SensitivityPrimary, pickup, q, d.Kind)
		f.Device, f.Stage = d.Name, q.String()
		if beyondDelta {
			f.Note += "; the zone's far end drives no residual current through the device (beyond a delta winding), so the smallest earth fault of the zone that does is used"
		}
		out = append(out, f)
	}
	return out, nil
}

// backupSensitivity: the smallest fault at the far end of the downstream
// device's zone is at least sensitivity_backup × the upstream pickup. A
// stage group that no fault there reaches at all (an upstream ground stage
// behind a delta winding) is not applicable and gives no finding.
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
		f := c.sensitivityFinding(BackupSensitivity, m, c.s.Criteria.SensitivityBackup, pickup, q, u.Kind)
		f.Device, f.Other, f.Stage = c.s.Devices[p.Downstream].Name, u.Name, q.String()
		out = append(out, f)
	}
	return out, nil
}

func (c *checker) sensitivityFinding(ck CheckKind, m minimum, factor, pickup float64, q Quantity, kind DeviceKind) Finding {
	if !m.found {
		return unchecked(ck, fmt.Sprintf("no %s fault current reaches the device in the minimum case", q))
	}
	f := atLeast(ck, m.a, factor*pickup, "A")
	ref := m.ref
	f.Fault = &ref
	what := "pickup"
	if kind == Fuse {
		what = "lowest melting current"
	}
	f.Note = fmt.Sprintf("%s %s A × %g", what, fmtA(pickup), factor)
	return f
}

// fmtA formats a current in a note.
func fmtA(a float64) string {
	if a >= 100 {
		return fmt.Sprintf("%.0f", a)
	}
	return fmt.Sprintf("%.3g", a)
}
