package study

import (
	"fmt"
	"strconv"
)

// Physical limits. A figure beyond what any real network has is a typing
// mistake or a hostile file, and it must be refused at the file, with its
// line, before it reaches the fault engine, where 1e308 ohms or an X/R of
// 1e200 would overflow the arithmetic into results that are not numbers.
// Each limit sits well above the largest real value, so no real study
// meets it. The largest real values quoted in the reasons are from memory
// of manufacturers' catalogues and network data, not from one source.

// limit is the largest value a key may take, and why.
type limit struct {
	max float64
	why string
}

var (
	ohmLimit     = limit{1e6, "1 MΩ; the largest earthing resistors and Petersen coils are a few kΩ"}
	xrLimit      = limit{1e5, "real X/R ratios stay below about 150; larger ones stand for an element without resistance"}
	currentLimit = limit{1e6, "1 MA; the largest fault currents are about 300 kA"}
	mvaLimit     = limit{5000, "the largest transformers and generators are about 2000 MVA"}
	z0PctLimit   = limit{1000, "zero-sequence short-circuit impedances of transformers are of the order of the positive-sequence ones, well below 100 %"}
)

// limits holds the upper limit of each key of the study file and the
// settings table that has one. Keys whose checks carry their own range
// (percentages, factors, times) are not listed.
var limits = map[string]limit{
	"sc_mva_max":         {1e6, "the strongest transmission buses reach about 1e5 MVA; model a stiff source with 1e6 MVA or less"},
	"sc_mva_min":         {1e6, "the strongest transmission buses reach about 1e5 MVA; model a stiff source with 1e6 MVA or less"},
	"x_r":                xrLimit,
	"x_r_min":            xrLimit,
	"x0_r0":              xrLimit,
	"z0_z1":              {1e4, "even a high-resistance earthed source has Z0 within a few thousand times Z1"},
	"r1_ohm_max":         ohmLimit,
	"x1_ohm_max":         ohmLimit,
	"r1_ohm_min":         ohmLimit,
	"x1_ohm_min":         ohmLimit,
	"r0_ohm_max":         ohmLimit,
	"x0_ohm_max":         ohmLimit,
	"r0_ohm_min":         ohmLimit,
	"x0_ohm_min":         ohmLimit,
	"r1_ohm":             ohmLimit,
	"x1_ohm":             ohmLimit,
	"r0_ohm":             ohmLimit,
	"x0_ohm":             ohmLimit,
	"neutral_ohm":        ohmLimit,
	"neutral_x_ohm":      ohmLimit,
	"neutral_ohm_from":   ohmLimit,
	"neutral_x_ohm_from": ohmLimit,
	"neutral_ohm_to":     ohmLimit,
	"neutral_x_ohm_to":   ohmLimit,
	"neutral_ohm_hv":     ohmLimit,
	"neutral_x_ohm_hv":   ohmLimit,
	"neutral_ohm_mv":     ohmLimit,
	"neutral_x_ohm_mv":   ohmLimit,
	"neutral_ohm_lv":     ohmLimit,
	"neutral_x_ohm_lv":   ohmLimit,
	"r_ohm":              ohmLimit,
	"r1_ohm_per_km":      {1000, "a 1.5 mm² copper conductor has about 12 Ω/km"},
	"x1_ohm_per_km":      {1000, "a 1.5 mm² copper conductor has about 12 Ω/km"},
	"r0_ohm_per_km":      {1000, "a 1.5 mm² copper conductor has about 12 Ω/km"},
	"x0_ohm_per_km":      {1000, "a 1.5 mm² copper conductor has about 12 Ω/km"},
	"length_km":          {1e4, "10,000 km"},
	"size_mm2":           {1e4, "the largest cables are about 3000 mm²"},
	"mva":                mvaLimit,
	"mva_hv_mv":          mvaLimit,
	"mva_hv_lv":          mvaLimit,
	"mva_mv_lv":          mvaLimit,
	"mw":                 {5000, "the largest motors are rated about 100 MW"},
	"z0_hv_mv_pct":       z0PctLimit,
	"z0_hv_lv_pct":       z0PctLimit,
	"z0_mv_lv_pct":       z0PctLimit,
	"current_a":          currentLimit,
	"max_load_a":         currentLimit,
	"polarising_min_a":   currentLimit,
	"ct_primary_a":       {1e6, "the largest CTs are rated about 50 kA"},
	"ct_secondary_a":     {10, "CT secondaries are rated 1 A or 5 A"},
	"ct_burden_ohm":      {1000, "relay burdens are a few ohms"},
	"rating_a":           {1e5, "the largest fuses are rated a few kA"},
	"pickup_a":           currentLimit,
	"pickup_secondary_a": {1e4, "secondary pickups are a few hundred amperes at most"},
	"tms":                {100, "time multipliers end at about 1.5 (IEC) or 15 to 30 (IEEE time dials)"},
	"td":                 {100, "time multipliers end at about 1.5 (IEC) or 15 to 30 (IEEE time dials)"},
	"delay_s":            {100, "definite-time delays are seconds, rarely minutes"},
	"min_time_s":         {100, "definite-time delays are seconds, rarely minutes"},
	"max_multiple":       {1000, "inverse curves are defined up to about 20 to 30 times pickup"},
	"k":                  {1e4, "the standard laws use k up to 120 s"},
	"a":                  {1e4, "the standard laws use A up to 28.2 s"},
	"alpha":              {10, "the standard laws use exponents up to 2"},
	"p":                  {10, "the standard laws use exponents up to 2"},
	// Earth faults through more than 10 kΩ draw less current than any
	// overcurrent setting can see; "The 40-Ω ground-fault phenomenon"
	// (IEEE Trans. Industry Applications) discusses the usual 0–40 Ω.
	"fault_resistance_ohm":       {1e4, "10 kΩ; minimum-fault studies use 0 to 40 Ω, rarely a few hundred"},
	"lv_fault_resistance_ohm":    {1e4, "10 kΩ; minimum-fault studies use 0 to 40 Ω, rarely a few hundred"},
	"phase_fault_resistance_ohm": {1e4, "10 kΩ; arc resistances are a few ohms"},
	"fault_reactance_ohm":        {1e4, "10 kΩ; a fault's own impedance is mostly resistance, its reactance a few ohms at most"},
	"lv_fault_reactance_ohm":     {1e4, "10 kΩ; a fault's own impedance is mostly resistance, its reactance a few ohms at most"},
	"phase_fault_reactance_ohm":  {1e4, "10 kΩ; a fault's own impedance is mostly resistance, its reactance a few ohms at most"},
}

// Base power limits: per-unit arithmetic stays exact over this range
// whatever the network, so results do not depend on base_mva.
const (
	minBaseMVA = 0.001
	maxBaseMVA = 1e5
)

// CheckLimit reports a value of a study-file key beyond its physical
// limit, for other inputs of the same figures (the curve command's
// flags). Keys without a limit pass.
func CheckLimit(key string, v float64) error {
	if l, ok := limits[key]; ok && v > l.max {
		return fmt.Errorf("%s = %s is beyond any real value (at most %s: %s)", key, gText(v), gText(l.max), l.why)
	}
	return nil
}

// withinLimit reports a value beyond its key's limit as a problem of w.
func (b *builder) withinLimit(w where, key string, v float64) bool {
	if err := CheckLimit(key, v); err != nil {
		b.fail(w, key, "%v", err)
		return false
	}
	return true
}

func gText(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
