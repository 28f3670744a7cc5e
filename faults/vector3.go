package faults

import (
	"fmt"
	"strconv"
	"strings"
)

// VectorGroup3 is a three-winding transformer's connection in IEC 60076-1
// clock notation, HV winding first and a clock number for each of the
// other two, e.g. YNyn0d5: HV star with neutral, MV star with neutral in
// phase with the HV side, LV delta lagging the HV side by 5·30°.
type VectorGroup3 struct {
	W     [3]Winding // connection of the HV, MV and LV winding
	Clock [3]int     // clock number of each winding against the HV side (Clock[HV] is 0)
}

// ParseVectorGroup3 parses three-winding clock notation such as
// "YNyn0d5", "YNd11d11" or "Yyn0d1". Letters are case-insensitive; a comma
// or space may separate the windings ("YNyn0,d5"); both clock numbers are
// required.
func ParseVectorGroup3(s string) (VectorGroup3, error) {
	var g VectorGroup3
	t := strings.ToLower(strings.TrimSpace(s))
	t = strings.NewReplacer(",", "", " ", "").Replace(t)
	rest, hv, err := parseWinding(t)
	if err != nil {
		return g, fmt.Errorf("vector group %q: %v", s, err)
	}
	g.W[HV] = hv
	for _, w := range []int{MV, LV} {
		var wd Winding
		rest, wd, err = parseWinding(rest)
		if err != nil {
			return g, fmt.Errorf("vector group %q: %s winding: %v", s, WindingName(w), err)
		}
		digits := 0
		for digits < len(rest) && rest[digits] >= '0' && rest[digits] <= '9' {
			digits++
		}
		if digits == 0 {
			return g, fmt.Errorf("vector group %q: the %s winding needs a clock number, e.g. YNyn0d5", s, WindingName(w))
		}
		h, _ := strconv.Atoi(rest[:digits])
		rest = rest[digits:]
		if h > 11 {
			return g, fmt.Errorf("vector group %q: clock number of the %s winding must be 0 to 11 (got %d)", s, WindingName(w), h)
		}
		mixed := (hv == Delta) != (wd == Delta)
		if mixed && h%2 == 0 {
			return g, fmt.Errorf("vector group %q: the %s winding is star–delta against the HV winding and needs an odd clock number (1, 5, 7 or 11)", s, WindingName(w))
		}
		if !mixed && h%2 == 1 {
			return g, fmt.Errorf("vector group %q: the %s winding is connected like the HV winding and needs an even clock number (0, 4, 6, 8)", s, WindingName(w))
		}
		g.W[w], g.Clock[w] = wd, h
	}
	if rest != "" {
		return g, fmt.Errorf("vector group %q: unexpected %q after the LV winding", s, rest)
	}
	return g, nil
}

// String returns the group in conventional notation, e.g. "YNyn0d5".
func (g VectorGroup3) String() string {
	up := [...]string{Delta: "D", Star: "Y", EarthedStar: "YN"}
	lo := [...]string{Delta: "d", Star: "y", EarthedStar: "yn"}
	return up[g.W[HV]] + lo[g.W[MV]] + strconv.Itoa(g.Clock[MV]) + lo[g.W[LV]] + strconv.Itoa(g.Clock[LV])
}

// ShiftDeg returns the positive-sequence phase shift in degrees of winding
// w relative to the HV winding, −30° per clock hour, normalised to
// (−180°, 180°] (the convention of VectorGroup.ShiftDeg).
func (g VectorGroup3) ShiftDeg(w int) float64 {
	return VectorGroup{Clock: g.Clock[w]}.ShiftDeg()
}
