package faults

import (
	"math"
	"math/cmplx"
)

// a is the operator e^{j120°} of symmetrical components.
var (
	opA  = cmplx.Rect(1, 2*math.Pi/3)
	opA2 = cmplx.Rect(1, -2*math.Pi/3)
)

// Currents are the sequence currents I0, I1, I2 (index 0, 1, 2) at one
// place, in amperes, with the sign and angle conventions of the package.
type Currents struct {
	Seq [3]complex128
}

// Phases returns Ia, Ib, Ic: Ia = I0+I1+I2, Ib = I0+a²I1+aI2,
// Ic = I0+aI1+a²I2. A phase whose sum cancels to rounding residue (below
// cancelShare of the sequence currents, as Ib and Ic of a phase-a earth
// fault do) is exactly 0, so "no current" reads the same on every machine.
func (c Currents) Phases() [3]complex128 {
	i0, i1, i2 := c.Seq[zero], c.Seq[pos], c.Seq[neg]
	p := [3]complex128{
		i0 + i1 + i2,
		i0 + opA2*i1 + opA*i2,
		i0 + opA*i1 + opA2*i2,
	}
	scale := cmplx.Abs(i0) + cmplx.Abs(i1) + cmplx.Abs(i2)
	for k := range p {
		if cmplx.Abs(p[k]) < cancelShare*scale {
			p[k] = 0
		}
	}
	return p
}

// cancelShare is the share of the sequence currents below which a phase
// current is what their cancellation leaves in floating point: a few
// thousand times the unit rounding error, the tolerance the sparse
// factorization also works to.
const cancelShare = 1e-12

// PhaseMaxA returns the largest of |Ia|, |Ib|, |Ic|: the current a phase
// overcurrent element responds to.
func (c Currents) PhaseMaxA() float64 {
	p := c.Phases()
	return math.Max(cmplx.Abs(p[0]), math.Max(cmplx.Abs(p[1]), cmplx.Abs(p[2])))
}

// Residual returns Ia+Ib+Ic = 3I0.
func (c Currents) Residual() complex128 { return 3 * c.Seq[zero] }

// ResidualA returns |3I0|: the current a residual (ground) element
// responds to.
func (c Currents) ResidualA() float64 { return cmplx.Abs(c.Residual()) }
