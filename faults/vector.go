package faults

import (
	"fmt"
	"strconv"
	"strings"
)

// Winding is the connection of one transformer winding.
type Winding uint8

// Winding connections.
const (
	Delta       Winding = iota // D, d
	Star                       // Y, y: star point not brought out or not earthed
	EarthedStar                // YN, yn: star point brought out for earthing
)

// VectorGroup is a two-winding transformer's connection in IEC 60076-1
// clock notation, e.g. Dyn11: HV delta, LV star with neutral, LV lagging
// the HV side by 11·30° (that is, leading by 30°).
type VectorGroup struct {
	HV, LV Winding
	Clock  int // 0..11
}

// ParseVectorGroup parses clock notation such as "Dyn11", "YNd1", "YNyn0",
// "Yy0" or "Dd0". Letters are case-insensitive; the clock number is
// required, because guessing a phase shift would silently move every
// current referred across the transformer.
func ParseVectorGroup(s string) (VectorGroup, error) {
	t := strings.ToLower(strings.TrimSpace(s))
	var g VectorGroup
	rest, hv, err := parseWinding(t)
	if err != nil {
		return g, fmt.Errorf("vector group %q: %v", s, err)
	}
	rest, lv, err := parseWinding(rest)
	if err != nil {
		return g, fmt.Errorf("vector group %q: %v", s, err)
	}
	if rest == "" {
		return g, fmt.Errorf("vector group %q: needs a clock number, e.g. %s11 or %s1", s, strings.TrimSpace(s), strings.TrimSpace(s))
	}
	h, err := strconv.Atoi(rest)
	if err != nil || h < 0 || h > 11 {
		return g, fmt.Errorf("vector group %q: clock number must be 0 to 11 (got %q)", s, rest)
	}
	g = VectorGroup{HV: hv, LV: lv, Clock: h}
	mixed := (hv == Delta) != (lv == Delta)
	if mixed && h%2 == 0 {
		return g, fmt.Errorf("vector group %q: a star–delta transformer has an odd clock number (1, 5, 7 or 11)", s)
	}
	if !mixed && h%2 == 1 {
		return g, fmt.Errorf("vector group %q: star–star and delta–delta transformers have an even clock number (0, 4, 6, 8)", s)
	}
	return g, nil
}

// parseWinding reads one winding's letters from the front of s.
func parseWinding(s string) (rest string, w Winding, err error) {
	switch {
	case strings.HasPrefix(s, "d"):
		return s[1:], Delta, nil
	case strings.HasPrefix(s, "yn"):
		return s[2:], EarthedStar, nil
	case strings.HasPrefix(s, "y"):
		return s[1:], Star, nil
	case strings.HasPrefix(s, "z"):
		return s, 0, fmt.Errorf("zig-zag windings are not supported in a two-winding transformer; model a zig-zag earthing transformer as an earthing element")
	case s == "":
		return s, 0, fmt.Errorf("missing winding letters (D, Y or YN for each side)")
	}
	return s, 0, fmt.Errorf("unknown winding letter %q (want D, Y or YN)", s[:1])
}

// String returns the group in conventional notation, e.g. "Dyn11".
func (g VectorGroup) String() string {
	up := [...]string{Delta: "D", Star: "Y", EarthedStar: "YN"}
	lo := [...]string{Delta: "d", Star: "y", EarthedStar: "yn"}
	return up[g.HV] + lo[g.LV] + strconv.Itoa(g.Clock)
}

// ShiftDeg returns the positive-sequence phase shift in degrees of the LV
// side relative to the HV side: −30° per clock hour, normalised to
// (−180°, 180°]. Dyn11 gives +30° (LV leads), Dyn1 gives −30°.
func (g VectorGroup) ShiftDeg() float64 {
	d := -30 * float64(g.Clock)
	for d <= -180 {
		d += 360
	}
	return d
}
