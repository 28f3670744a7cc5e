package study

import (
	"math"
	"testing"

	"tripgrade/faults"
)

// TestMachinesConversion: the IEC TR 60909-4 network file reaches the
// model in the engine's units: three-winding transformers as three star
// branches after the two-winding ones with an internal star point, their
// pairs and vector groups; motors with the efficiency as a fraction;
// generator resistances given in ohms as a percentage of the rating;
// power station units joined to their unit transformers; a transformer's
// r_pct as X/R.
func TestMachinesConversion(t *testing.T) {
	s, err := Load("../../testdata/iec60909-4/network.toml")
	if err != nil {
		t.Fatal(err)
	}
	n := s.Network
	if len(n.Transformers3) != 2 || len(n.Motors) != 2 || len(n.Transformers) != 4 || len(n.Lines) != 7 {
		t.Fatalf("got %d three-winding, %d motors, %d two-winding, %d lines; want 2, 2, 4, 7",
			len(n.Transformers3), len(n.Motors), len(n.Transformers), len(n.Lines))
	}
	if n.BranchCount() != 7+4+6 || len(s.Equipment) != n.BranchCount() {
		t.Errorf("%d branches, %d equipment entries; want 17 of each", n.BranchCount(), len(s.Equipment))
	}
	t3 := n.Transformers3[0]
	star := n.Buses[t3.StarBus]
	if !star.Internal || star.KV != 380 || star.Name != "T3 (star point)" {
		t.Errorf("star point %+v", star)
	}
	if b := n.StarBranch(0, faults.MV); n.BranchName(b) != "T3 (MV)" {
		t.Errorf("branch %d is %q, want T3 (MV)", b, n.BranchName(b))
	}
	if f, to := n.BranchEnds(n.StarBranch(0, faults.LV)); n.Buses[f].Name != "B8" || to != t3.StarBus {
		t.Errorf("T3 LV star branch runs %s–%s", n.Buses[f].Name, n.Buses[to].Name)
	}
	if t3.Group.String() != "YNy0d5" || t3.Pairs[faults.HVLV] != (faults.WindingPair{MVA: 50, ZPct: 10, RPct: 0.16, Z0Pct: 6.299626623208452, R0Pct: 0.037142857142857144}) {
		t.Errorf("T3 %s %+v", t3.Group, t3.Pairs)
	}
	m := n.Motors[1]
	if m.Eff != 0.968 || m.Count != 2 || m.PolePairs != 2 || m.RX != 0 || m.LockedRotor != 5.2 {
		t.Errorf("motor M2 %+v", m)
	}
	g1 := n.Generators[0]
	// 0.002 Ω on 21 kV and 150 MVA (2.94 Ω) is 0.068027 %.
	if math.Abs(g1.RPct-0.002/(21.0*21/150)*100) > 1e-12 || g1.Unit == nil || !g1.Unit.OnLoadTapChanger ||
		n.Transformers[g1.Unit.Transformer].Name != "T1" {
		t.Errorf("generator G1 %+v, unit %+v", g1, g1.Unit)
	}
	if u := n.Generators[1].Unit; u == nil || u.OnLoadTapChanger || u.PGPct != 7.5 || u.TapPct != 0 {
		t.Errorf("generator G2's unit %+v", u)
	}
	if n.Generators[2].Unit != nil {
		t.Error("G3 sits on a busbar, not in a unit")
	}
	// r_pct 0.5 of z_pct 16: X/R = √(16² − 0.5²)/0.5.
	if t1 := n.Transformers[0]; math.Abs(t1.XR-math.Sqrt(256-0.25)/0.5) > 1e-12 {
		t.Errorf("T1 X/R %g", t1.XR)
	}
}

// TestDeviceOnAWinding: a relay names the three-winding transformer and
// the bus of its winding; it sits on that winding's star branch, at the
// terminal.
func TestDeviceOnAWinding(t *testing.T) {
	s, err := Load("../../testdata/machines/three-winding.toml")
	if err != nil {
		t.Fatal(err)
	}
	n := s.Network
	for _, c := range []struct {
		device string
		w      int
	}{{"SGT1-HV", faults.HV}, {"SGT1-MV", faults.MV}} {
		var pt faults.Point
		for _, d := range s.Devices {
			if d.Name == c.device {
				pt = d.Point
			}
		}
		if want := (faults.Point{Branch: n.StarBranch(0, c.w), End: faults.From}); pt != want {
			t.Errorf("%s at %+v, want %+v", c.device, pt, want)
		}
	}
}
