package coord

import (
	"fmt"
	"math"
	"sort"

	"tripgrade/curves"
)

// SettingChange is what changed in one device, or in one stage of a
// relay, between two studies of the same network.
type SettingChange struct {
	Device string
	Stage  string // the stage label; empty for the device's own data
	// What is "added", "removed" or "changed"; Fields list the changed
	// settings (for "changed" only).
	What   string
	Fields []FieldChange
}

// FieldChange is one setting's old and new value, as text.
type FieldChange struct {
	Name, Old, New string
}

// DiffSettings lists the setting changes from old to new: devices added
// and removed, and for devices in both, changes in their own data (place,
// CT, breaker, accuracy, fuse rating and curves) and in each stage
// (matched by label). Changes come in new's device order, removed devices
// last.
func DiffSettings(old, new *Study) []SettingChange {
	byName := map[string]*Device{}
	for i := range old.Devices {
		byName[old.Devices[i].Name] = &old.Devices[i]
	}
	seen := map[string]bool{}
	var out []SettingChange
	for i := range new.Devices {
		n := &new.Devices[i]
		seen[n.Name] = true
		o, ok := byName[n.Name]
		if !ok {
			out = append(out, SettingChange{Device: n.Name, What: "added"})
			continue
		}
		if f := deviceFields(old, new, o, n); len(f) > 0 {
			out = append(out, SettingChange{Device: n.Name, What: "changed", Fields: f})
		}
		out = append(out, stageChanges(o, n)...)
	}
	for _, o := range old.Devices {
		if !seen[o.Name] {
			out = append(out, SettingChange{Device: o.Name, What: "removed"})
		}
	}
	return out
}

// fields collects changed values.
type fields []FieldChange

func (f *fields) num(name string, a, b float64) {
	if a != b && !(math.IsNaN(a) && math.IsNaN(b)) {
		*f = append(*f, FieldChange{name, fmtValue(a), fmtValue(b)})
	}
}

func (f *fields) text(name, a, b string) {
	if a != b {
		*f = append(*f, FieldChange{name, a, b})
	}
}

func fmtValue(v float64) string {
	if v == 0 {
		return "none"
	}
	return fmt.Sprintf("%g", v)
}

func deviceFields(os, ns *Study, o, n *Device) []FieldChange {
	var f fields
	place := func(s *Study, d *Device) string {
		return fmt.Sprintf("%s at %s", s.Network.BranchName(d.Point.Branch), s.Network.Buses[DeviceBus(s.Network, *d)].Name)
	}
	f.text("kind", o.Kind.String(), n.Kind.String())
	f.text("place", place(os, o), place(ns, n))
	f.num("ct_primary_a", o.CT.PrimaryA, n.CT.PrimaryA)
	f.num("ct_secondary_a", o.CT.SecondaryA, n.CT.SecondaryA)
	f.num("ct_thermal_factor", o.CT.ThermalFactor, n.CT.ThermalFactor)
	f.text("ct_class", ctClass(o.CT), ctClass(n.CT))
	f.num("ct_burden_ohm", o.CT.BurdenOhm, n.CT.BurdenOhm)
	f.num("breaker_s", o.BreakerS, n.BreakerS)
	f.num("accuracy_class_pct", o.Accuracy.ClassPct, n.Accuracy.ClassPct)
	f.num("accuracy_min_s", o.Accuracy.MinErrorS, n.Accuracy.MinErrorS)
	f.num("max_load_a", o.MaxLoadA, n.MaxLoadA)
	f.num("rating_a", o.RatingA, n.RatingA)
	f.text("melt", tableText(o.Melt), tableText(n.Melt))
	f.text("clear", tableText(o.Clear), tableText(n.Clear))
	return f
}

func ctClass(ct CT) string {
	if ct.CClassV == 0 {
		return "none"
	}
	return fmt.Sprintf("C%g", ct.CClassV)
}

func tableText(t *curves.Table) string {
	if t == nil {
		return "none"
	}
	return fmt.Sprint(t.Points())
}

// stageChanges compares the stages of two relays by label.
func stageChanges(o, n *Device) []SettingChange {
	old := map[string]*Stage{}
	for i := range o.Stages {
		old[o.Stages[i].Label] = &o.Stages[i]
	}
	var out []SettingChange
	seen := map[string]bool{}
	for i := range n.Stages {
		ns := &n.Stages[i]
		seen[ns.Label] = true
		os, ok := old[ns.Label]
		if !ok {
			out = append(out, SettingChange{Device: n.Name, Stage: ns.Label, What: "added"})
			continue
		}
		if f := stageFields(os, ns); len(f) > 0 {
			out = append(out, SettingChange{Device: n.Name, Stage: ns.Label, What: "changed", Fields: f})
		}
	}
	var gone []string
	for l := range old {
		if !seen[l] {
			gone = append(gone, l)
		}
	}
	sort.Strings(gone)
	for _, l := range gone {
		out = append(out, SettingChange{Device: n.Name, Stage: l, What: "removed"})
	}
	return out
}

// curveProbes are the multiples of pickup at which two stages' curves
// are compared, to catch a change the listed fields do not show (a
// user curve's constants, a definite-time limit).
var curveProbes = []float64{1.5, 2, 5, 10, 20, 50}

func stageFields(o, n *Stage) []FieldChange {
	var f fields
	f.text("measures", o.Measures.String(), n.Measures.String())
	f.text("curve", o.Shape.String(), n.Shape.String())
	f.num("pickup_a", o.PickupA, n.PickupA)
	f.num(o.Shape.MultiplierName(), o.Multiplier, n.Multiplier)
	f.num("delay_s", o.DelayS, n.DelayS)
	f.text("pickup_range_a", rangeText(o.PickupRange), rangeText(n.PickupRange))
	f.text("multiplier_range", rangeText(o.MultiplierRange), rangeText(n.MultiplierRange))
	if len(f) == 0 && o.Curve != nil && n.Curve != nil {
		for _, m := range curveProbes {
			to, so := o.Curve.Time(m * o.PickupA)
			tn, sn := n.Curve.Time(m * o.PickupA)
			if so != sn || math.Abs(to-tn) > 1e-9*math.Max(1, to) {
				f = append(f, FieldChange{"characteristic", fmt.Sprintf("%.4g s at %g × pickup", to, m), fmt.Sprintf("%.4g s", tn)})
				break
			}
		}
	}
	return f
}

func rangeText(r Range) string {
	if !r.Declared() {
		return "none"
	}
	return fmt.Sprintf("%g:%g:%g", r.Min, r.Max, r.Step)
}
