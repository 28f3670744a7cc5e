package faults_test

import (
	"math"
	"math/cmplx"
	"testing"

	"tripgrade/faults"
)

// TestExtremeCarriesBusVoltages: each extreme of a point's summary carries
// the voltages at the point's bus for its fault. A source of impedance Zs
// (Z0s in zero sequence) feeds a line to bus B; for an LG fault at B the
// relay bus A sits behind the source impedance only, so by the sequence
// networks (e.g. Glover, Sarma & Overbye, Power System Analysis and
// Design, ch. 9, from memory) V1 = E − Zs·I1, V2 = −Zs·I2, V0 = −Z0s·I0,
// with I0 = I1 = I2 = E/(2(Zs+ZL) + Z0s+Z0L), E = c·Un/√3 (IEC 60909-0,
// c_max 1.10 above 1 kV).
func TestExtremeCarriesBusVoltages(t *testing.T) {
	zs, z0s := complex(0.5, 5), complex(0.8, 8)
	zl, z0l := complex(1.2, 2.4), complex(3, 7.5)
	n := &faults.Network{
		Buses: []faults.Bus{{Name: "A", KV: 11}, {Name: "B", KV: 11}},
		Sources: []faults.Source{{Name: "grid", Bus: 0, Earthed: true,
			Max: faults.Strength{Z1Ohm: zs, Z0Ohm: z0s}, Min: faults.Strength{Z1Ohm: zs, Z0Ohm: z0s}}},
		Lines: []faults.Line{{Name: "L", From: 0, To: 1, Z1Ohm: zl, Z0Ohm: z0l}},
	}
	eng, err := faults.New(n, faults.Settings{})
	if err != nil {
		t.Fatal(err)
	}
	pt := faults.Point{Branch: 0, End: faults.From}
	s, err := eng.SummarisePoint(pt, []faults.Place{faults.AtBus(1)})
	if err != nil {
		t.Fatal(err)
	}
	x := s.ResidualMax
	if !x.Found || x.Fault.Kind != faults.LG {
		t.Fatalf("residual maximum %+v, want an LG fault", x)
	}
	e := complex(1.10*11000/math.Sqrt(3), 0)
	i := e / (2*(zs+zl) + z0s + z0l)
	want := [3]complex128{-z0s * i, e - zs*i, -zs * i}
	for q := range want {
		if cmplx.Abs(x.V.Seq[q]-want[q]) > 1e-9*cmplx.Abs(e) {
			t.Errorf("V%d at A = %v, want %v", q, x.V.Seq[q], want[q])
		}
	}
	if cmplx.Abs(x.Pre.Seq[1]-e) > 1e-9*cmplx.Abs(e) {
		t.Errorf("pre-fault voltage %v, want %v", x.Pre.Seq[1], e)
	}
	// The phase voltages follow by Fortescue: Va = V0 + V1 + V2.
	if va := x.V.Phases()[0]; cmplx.Abs(va-(want[0]+want[1]+want[2])) > 1e-9*cmplx.Abs(e) {
		t.Errorf("Va at A = %v", va)
	}
}
