package curves_test

import (
	"math"
	"strings"
	"testing"

	"tripgrade/curves"
)

// printedTol returns half a unit in the last digit of a value printed with
// the given number of decimals: the tolerance a value quoted to those
// digits carries.
func printedTol(decimals int) float64 { return 0.5 * math.Pow(10, -float64(decimals)) }

// TestStandardLawConstants checks every standard shape's constants
// against the standards' tables.
func TestStandardLawConstants(t *testing.T) {
	tests := []struct {
		shape        curves.Shape
		a, b, p, trS float64
		source       string
	}{
		{curves.ShapeIECSI, 0.14, 0, 0.02, 0, "IEC 60255-151:2009 Table 1, standard inverse"},
		{curves.ShapeIECVI, 13.5, 0, 1, 0, "IEC 60255-151:2009 Table 1, very inverse"},
		{curves.ShapeIECEI, 80, 0, 2, 0, "IEC 60255-151:2009 Table 1, extremely inverse"},
		{curves.ShapeIECLTI, 120, 0, 1, 0, "BS 142 / IEC 60255-3 long-time inverse"},
		{curves.ShapeIEEEMI, 0.0515, 0.1140, 0.02, 4.85, "IEEE C37.112-2018 moderately inverse"},
		{curves.ShapeIEEEVI, 19.61, 0.491, 2, 21.6, "IEEE C37.112-2018 very inverse"},
		{curves.ShapeIEEEEI, 28.2, 0.1217, 2, 29.1, "IEEE C37.112-2018 extremely inverse"},
	}
	for _, tc := range tests {
		t.Run(tc.shape.String(), func(t *testing.T) {
			law, ok := tc.shape.Law()
			if !ok {
				t.Fatalf("%s: Law() reports no constants", tc.shape)
			}
			got := [4]float64{law.A, law.B, law.P, law.ResetS}
			want := [4]float64{tc.a, tc.b, tc.p, tc.trS}
			if got != want {
				t.Errorf("%s (%s): got A, B, P, tr = %v, want %v", tc.shape, tc.source, got, want)
			}
			if law.Name != tc.shape.String() {
				t.Errorf("law name %q, want %q", law.Name, tc.shape.String())
			}
		})
	}
}

// TestStandardCheckValues evaluates each standard law at multiplier 1 and
// compares with the check values printed beside the tables, to half a
// unit of their last printed digit.
func TestStandardCheckValues(t *testing.T) {
	tests := []struct {
		name     string
		shape    curves.Shape
		multiple float64
		wantS    float64
		decimals int
		source   string
	}{
		{"iec-si 2x", curves.ShapeIECSI, 2, 10.03, 2, "IEC 60255-151:2009 Table 1"},
		{"iec-si 10x", curves.ShapeIECSI, 10, 2.971, 3, "IEC 60255-151:2009 Table 1"},
		{"iec-si 20x", curves.ShapeIECSI, 20, 2.267, 3, "IEC 60255-151:2009 Table 1"},
		{"iec-vi 2x", curves.ShapeIECVI, 2, 13.5, 1, "IEC 60255-151:2009 Table 1"},
		{"iec-vi 10x", curves.ShapeIECVI, 10, 1.500, 3, "IEC 60255-151:2009 Table 1"},
		{"iec-vi 20x", curves.ShapeIECVI, 20, 0.711, 3, "IEC 60255-151:2009 Table 1"},
		{"iec-ei 2x", curves.ShapeIECEI, 2, 26.67, 2, "IEC 60255-151:2009 Table 1"},
		{"iec-ei 10x", curves.ShapeIECEI, 10, 0.808, 3, "IEC 60255-151:2009 Table 1"},
		{"iec-ei 20x", curves.ShapeIECEI, 20, 0.201, 3, "IEC 60255-151:2009 Table 1"},
		{"iec-lti 2x", curves.ShapeIECLTI, 2, 120, 0, "BS 142 / IEC 60255-3 long-time inverse"},
		{"iec-lti 10x", curves.ShapeIECLTI, 10, 13.33, 2, "BS 142 / IEC 60255-3 long-time inverse"},
		{"ieee-mi 2x", curves.ShapeIEEEMI, 2, 3.803, 3, "IEEE C37.112-2018"},
		{"ieee-mi 10x", curves.ShapeIEEEMI, 10, 1.207, 3, "IEEE C37.112-2018"},
		{"ieee-vi 2x", curves.ShapeIEEEVI, 2, 7.028, 3, "IEEE C37.112-2018"},
		{"ieee-vi 10x", curves.ShapeIEEEVI, 10, 0.689, 3, "IEEE C37.112-2018"},
		{"ieee-ei 2x", curves.ShapeIEEEEI, 2, 9.522, 3, "IEEE C37.112-2018"},
		{"ieee-ei 10x", curves.ShapeIEEEEI, 10, 0.407, 3, "IEEE C37.112-2018"},
	}
	const pickupA = 100
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			law, _ := tc.shape.Law()
			stage, err := curves.NewInverseTime(law, pickupA, 1)
			if err != nil {
				t.Fatal(err)
			}
			got, st := stage.Time(tc.multiple * pickupA)
			if st != curves.Operates {
				t.Fatalf("status %v, want operates", st)
			}
			// Tolerance: the check value is printed to tc.decimals decimals.
			if tol := printedTol(tc.decimals); math.Abs(got-tc.wantS) > tol {
				t.Errorf("%s at %g×: got %.5f s, want %g s ± %g (%s)", tc.shape, tc.multiple, got, tc.wantS, tol, tc.source)
			}
			if lawT, _ := law.TimeAt(tc.multiple); lawT != got {
				t.Errorf("Law.TimeAt(%g) = %v, stage gives %v", tc.multiple, lawT, got)
			}
		})
	}
}

func TestParseShape(t *testing.T) {
	for _, s := range curves.Shapes() {
		for _, text := range []string{s.String(), strings.ToUpper(s.String()), "  " + s.String() + " "} {
			got, err := curves.ParseShape(text)
			if err != nil || got != s {
				t.Errorf("ParseShape(%q) = %v, %v; want %v", text, got, err, s)
			}
		}
	}
	wantNames := []string{"iec-si", "iec-vi", "iec-ei", "iec-lti", "ieee-mi", "ieee-vi", "ieee-ei",
		"definite", "instantaneous", "iec-user", "ieee-user"}
	if len(curves.Shapes()) != len(wantNames) {
		t.Fatalf("got %d shapes, want %d", len(curves.Shapes()), len(wantNames))
	}
	_, err := curves.ParseShape("iec-moderate")
	if err == nil {
		t.Fatal("ParseShape accepted an unknown name")
	}
	for _, n := range wantNames {
		if !strings.Contains(err.Error(), n) {
			t.Errorf("error %q does not list %q", err, n)
		}
	}
}

func TestShapeProperties(t *testing.T) {
	tests := []struct {
		shape      curves.Shape
		std, dep   bool
		user       bool
		multiplier string
	}{
		{curves.ShapeIECSI, true, true, false, "TMS"},
		{curves.ShapeIECLTI, true, true, false, "TMS"},
		{curves.ShapeIEEEEI, true, true, false, "TD"},
		{curves.ShapeDefinite, false, false, false, ""},
		{curves.ShapeInstantaneous, false, false, false, ""},
		{curves.ShapeIECUser, false, true, true, "TMS"},
		{curves.ShapeIEEEUser, false, true, true, "TD"},
		{curves.Shape(0), false, false, false, ""},
	}
	for _, tc := range tests {
		t.Run(tc.shape.String(), func(t *testing.T) {
			_, std := tc.shape.Law()
			if std != tc.std || tc.shape.Dependent() != tc.dep || tc.shape.UserDefined() != tc.user ||
				tc.shape.MultiplierName() != tc.multiplier {
				t.Errorf("got law %v dependent %v user %v multiplier %q; want %v %v %v %q",
					std, tc.shape.Dependent(), tc.shape.UserDefined(), tc.shape.MultiplierName(),
					tc.std, tc.dep, tc.user, tc.multiplier)
			}
			if tc.shape.Description() == "" {
				t.Error("empty description")
			}
		})
	}
}

func TestUserLaws(t *testing.T) {
	iec, err := curves.IECLaw("mine", 13.5, 1, 0)
	if err != nil {
		t.Fatal(err)
	}
	if vi, _ := curves.ShapeIECVI.Law(); iec.A != vi.A || iec.P != vi.P || iec.B != vi.B {
		t.Errorf("IECLaw(13.5, 1, 0) = %+v, want the very inverse constants %+v", iec, vi)
	}
	ieee, err := curves.IEEELaw("mine", 19.61, 0.491, 2, 21.6)
	if err != nil {
		t.Fatal(err)
	}
	if vi, _ := curves.ShapeIEEEVI.Law(); ieee.A != vi.A || ieee.B != vi.B || ieee.P != vi.P || ieee.ResetS != vi.ResetS {
		t.Errorf("IEEELaw = %+v, want %+v", ieee, vi)
	}
	bad := []struct {
		name string
		make func() error
		want []string
	}{
		{"iec negative k", func() error { _, err := curves.IECLaw("x", -1, 0.02, 0); return err }, []string{"k must be > 0 s (got -1)"}},
		{"iec zero alpha and NaN c", func() error { _, err := curves.IECLaw("x", 1, 0, math.NaN()); return err },
			[]string{"alpha must be > 0 (got 0)", "c must be a finite number (got NaN)"}},
		{"ieee negative B", func() error { _, err := curves.IEEELaw("x", 1, -0.1, 2, 0); return err }, []string{"B must be >= 0 s (got -0.1)"}},
		{"ieee negative tr", func() error { _, err := curves.IEEELaw("x", 1, 0, 2, -3); return err }, []string{"tr must be >= 0 s (got -3)"}},
		{"law infinite A", func() error { return curves.Law{A: math.Inf(1), P: 1}.Validate() }, []string{"A must be a finite number (got +Inf)"}},
	}
	for _, tc := range bad {
		t.Run(tc.name, func(t *testing.T) {
			err := tc.make()
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
		})
	}
}
