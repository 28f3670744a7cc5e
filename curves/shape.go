package curves

import (
	"fmt"
	"strings"
)

// Shape is a named standard characteristic parsed once from user text.
// The zero Shape is not a valid shape; ParseShape never returns it.
type Shape uint8

// The shapes a stage can have. Names in comments are what ParseShape
// accepts and String returns.
const (
	ShapeIECSI         Shape = iota + 1 // "iec-si": IEC 60255-151 standard inverse
	ShapeIECVI                          // "iec-vi": IEC 60255-151 very inverse
	ShapeIECEI                          // "iec-ei": IEC 60255-151 extremely inverse
	ShapeIECLTI                         // "iec-lti": long-time inverse (BS 142 / IEC 60255-3)
	ShapeIEEEMI                         // "ieee-mi": IEEE C37.112 moderately inverse
	ShapeIEEEVI                         // "ieee-vi": IEEE C37.112 very inverse
	ShapeIEEEEI                         // "ieee-ei": IEEE C37.112 extremely inverse
	ShapeDefinite                       // "definite": definite time (50/51 DT)
	ShapeInstantaneous                  // "instantaneous": instantaneous (50), optional fixed delay
	ShapeIECUser                        // "iec-user": IEC form with the user's k, α, c
	ShapeIEEEUser                       // "ieee-user": IEEE form with the user's A, B, p, tr
)

// form is the family of equation or behaviour behind a shape.
type form uint8

const (
	formIEC  form = iota + 1 // inverse, multiplier called TMS
	formIEEE                 // inverse, multiplier called TD
	formDefinite
	formInstantaneous
)

// shapeInfo is one row of the shape table.
type shapeInfo struct {
	name  string
	title string
	form  form
	law   Law  // the constants, for standard inverse shapes
	std   bool // law holds the standard constants
}

// shapeTable is indexed by Shape; row 0 is the invalid zero Shape.
var shapeTable = [...]shapeInfo{
	ShapeIECSI:         {"iec-si", "IEC 60255-151 standard inverse", formIEC, lawIECSI, true},
	ShapeIECVI:         {"iec-vi", "IEC 60255-151 very inverse", formIEC, lawIECVI, true},
	ShapeIECEI:         {"iec-ei", "IEC 60255-151 extremely inverse", formIEC, lawIECEI, true},
	ShapeIECLTI:        {"iec-lti", "long-time inverse (BS 142 / IEC 60255-3)", formIEC, lawIECLTI, true},
	ShapeIEEEMI:        {"ieee-mi", "IEEE C37.112 moderately inverse", formIEEE, lawIEEEMI, true},
	ShapeIEEEVI:        {"ieee-vi", "IEEE C37.112 very inverse", formIEEE, lawIEEEVI, true},
	ShapeIEEEEI:        {"ieee-ei", "IEEE C37.112 extremely inverse", formIEEE, lawIEEEEI, true},
	ShapeDefinite:      {"definite", "definite time", formDefinite, Law{}, false},
	ShapeInstantaneous: {"instantaneous", "instantaneous", formInstantaneous, Law{}, false},
	ShapeIECUser:       {"iec-user", "user-defined IEC-form inverse", formIEC, Law{}, false},
	ShapeIEEEUser:      {"ieee-user", "user-defined IEEE-form inverse", formIEEE, Law{}, false},
}

func (s Shape) valid() bool { return s > 0 && int(s) < len(shapeTable) }

func (s Shape) info() shapeInfo {
	if !s.valid() {
		return shapeInfo{}
	}
	return shapeTable[s]
}

// Shapes returns every valid shape in a fixed order.
func Shapes() []Shape {
	out := make([]Shape, 0, len(shapeTable)-1)
	for s := Shape(1); s.valid(); s++ {
		out = append(out, s)
	}
	return out
}

// ParseShape returns the shape with the given name. Case and surrounding
// spaces are ignored. The error lists the accepted names.
func ParseShape(name string) (Shape, error) {
	key := strings.ToLower(strings.TrimSpace(name))
	for _, s := range Shapes() {
		if shapeTable[s].name == key {
			return s, nil
		}
	}
	names := make([]string, 0, len(shapeTable)-1)
	for _, s := range Shapes() {
		names = append(names, shapeTable[s].name)
	}
	return 0, fmt.Errorf("unknown shape %q (accepted: %s)", name, strings.Join(names, ", "))
}

// String returns the name ParseShape accepts.
func (s Shape) String() string {
	if !s.valid() {
		return fmt.Sprintf("Shape(%d)", uint8(s))
	}
	return shapeTable[s].name
}

// Description returns a title for reports and plot legends, e.g.
// "IEC 60255-151 very inverse".
func (s Shape) Description() string {
	if !s.valid() {
		return s.String()
	}
	return shapeTable[s].title
}

// Law returns the constants for an inverse shape; false for
// definite/instantaneous/user shapes.
func (s Shape) Law() (Law, bool) {
	i := s.info()
	return i.law, i.std
}

// Dependent reports whether the shape is an inverse-time (dependent-time)
// shape, standard or user-defined, and so takes a multiplier.
func (s Shape) Dependent() bool {
	f := s.info().form
	return f == formIEC || f == formIEEE
}

// UserDefined reports whether the shape needs the user's constants.
func (s Shape) UserDefined() bool { return s == ShapeIECUser || s == ShapeIEEEUser }

// MultiplierName returns what the multiplier is called for this shape:
// "TMS" for IEC forms, "TD" for IEEE forms, "" for shapes without one.
func (s Shape) MultiplierName() string {
	switch s.info().form {
	case formIEC:
		return "TMS"
	case formIEEE:
		return "TD"
	}
	return ""
}
