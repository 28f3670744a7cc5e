package coord_test

import (
	"fmt"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/curves"
)

func TestDiffSettings(t *testing.T) {
	load := func() *coord.Study {
		s, err := study.Load("../examples/fenwick-quay.toml")
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	old, new := load(), load()
	if got := coord.DiffSettings(old, new); len(got) != 0 {
		t.Fatalf("a study against itself: %v", got)
	}
	// FM loses its 50 stage, MA-R is renamed (one removed, one added),
	// FC's 51 keeps its fields but gets a definite-time limit at 5 × (only
	// the curve shows it), and T1-HV's breaker is slower.
	dev := func(s *coord.Study, name string) *coord.Device {
		for i := range s.Devices {
			if s.Devices[i].Name == name {
				return &s.Devices[i]
			}
		}
		t.Fatalf("no %s", name)
		return nil
	}
	fm := dev(new, "FM")
	fm.Stages = append(fm.Stages[:1], fm.Stages[2:]...)
	dev(new, "MA-R").Name = "MA-R2"
	fc := &dev(new, "FC").Stages[0]
	ch, err := curves.NewStage(curves.StageSettings{Shape: fc.Shape, PickupA: fc.PickupA, Multiplier: fc.Multiplier, MaxMultiple: 5})
	if err != nil {
		t.Fatal(err)
	}
	fc.Curve = ch
	dev(new, "T1-HV").BreakerS = 0.1
	var got []string
	for _, c := range coord.DiffSettings(old, new) {
		got = append(got, fmt.Sprintf("%s/%s %s %v", c.Device, c.Stage, c.What, c.Fields))
	}
	want := []string{
		"T1-HV/ changed [{breaker_s 0.08 0.1}]",
		"FM/50 removed []",
		"MA-R2/ added []",
		// IEC 60255-151 Table 1 standard inverse, TMS 0.3: 0.3·0.14/(10^0.02 − 1)
		// = 0.8912 s at 10 ×; held at its 5 × value 0.3·0.14/(5^0.02 − 1) = 1.284 s.
		"FC/51 changed [{characteristic 0.8912 s at 10 × pickup 1.284 s}]",
		"MA-R/ removed []",
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("got\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}
