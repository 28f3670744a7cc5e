package curves_test

import (
	"math"
	"strings"
	"testing"

	"tripgrade/curves"
)

// TestCableWithstand: IEC 60364-5-54 (and IEC 60364-4-43) adiabatic
// withstand I²t ≤ k²S², valid up to 5 s.
func TestCableWithstand(t *testing.T) {
	tests := []struct {
		name    string
		m       curves.Material
		ins     curves.Insulation
		areaMM2 float64
		k       float64
	}{
		{"Cu XLPE 240", curves.Copper, curves.XLPE, 240, 143},
		{"Cu PVC 95", curves.Copper, curves.PVC, 95, 115},
		{"Al PVC 300", curves.Aluminium, curves.PVC, 300, 76},
		{"Al EPR 500", curves.Aluminium, curves.EPR, 500, 94},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			c, err := curves.NewCableWithstand(tc.m, tc.ins, tc.areaMM2)
			if err != nil {
				t.Fatal(err)
			}
			want := (tc.k * tc.areaMM2) * (tc.k * tc.areaMM2)
			if relErr(c.I2tA2S, want) > roundingRelTol {
				t.Errorf("I²t = %v A²s, want (%v·%v)² = %v", c.I2tA2S, tc.k, tc.areaMM2, want)
			}
			// At the current giving 1 s the withstand is 1 s: I = kS.
			if got, st := c.Time(tc.k * tc.areaMM2); st != curves.Operates || relErr(got, 1) > roundingRelTol {
				t.Errorf("at kS A: %v s (%v), want 1 s", got, st)
			}
			// The span starts where the time is 5 s, kS/√5; that current is
			// valid, beyond 5 s the adiabatic equation is not.
			lo, _ := c.Span()
			if relErr(lo, tc.k*tc.areaMM2/math.Sqrt(5)) > roundingRelTol {
				t.Errorf("span starts at %v A, want kS/√5", lo)
			}
			if got, st := c.Time(lo); st != curves.Operates || relErr(got, 5) > roundingRelTol {
				t.Errorf("at the 5 s current: %v s (%v)", got, st)
			}
			if _, st := c.Time(tc.k * tc.areaMM2 / math.Sqrt(5.01)); st != curves.Undefined {
				t.Errorf("beyond 5 s: status %v, want undefined", st)
			}
		})
	}
}

// TestKFactorAgainstIEC60949: the tabulated k of IEC 60364-5-54 follow from
// the IEC 60949 adiabatic equation k = K·sqrt(ln((θf+β)/(θi+β))) with the
// insulation's temperatures (PVC 70 → 160 °C, XLPE/EPR 90 → 250 °C); the
// table rounds to whole numbers, hence the tolerance of 0.5.
func TestKFactorAgainstIEC60949(t *testing.T) {
	const tableRounding = 0.5
	tests := []struct {
		m                curves.Material
		ins              curves.Insulation
		initialC, finalC float64
		want             float64
	}{
		{curves.Copper, curves.PVC, 70, 160, 115},
		{curves.Copper, curves.XLPE, 90, 250, 143},
		{curves.Copper, curves.EPR, 90, 250, 143},
		{curves.Aluminium, curves.PVC, 70, 160, 76},
		{curves.Aluminium, curves.XLPE, 90, 250, 94},
		{curves.Aluminium, curves.EPR, 90, 250, 94},
	}
	for _, tc := range tests {
		name := tc.m.String() + " " + tc.ins.String()
		k, err := curves.KFactor(tc.m, tc.ins)
		if err != nil || k != tc.want {
			t.Errorf("%s: KFactor = %v, %v; want %v (IEC 60364-5-54 Table A.54)", name, k, err, tc.want)
		}
		formula, err := curves.AdiabaticK(tc.m, tc.initialC, tc.finalC)
		if err != nil || math.Abs(formula-tc.want) > tableRounding {
			t.Errorf("%s: IEC 60949 gives %v, %v; want %v ± %v", name, formula, err, tc.want, tableRounding)
		}
	}
	if _, err := curves.AdiabaticK(curves.Copper, 90, 80); err == nil {
		t.Error("final below initial accepted")
	}
}

func TestCableErrors(t *testing.T) {
	tests := []struct {
		name    string
		m       curves.Material
		ins     curves.Insulation
		areaMM2 float64
		want    string
	}{
		{"PVC above 300 mm²", curves.Copper, curves.PVC, 400, "up to 300 mm²"},
		{"zero area", curves.Copper, curves.XLPE, 0, "conductor area must be > 0 mm² (got 0)"},
		{"unknown material", curves.Material(0), curves.XLPE, 95, "no k for material"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := curves.NewCableWithstand(tc.m, tc.ins, tc.areaMM2); err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error %v, want one containing %q", err, tc.want)
			}
		})
	}
}

func TestParseMaterialInsulation(t *testing.T) {
	for in, want := range map[string]curves.Material{"cu": curves.Copper, "Copper": curves.Copper, "AL": curves.Aluminium,
		"aluminium": curves.Aluminium, "aluminum": curves.Aluminium} {
		if got, err := curves.ParseMaterial(in); err != nil || got != want {
			t.Errorf("ParseMaterial(%q) = %v, %v", in, got, err)
		}
	}
	for in, want := range map[string]curves.Insulation{"pvc": curves.PVC, "XLPE": curves.XLPE, " epr ": curves.EPR} {
		if got, err := curves.ParseInsulation(in); err != nil || got != want {
			t.Errorf("ParseInsulation(%q) = %v, %v", in, got, err)
		}
	}
	if _, err := curves.ParseMaterial("steel"); err == nil || !strings.Contains(err.Error(), "cu, al") {
		t.Errorf("ParseMaterial(steel): %v", err)
	}
	if _, err := curves.ParseInsulation("paper"); err == nil || !strings.Contains(err.Error(), "pvc, xlpe, epr") {
		t.Errorf("ParseInsulation(paper): %v", err)
	}
}

func TestI2tLimit(t *testing.T) {
	l, err := curves.NewI2tLimit(1e6, 0)
	if err != nil {
		t.Fatal(err)
	}
	// t = I²t/I²: 1e6/1000² = 1 s, and no validity limit.
	if got, st := l.Time(1000); st != curves.Operates || got != 1 {
		t.Errorf("at 1000 A: %v, %v", got, st)
	}
	if _, st := l.Time(1); st != curves.Operates {
		t.Errorf("without a limit at 1 A: %v", st)
	}
	if _, st := l.Time(0); st != curves.Undefined {
		t.Errorf("at 0 A: %v", st)
	}
	if _, err := curves.NewI2tLimit(-1, 0); err == nil {
		t.Error("negative I²t accepted")
	}
}
