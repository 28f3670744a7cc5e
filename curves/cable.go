package curves

import (
	"fmt"
	"math"
	"strings"
)

// I2tLimit is a withstand curve I²t = constant: Time is how long the
// equipment withstands a current, I2tA2S/I². When MaxTimeS is not 0 the
// curve is valid only up to that time and Undefined at currents that
// would give more (the adiabatic assumption of a cable fails beyond a few
// seconds).
type I2tLimit struct {
	I2tA2S   float64 // the let-through limit, A²s
	MaxTimeS float64 // 0 = no validity limit
}

var _ Characteristic = I2tLimit{}

// NewI2tLimit returns a generic I²t withstand curve; i2tA2S must be > 0
// and maxTimeS >= 0 (0 = no limit).
func NewI2tLimit(i2tA2S, maxTimeS float64) (I2tLimit, error) {
	var k checker
	k.positive("I²t", "A²s", i2tA2S)
	k.nonNegative("validity limit", "s", maxTimeS)
	if err := k.err(); err != nil {
		return I2tLimit{}, err
	}
	return I2tLimit{I2tA2S: i2tA2S, MaxTimeS: maxTimeS}, nil
}

// Time returns I2tA2S/currentA², Undefined beyond MaxTimeS, at zero
// current, or for a NaN or negative current.
func (l I2tLimit) Time(currentA float64) (float64, Status) {
	if badCurrent(currentA) || currentA == 0 {
		return undefined()
	}
	t := l.I2tA2S / (currentA * currentA)
	if l.MaxTimeS > 0 && t > l.MaxTimeS {
		// Compare currents, not times, so that the start of Span is
		// inside the curve despite rounding; the time there is the limit.
		if lo, _ := l.Span(); currentA < lo {
			return undefined()
		}
		t = l.MaxTimeS
	}
	return t, Operates
}

// Span returns the current at which the time reaches MaxTimeS (0 without
// a limit) and +Inf.
func (l I2tLimit) Span() (float64, float64) {
	if l.MaxTimeS == 0 {
		return 0, math.Inf(1)
	}
	return math.Sqrt(l.I2tA2S / l.MaxTimeS), math.Inf(1)
}

// CurrentFor returns the lowest current whose withstand time is at most
// timeS: sqrt(I²t/timeS), or the start of the span when timeS is beyond
// MaxTimeS. Undefined for a timeS that is not > 0.
func (l I2tLimit) CurrentFor(timeS float64) (float64, Status) {
	if !(timeS > 0) {
		return undefined()
	}
	if l.MaxTimeS > 0 && timeS > l.MaxTimeS {
		timeS = l.MaxTimeS
	}
	return math.Sqrt(l.I2tA2S / timeS), Operates
}

// Material is a conductor material.
type Material uint8

// The conductor materials with adiabatic constants.
const (
	Copper    Material = iota + 1 // "cu"
	Aluminium                     // "al"
)

// Insulation is a cable insulation, which sets the conductor's initial
// and final temperatures for a short circuit.
type Insulation uint8

// The insulations with tabulated k.
const (
	PVC  Insulation = iota + 1 // "pvc", thermoplastic 70 °C
	XLPE                       // "xlpe", cross-linked polyethylene 90 °C
	EPR                        // "epr", ethylene propylene rubber 90 °C
)

// materialInfo holds the IEC 60949 constants of a conductor: K in
// A·s½/mm² and the reciprocal of the temperature coefficient of
// resistance at 0 °C, β in kelvin.
type materialInfo struct {
	name, alias string
	kConst      float64
	betaK       float64
}

// IEC 60949, adiabatic equation I²t = K²S²·ln((θf+β)/(θi+β)) constants:
// copper K = 226, β = 234.5; aluminium K = 148, β = 228.
var materials = [...]materialInfo{
	Copper:    {"cu", "copper", 226, 234.5},
	Aluminium: {"al", "aluminium", 148, 228},
}

// insulationInfo holds the temperatures of an insulation (IEC 60364-5-54
// Table A.54: PVC 70 → 160 °C, up to 300 mm²; XLPE and EPR 90 → 250 °C),
// and the tabulated k in A·s½/mm² for copper and aluminium.
type insulationInfo struct {
	name                string
	initialC, finalC    float64
	maxAreaMM2          float64 // 0 = no limit
	kCopper, kAluminium float64
}

var insulations = [...]insulationInfo{
	PVC:  {"pvc", 70, 160, 300, 115, 76},
	XLPE: {"xlpe", 90, 250, 0, 143, 94},
	EPR:  {"epr", 90, 250, 0, 143, 94},
}

// cableMaxTimeS is the validity limit of the adiabatic equation for
// short circuits in IEC 60364-4-43 and IEC 60364-5-54: up to 5 s.
const cableMaxTimeS = 5

// ParseMaterial accepts "cu", "copper", "al", "aluminium" or "aluminum",
// in any case.
func ParseMaterial(name string) (Material, error) {
	key := strings.ToLower(strings.TrimSpace(name))
	if key == "aluminum" {
		key = "al"
	}
	for m := Copper; m <= Aluminium; m++ {
		if key == materials[m].name || key == materials[m].alias {
			return m, nil
		}
	}
	return 0, fmt.Errorf("unknown conductor material %q (accepted: cu, al)", name)
}

// String returns the short name ParseMaterial accepts.
func (m Material) String() string {
	if m < Copper || m > Aluminium {
		return fmt.Sprintf("Material(%d)", uint8(m))
	}
	return materials[m].name
}

// ParseInsulation accepts "pvc", "xlpe" or "epr", in any case.
func ParseInsulation(name string) (Insulation, error) {
	key := strings.ToLower(strings.TrimSpace(name))
	for i := PVC; i <= EPR; i++ {
		if key == insulations[i].name {
			return i, nil
		}
	}
	return 0, fmt.Errorf("unknown cable insulation %q (accepted: pvc, xlpe, epr)", name)
}

// String returns the name ParseInsulation accepts.
func (i Insulation) String() string {
	if i < PVC || i > EPR {
		return fmt.Sprintf("Insulation(%d)", uint8(i))
	}
	return insulations[i].name
}

// KFactor returns the tabulated k of IEC 60364-5-54 Table A.54 for the
// material and insulation, in A·s½/mm²: PVC copper 115, aluminium 76;
// XLPE or EPR copper 143, aluminium 94.
func KFactor(m Material, ins Insulation) (float64, error) {
	if m < Copper || m > Aluminium || ins < PVC || ins > EPR {
		return 0, fmt.Errorf("no k for material %s with insulation %s", m, ins)
	}
	if m == Copper {
		return insulations[ins].kCopper, nil
	}
	return insulations[ins].kAluminium, nil
}

// AdiabaticK returns k = K·sqrt(ln((θf+β)/(θi+β))) of IEC 60949 for the
// material between the initial and final conductor temperatures in °C.
func AdiabaticK(m Material, initialC, finalC float64) (float64, error) {
	if m < Copper || m > Aluminium {
		return 0, fmt.Errorf("unknown conductor material %s", m)
	}
	mi := materials[m]
	var k checker
	if k.finite("initial temperature", initialC) && !(initialC+mi.betaK > 0) {
		k.fail("initial temperature", "> "+formatValue(-mi.betaK), "°C", initialC)
	}
	if k.finite("final temperature", finalC) && !(finalC > initialC) {
		k.fail("final temperature", "above the initial "+formatValue(initialC), "°C", finalC)
	}
	if err := k.err(); err != nil {
		return 0, err
	}
	return mi.kConst * math.Sqrt(math.Log((finalC+mi.betaK)/(initialC+mi.betaK))), nil
}

// NewCableWithstand returns the adiabatic short-circuit withstand of a
// conductor of areaMM2 square millimetres, I²t = k²S² with the tabulated k
// (KFactor), valid up to 5 s. PVC's k holds up to 300 mm² only.
func NewCableWithstand(m Material, ins Insulation, areaMM2 float64) (I2tLimit, error) {
	kf, err := KFactor(m, ins)
	if err != nil {
		return I2tLimit{}, err
	}
	var k checker
	k.positive("conductor area", "mm²", areaMM2)
	if err := k.err(); err != nil {
		return I2tLimit{}, err
	}
	if limit := insulations[ins].maxAreaMM2; limit > 0 && areaMM2 > limit {
		return I2tLimit{}, fmt.Errorf("the tabulated k for %s holds up to %s mm² (got %s mm²)",
			ins, formatValue(limit), formatValue(areaMM2))
	}
	s := kf * areaMM2
	return I2tLimit{I2tA2S: s * s, MaxTimeS: cableMaxTimeS}, nil
}
