package coord

import (
	"fmt"
	"strings"

	"tripgrade/faults"
)

// detection is how well a device detects one fault: the larger of its
// phase current over its lowest phase pickup and its residual current
// over its lowest ground pickup (a fuse: its current over the first
// current of its melting table).
type detection struct {
	multiple float64
	a        float64 // the current behind the multiple
	q        Quantity
	dev      int // the device
}

func detect(d *Device, dev int, phaseA, residualA float64) detection {
	best := detection{dev: dev}
	for _, q := range []Quantity{Phase, Residual} {
		p := d.Pickup(q)
		a := phaseA
		if q == Residual {
			a = residualA
		}
		if p > 0 && a/p > best.multiple {
			best = detection{multiple: a / p, a: a, q: q, dev: dev}
		}
	}
	return best
}

// scheme returns device i and the other devices at its point: one set of
// current transformers feeding, say, a phase relay and a separate
// earth-fault relay. They detect a fault together.
func (c *checker) scheme(i int) []int {
	out := []int{i}
	for _, j := range c.atPoint[c.s.Devices[i].Point] {
		if j != i {
			out = append(out, j)
		}
	}
	return out
}

// detected reports whether a multiple of pickup operates the device: a
// relay stage operates only above its pickup, a fuse's melting table is
// defined from its first current on.
func (d *Device) detected(multiple float64) bool {
	if d.Kind == Fuse {
		return multiple >= 1
	}
	return multiple > 1
}

// coverage: every fault kind that drives current through the device
// somewhere in its zone, in the minimum case, is detected by at least one
// of its stages (a fuse: melts at all), or of another device at the same
// point, at every place of the zone. A kind
// that no stage detects somewhere fails: its stage groups may each pass
// on the kinds they exist for (phase: LLL and LL; ground: LG) while a
// double-line-to-earth fault, or an earth fault seen only by phase stages,
// slips through. Earth faults behind a delta winding that the device
// declares left to other protection (earth_faults_cleared_by) are not
// checked, which makes the finding a WARN.
func (c *checker) coverage(i int) (*Finding, error) {
	d := &c.s.Devices[i]
	if d.Pickup(Phase) == 0 && d.Pickup(Residual) == 0 {
		return nil, nil
	}
	var worst detection
	var worstPlace faults.Place
	var worstKind faults.Kind
	found := false
	seen := map[faults.Kind]bool{}
	declared := 0
	for _, k := range faults.Kinds {
		for _, pl := range c.places[i] {
			sol, err := c.sol.solve(pl, k, faults.Min)
			if err != nil {
				return nil, err
			}
			if !sol.Energised() {
				continue
			}
			ph, res := c.effective(i, sol)
			if ph == 0 && res == 0 {
				continue
			}
			seen[k] = true
			det := detection{dev: i}
			for _, j := range c.scheme(i) {
				if x := detect(&c.s.Devices[j], j, ph, res); x.multiple > det.multiple {
					det = x
				}
			}
			if k.Earth() && res == 0 && d.EarthFaultsBy != "" && !c.s.Devices[det.dev].detected(det.multiple) {
				declared++
				continue
			}
			if !found || det.multiple < worst.multiple*(1-tieTolerance) {
				worst, worstPlace, worstKind, found = det, pl, k, true
			}
		}
	}
	var none []string
	for _, k := range faults.Kinds {
		if !seen[k] {
			none = append(none, k.String())
		}
	}
	if !found {
		if declared == 0 {
			return nil, nil // no fault current reaches the device: the sensitivity findings say so
		}
		f := unchecked(PrimarySensitivity, fmt.Sprintf("every fault of the zone that drives current through the device is an earth fault beyond a delta winding, which it leaves to \"%s\" (declared by the study)", d.EarthFaultsBy))
		f.Device, f.Stage = d.Name, coverageStage
		return &f, nil
	}
	f := atLeast(PrimarySensitivity, worst.multiple, 1, "×")
	by := &c.s.Devices[worst.dev]
	if !by.detected(worst.multiple) {
		f.Verdict = Fail
	}
	f.Device, f.Stage = d.Name, coverageStage
	f.Fault = &FaultRef{Kind: worstKind, Case: faults.Min, Place: PlaceName(c.s.Network, worstPlace), DeviceA: worst.a, DeviceQty: worst.q}
	what := "its lowest pickup"
	if by.Kind == Fuse {
		what = "its lowest melting current"
	}
	if worst.dev != i {
		what = fmt.Sprintf("the lowest pickup of %s at the same point", by.Name)
	}
	if f.Verdict == Fail {
		f.Note = fmt.Sprintf("an %s fault of the zone is detected by none of its stages: its largest current is %s %s", worstKind, fmtMultiple(worst.multiple), what)
		noGround := true
		for _, j := range c.scheme(i) {
			noGround = noGround && c.s.Devices[j].Pickup(Residual) == 0
		}
		if noGround && worstKind.Earth() {
			f.Note += " (no ground stage)"
		}
	} else {
		f.Note = fmt.Sprintf("every fault kind of the zone is detected, minimum case; the least is %s at %s %s", worstKind, fmtMultiple(worst.multiple), what)
	}
	if len(none) > 0 {
		f.Note += fmt.Sprintf("; no %s fault drives current through it", strings.Join(none, " or "))
	}
	if declared > 0 {
		f.Note += fmt.Sprintf("; not checked: %d earth faults beyond a delta winding that it does not detect are left to \"%s\" (declared by the study)", declared, d.EarthFaultsBy)
		if f.Verdict == Pass {
			f.Verdict = Warn
		}
	}
	return &f, nil
}

// coverageStage names the coverage finding's stage column.
const coverageStage = "every kind"

func fmtMultiple(m float64) string { return fmt.Sprintf("%.2f ×", m) }
