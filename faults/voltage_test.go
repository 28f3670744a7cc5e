package faults

import (
	"math"
	"math/cmplx"
	"testing"
)

// TestVoltagesSingleSource checks the fault voltages of the textbook
// single-source case against the bus impedance method of Grainger &
// Stevenson ch. 12: with a source of impedance Zs behind bus A and a line
// Zl to the faulted bus B, the sequence voltages at A are V1 = E − Zs·I1,
// V2 = −Zs·I2, V0 = −Zs0·I0 and at B V1 = E − (Zs+Zl)·I1, ...; a bolted
// LG fault leaves Va = 0 at B, a bolted LLL fault all three, and a bolted
// LL fault makes Vb = Vc there.
func TestVoltagesSingleSource(t *testing.T) {
	n := radial(true)
	eng, err := New(n, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	c := 1.10
	st := n.Sources[0].Max
	zs := polarXR(c*11*11/st.SCMVA, st.XR)
	zs0 := polarXR(1.5*cmplx.Abs(zs), 4)
	zl, zl0 := n.Lines[0].Z1Ohm, n.Lines[0].Z0Ohm
	e := complex(c*11e3/math.Sqrt(3), 0)
	for _, k := range Kinds {
		sol, err := eng.Solve(Fault{Place: AtBus(1), Kind: k, Case: Max})
		if err != nil {
			t.Fatal(err)
		}
		i := sol.FaultCurrents().Seq // amperes at 11 kV
		wantA := [3]complex128{-zs0 * i[0], e - zs*i[1], -zs * i[2]}
		wantB := [3]complex128{-(zs0 + zl0) * i[0], e - (zs+zl)*i[1], -(zs + zl) * i[2]}
		for bus, want := range [][3]complex128{wantA, wantB} {
			got := sol.VoltageAt(bus).Seq
			for q := range got {
				if cmplx.Abs(got[q]-want[q]) > relTol*cmplx.Abs(e) {
					t.Errorf("%s: bus %d sequence %d voltage %v, want %v", k, bus, q, got[q], want[q])
				}
			}
		}
		ph := sol.VoltageAt(1).Phases()
		tol := relTol * cmplx.Abs(e)
		switch k {
		case LLL:
			for p := range ph {
				if cmplx.Abs(ph[p]) > tol {
					t.Errorf("LLL: V%c at the fault = %v, want 0", 'a'+p, ph[p])
				}
			}
		case LG:
			if cmplx.Abs(ph[0]) > tol {
				t.Errorf("LG: Va at the fault = %v, want 0", ph[0])
			}
		case LL:
			if cmplx.Abs(ph[1]-ph[2]) > tol {
				t.Errorf("LL: Vb − Vc at the fault = %v, want 0", ph[1]-ph[2])
			}
		case LLG:
			if cmplx.Abs(ph[1]) > tol || cmplx.Abs(ph[2]) > tol {
				t.Errorf("LLG: Vb, Vc at the fault = %v, %v, want 0", ph[1], ph[2])
			}
		}
		if pre := sol.Prefault(0).Seq[pos]; cmplx.Abs(pre-e) > tol {
			t.Errorf("pre-fault voltage %v, want c·Un/√3 = %v", pre, e)
		}
	}
}
