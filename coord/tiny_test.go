package coord_test

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study"
)

// tinyStudy is a radial 11 kV network whose far-end earth faults draw
// milliamperes: the zero-sequence impedance of L2 is 1 MΩ (the largest a
// study file accepts) and the minimum case has the largest fault
// resistance a study accepts, 10 kΩ. Impedances are purely reactive so
// the currents follow by hand. GROUND is R2's ground pickup.
const tinyStudy = `
[study]
name = "tiny currents"
[criteria]
fault_resistance_ohm = 10000
[[bus]]
name = "A"
kv = 11
[[bus]]
name = "B"
kv = 11
[[bus]]
name = "C"
kv = 11
[[source]]
name = "grid"
bus = "A"
x1_ohm_max = 0.5
x1_ohm_min = 1.0
x0_ohm_max = 1.0
[[line]]
name = "L1"
from = "A"
to = "B"
type = "overhead"
x1_ohm = 1.5
x0_ohm = 4.5
[[line]]
name = "L2"
from = "B"
to = "C"
type = "overhead"
x1_ohm = 2.0
x0_ohm = 1e6
[[relay]]
name = "R2"
branch = "L2"
at = "B"
ct_primary_a = 400
ct_secondary_a = 1
  [[relay.stage]]
  measures = "ground"
  curve = "definite"
  pickup_a = GROUND
  delay_s = 0.5
`

// TestTinyCurrentsAreCurrents: a far-end earth fault of a few milliamperes
// is compared with the pickup like any other current, at the far end, and
// not replaced by a larger fault elsewhere in the zone.
func TestTinyCurrentsAreCurrents(t *testing.T) {
	// Minimum case at C: Z1 = Z2 = j(1.0 + 1.5 + 2.0) Ω, Z0 = j(1.0 + 4.5 +
	// 1e6) Ω, Zf = 10 kΩ, E = c·Un/√3 with c = 1.00 (IEC 60909-0 Table 1).
	// A ground stage is judged on the line-to-earth fault (the
	// double-line-to-earth fault is left to the phase stages, see
	// groupKinds): I0 = E/(Z1+Z2+Z0+3Zf) (Grainger & Stevenson, ch. 12),
	// and the residual current is 3|I0|.
	e := complex(11000/math.Sqrt(3), 0)
	z1 := complex(0, 4.5)
	z0f := complex(3e4, 1.0+4.5+1e6)
	want := 3 * cmplx.Abs(e/(z1+z1+z0f))
	if want > 0.02 || want < 0.001 {
		t.Fatalf("hand value %g A is not the milliamperes this test is about", want)
	}
	for _, c := range []struct {
		pickup  string
		verdict coord.Verdict
	}{{"60", coord.Fail}, {"0.001", coord.Pass}} {
		s, err := study.Parse("tiny.toml", []byte(strings.Replace(tinyStudy, "GROUND", c.pickup, 1)), nil)
		if err != nil {
			t.Fatal(err)
		}
		r := checkStudy(t, s)
		var f *coord.Finding
		for i := range r.Findings {
			if x := &r.Findings[i]; x.Check == coord.PrimarySensitivity && x.Stage == "ground" {
				f = x
			}
		}
		if f == nil {
			t.Fatalf("pickup %s A: no ground sensitivity finding", c.pickup)
		}
		if f.Verdict != c.verdict || f.Fault == nil || f.Fault.Place != "C" || strings.Contains(f.Note, "delta") {
			t.Errorf("pickup %s A: %v at %v, note %q; want %v at the far end C", c.pickup, f.Verdict, f.Fault, f.Note, c.verdict)
		}
		if math.Abs(f.Measured-want) > 1e-6*want {
			t.Errorf("pickup %s A: measured %g A, want %g A", c.pickup, f.Measured, want)
		}
	}
}
