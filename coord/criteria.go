package coord

// Criteria are the figures the checks compare against. Use
// DefaultCriteria for the documented defaults; the study loader starts
// from them and overrides what the file gives.
type Criteria struct {
	// MarginS is the required grading margin between two relays. By
	// convention it already includes the downstream breaker's interrupting
	// time, relay overtravel, timing errors and a safety margin
	// (Blackburn & Domin §12.3.4: 0.2–0.5 s used, 0.3 s frequent).
	MarginS float64
	// MarginFuseS is the required margin of a relay over a downstream fuse,
	// measured from the fuse's total clearing time (IEEE Std 242 ch. 15,
	// from memory: about 0.12–0.22 s).
	MarginFuseS float64
	// FuseMeltRatio: an upstream fuse must not melt before the downstream
	// device has cleared; the downstream clearing time may be at most this
	// fraction of the upstream minimum melting time (common practice 0.75).
	FuseMeltRatio float64

	// Components, when set, replace MarginS by the Network Protection &
	// Automation Guide ch. 9 form (from memory): required margin =
	// (2·E_R + E_CT)/100·t_D + t_CB + t_o + t_s, with E_R the downstream
	// relay's timing error class in %, E_CT the CT error in %, t_CB the
	// downstream breaker time, t_o the overtravel and t_s the safety margin.
	Components *MarginComponents

	// WorstCaseTimes grades on the tolerance band (upstream earliest time
	// against downstream latest time) for relays that declare an accuracy,
	// instead of on nominal times. Ignored with Components, which count the
	// tolerance in the required margin.
	WorstCaseTimes bool

	// SensitivityPrimary: minimum fault in a device's own zone / pickup
	// (common practice 1.5–2).
	SensitivityPrimary float64
	// SensitivityBackup: minimum fault at the far end of the next zone /
	// pickup (common practice 1.2–1.5).
	SensitivityBackup float64
	// LoadFactor: phase pickup / maximum load current (common practice
	// 1.25–1.5).
	LoadFactor float64
	// InstantaneousFactor: instantaneous pickup / maximum through-fault at
	// the remote end (common practice 1.25–1.3; the Network Protection &
	// Automation Guide's worked example uses 1.3).
	InstantaneousFactor float64
	// ShortDelayS: definite-time stages with a delay up to this are checked
	// for reach like instantaneous stages.
	ShortDelayS float64
	// InstantaneousTimeS is the operating time of instantaneous stages
	// (50, 50N), from fault inception to the trip output, for relays that
	// do not give their own: numerical relays' instantaneous elements
	// typically take one to two cycles (common practice: 0.02–0.04 s). It
	// is added to a stage's intentional delay, so that margins and
	// clearing times with an instantaneous stage are real times, not 0 s.
	InstantaneousTimeS float64
	// InrushMultiple and InrushTimeS place the transformer magnetising
	// inrush point (common practice 8–12 × full-load current for 0.1 s).
	InrushMultiple float64
	InrushTimeS    float64
	// MaxClearingS is the longest a fault may take to be cleared (every
	// breaker and fuse that isolates it open): 3 s, the longest of the
	// rated durations of short circuit IEC 62271-1 lists for switchgear
	// (1 s standard; 0.5, 2 and 3 s also used; from memory).
	MaxClearingS float64
}

// MarginComponents are the parts of a grading margin.
type MarginComponents struct {
	OvertravelS float64
	SafetyS     float64
	CTErrorPct  float64
}

// DefaultCriteria returns the documented defaults.
func DefaultCriteria() Criteria {
	return Criteria{
		MarginS:             0.3,
		MarginFuseS:         0.2,
		FuseMeltRatio:       0.75,
		SensitivityPrimary:  1.5,
		SensitivityBackup:   1.2,
		LoadFactor:          1.25,
		InstantaneousFactor: 1.25,
		ShortDelayS:         0.1,
		InstantaneousTimeS:  0.03,
		InrushMultiple:      12,
		InrushTimeS:         0.1,
		MaxClearingS:        3,
	}
}
