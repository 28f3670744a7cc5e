package curves

import "fmt"

// StageSettings describe one relay stage as a user gives it: a shape and
// the settings that shape takes. Zero means "not given" for every
// optional field. NewStage turns it into a Characteristic.
type StageSettings struct {
	Shape   Shape
	PickupA float64 // primary amperes
	// Multiplier is the TMS (IEC forms) or TD (IEEE forms) of an inverse
	// shape; required for them, not allowed for the others.
	Multiplier float64
	// DelayS is the delay of a definite-time stage or the optional
	// intentional delay of an instantaneous stage (0 allowed for both);
	// not allowed for inverse shapes.
	DelayS float64
	// MaxMultiple and MinTimeS are InverseTime's optional limits.
	MaxMultiple float64
	MinTimeS    float64
	// Law holds the constants of a user-defined shape (build it with
	// IECLaw or IEEELaw); it must be zero for the other shapes.
	Law Law
}

// NewStage returns the stage the settings describe: an InverseTime for
// inverse shapes, a DefiniteTime or an Instantaneous. It reports every
// setting that is missing, out of range, or does not apply to the shape.
func NewStage(s StageSettings) (Characteristic, error) {
	if !s.Shape.valid() {
		return nil, fmt.Errorf("stage shape is not set (got %s)", s.Shape)
	}
	var k checker
	notFor := func(setting string, v float64) {
		if v != 0 {
			k.add(fmt.Errorf("%s does not apply to the %s shape (got %s)", setting, s.Shape, formatValue(v)))
		}
	}
	if !s.Shape.UserDefined() && s.Law != (Law{}) {
		k.add(fmt.Errorf("user constants apply to the iec-user and ieee-user shapes only (shape %s)", s.Shape))
	}
	if !s.Shape.Dependent() {
		notFor("multiplier", s.Multiplier)
		notFor("max multiple", s.MaxMultiple)
		notFor("min time", s.MinTimeS)
		k.add(validateFixed(s.PickupA, s.DelayS))
		if err := k.err(); err != nil {
			return nil, err
		}
		if s.Shape == ShapeDefinite {
			return DefiniteTime{PickupA: s.PickupA, DelayS: s.DelayS}, nil
		}
		return Instantaneous{PickupA: s.PickupA, DelayS: s.DelayS}, nil
	}
	notFor("delay", s.DelayS)
	law, std := s.Shape.Law()
	if !std {
		law = s.Law
		if law == (Law{}) {
			k.add(fmt.Errorf("the %s shape needs its constants", s.Shape))
		}
	}
	c := InverseTime{Law: law, PickupA: s.PickupA, Multiplier: s.Multiplier,
		MaxMultiple: s.MaxMultiple, MinTimeS: s.MinTimeS}
	if law != (Law{}) {
		k.add(law.Validate())
	}
	k.add(c.validateSettings(s.Shape.MultiplierName()))
	if err := k.err(); err != nil {
		return nil, err
	}
	return c, nil
}
