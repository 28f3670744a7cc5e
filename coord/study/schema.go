package study

// The raw schema: what a study file may contain, field by field, before
// any checking. Optional numbers are pointers so that "not given" and 0
// differ. The `key` tags are the file's key names; README.md documents
// them.

type rawFile struct {
	Study       rawStudy         `key:"study"`
	Criteria    rawCriteria      `key:"criteria"`
	Buses       []rawBus         `key:"bus"`
	Sources     []rawSource      `key:"source"`
	Generators  []rawGenerator   `key:"generator"`
	Motors      []rawMotor       `key:"motor"`
	Lines       []rawLine        `key:"line"`
	Transformer []rawTransformer `key:"transformer"`
	Transf3     []rawTransf3     `key:"transformer3"`
	Earthings   []rawEarthing    `key:"earthing"`
	Loads       []rawLoad        `key:"load"`
	Relays      []rawRelay       `key:"relay"`
	Fuses       []rawFuse        `key:"fuse"`
	Pairs       []rawPair        `key:"pair"`
	Accepts     []rawAccept      `key:"accept"`
	Switches    []rawSwitch      `key:"switch"`
	Scenarios   []rawScenario    `key:"scenario"`
}

type rawStudy struct {
	Name           string    `key:"name"`
	FrequencyHz    *float64  `key:"frequency_hz"`
	BaseMVA        *float64  `key:"base_mva"`
	LVTolerancePct *float64  `key:"lv_tolerance_pct"`
	CMax           *float64  `key:"c_max"`
	CMin           *float64  `key:"c_min"`
	EndTempC       *float64  `key:"conductor_end_temp_c"`
	LinePositions  []float64 `key:"line_fault_positions"`
	SettingsCSV    string    `key:"settings_csv"`
	MinTimeDelayS  *float64  `key:"min_time_delay_s"`
	NMinus1        []string  `key:"n_minus_1"`
}

type rawCriteria struct {
	MarginS             *float64 `key:"margin_s"`
	MarginFuseS         *float64 `key:"margin_fuse_s"`
	FuseMeltRatio       *float64 `key:"fuse_melt_ratio"`
	OvertravelS         *float64 `key:"overtravel_s"`
	SafetyS             *float64 `key:"safety_s"`
	CTErrorPct          *float64 `key:"ct_error_pct"`
	WorstCaseTimes      *bool    `key:"worst_case_times"`
	SensitivityPrimary  *float64 `key:"sensitivity_primary"`
	SensitivityBackup   *float64 `key:"sensitivity_backup"`
	LoadFactor          *float64 `key:"load_factor"`
	InstantaneousFactor *float64 `key:"instantaneous_factor"`
	ShortDelayS         *float64 `key:"short_delay_s"`
	InstantaneousTimeS  *float64 `key:"instantaneous_time_s"`
	FaultResistanceOhm  *float64 `key:"fault_resistance_ohm"`
	LVFaultResistance   *float64 `key:"lv_fault_resistance_ohm"`
	PhaseFaultOhm       *float64 `key:"phase_fault_resistance_ohm"`
	FaultReactanceOhm   *float64 `key:"fault_reactance_ohm"`
	LVFaultReactance    *float64 `key:"lv_fault_reactance_ohm"`
	PhaseFaultXOhm      *float64 `key:"phase_fault_reactance_ohm"`
	InrushMultiple      *float64 `key:"inrush_multiple"`
	InrushTimeS         *float64 `key:"inrush_time_s"`
	MaxClearingS        *float64 `key:"max_clearing_s"`
}

type rawBus struct {
	Name string   `key:"name"`
	KV   *float64 `key:"kv"`
}

type rawSource struct {
	Name     string   `key:"name"`
	Bus      string   `key:"bus"`
	SCMVAMax *float64 `key:"sc_mva_max"`
	SCMVAMin *float64 `key:"sc_mva_min"`
	XR       *float64 `key:"x_r"`
	XRMin    *float64 `key:"x_r_min"`
	R1OhmMax *float64 `key:"r1_ohm_max"`
	X1OhmMax *float64 `key:"x1_ohm_max"`
	R1OhmMin *float64 `key:"r1_ohm_min"`
	X1OhmMin *float64 `key:"x1_ohm_min"`
	Z0Z1     *float64 `key:"z0_z1"`
	X0R0     *float64 `key:"x0_r0"`
	R0OhmMax *float64 `key:"r0_ohm_max"`
	X0OhmMax *float64 `key:"x0_ohm_max"`
	R0OhmMin *float64 `key:"r0_ohm_min"`
	X0OhmMin *float64 `key:"x0_ohm_min"`
	Earthed  *bool    `key:"earthed"`
	OwnProt  *bool    `key:"own_protection"`
}

type rawGenerator struct {
	Name          string   `key:"name"`
	Bus           string   `key:"bus"`
	MVA           *float64 `key:"mva"`
	KV            *float64 `key:"kv"`
	XdPct         *float64 `key:"xd_pct"`
	X2Pct         *float64 `key:"x2_pct"`
	X0Pct         *float64 `key:"x0_pct"`
	RPct          *float64 `key:"r_pct"`
	ROhm          *float64 `key:"r_ohm"`
	PF            *float64 `key:"pf"`
	Earthed       *bool    `key:"earthed"`
	NeutralOhm    *float64 `key:"neutral_ohm"`
	NeutralXOhm   *float64 `key:"neutral_x_ohm"`
	InMax         *bool    `key:"in_max_case"`
	AlwaysRunning *bool    `key:"always_running"`
	OwnProt       *bool    `key:"own_protection"`
	// A power station unit: the generator's unit transformer and its taps.
	UnitTransformer string   `key:"unit_transformer"`
	OnLoadTaps      *bool    `key:"on_load_tap_changer"`
	TapPct          *float64 `key:"tap_pct"`
	PGPct           *float64 `key:"pg_pct"`
}

type rawMotor struct {
	Name          string   `key:"name"`
	Bus           string   `key:"bus"`
	MW            *float64 `key:"mw"`
	KV            *float64 `key:"kv"`
	PF            *float64 `key:"pf"`
	EfficiencyPct *float64 `key:"efficiency_pct"`
	ILRIrM        *float64 `key:"ilr_irm"`
	PolePairs     *float64 `key:"pole_pairs"`
	RX            *float64 `key:"r_x"`
	Count         *float64 `key:"count"`
}

type rawLine struct {
	Name       string   `key:"name"`
	From       string   `key:"from"`
	To         string   `key:"to"`
	Type       string   `key:"type"`
	LengthKM   *float64 `key:"length_km"`
	R1OhmPerKM *float64 `key:"r1_ohm_per_km"`
	X1OhmPerKM *float64 `key:"x1_ohm_per_km"`
	R0OhmPerKM *float64 `key:"r0_ohm_per_km"`
	X0OhmPerKM *float64 `key:"x0_ohm_per_km"`
	R1Ohm      *float64 `key:"r1_ohm"`
	X1Ohm      *float64 `key:"x1_ohm"`
	R0Ohm      *float64 `key:"r0_ohm"`
	X0Ohm      *float64 `key:"x0_ohm"`
	EndTempC   *float64 `key:"end_temp_c"`
	Conductor  string   `key:"conductor"`
	Insulation string   `key:"insulation"`
	SizeMM2    *float64 `key:"size_mm2"`
}

type rawTransformer struct {
	Name           string   `key:"name"`
	From           string   `key:"from"`
	To             string   `key:"to"`
	MVA            *float64 `key:"mva"`
	KVFrom         *float64 `key:"kv_from"`
	KVTo           *float64 `key:"kv_to"`
	ZPct           *float64 `key:"z_pct"`
	XR             *float64 `key:"x_r"`
	RPct           *float64 `key:"r_pct"`
	Z0Pct          *float64 `key:"z0_pct"`
	X0R0           *float64 `key:"x0_r0"`
	VectorGroup    string   `key:"vector_group"`
	NeutralOhmFrom *float64 `key:"neutral_ohm_from"`
	NeutralXFrom   *float64 `key:"neutral_x_ohm_from"`
	NeutralOhmTo   *float64 `key:"neutral_ohm_to"`
	NeutralXTo     *float64 `key:"neutral_x_ohm_to"`
	NoCorrection   *bool    `key:"no_kt_correction"`
	Category       *float64 `key:"damage_category"`
	FrequentFaults *bool    `key:"frequent_faults"`
}

// rawTransf3 is a three-winding transformer: a bus, rated voltage and
// neutral per winding (hv, mv, lv), and a short-circuit test per winding
// pair (hv_mv, hv_lv, mv_lv).
type rawTransf3 struct {
	Name         string   `key:"name"`
	HV           string   `key:"hv"`
	MV           string   `key:"mv"`
	LV           string   `key:"lv"`
	KVHV         *float64 `key:"kv_hv"`
	KVMV         *float64 `key:"kv_mv"`
	KVLV         *float64 `key:"kv_lv"`
	MVAHVMV      *float64 `key:"mva_hv_mv"`
	MVAHVLV      *float64 `key:"mva_hv_lv"`
	MVAMVLV      *float64 `key:"mva_mv_lv"`
	ZHVMV        *float64 `key:"z_hv_mv_pct"`
	ZHVLV        *float64 `key:"z_hv_lv_pct"`
	ZMVLV        *float64 `key:"z_mv_lv_pct"`
	RHVMV        *float64 `key:"r_hv_mv_pct"`
	RHVLV        *float64 `key:"r_hv_lv_pct"`
	RMVLV        *float64 `key:"r_mv_lv_pct"`
	Z0HVMV       *float64 `key:"z0_hv_mv_pct"`
	Z0HVLV       *float64 `key:"z0_hv_lv_pct"`
	Z0MVLV       *float64 `key:"z0_mv_lv_pct"`
	R0HVMV       *float64 `key:"r0_hv_mv_pct"`
	R0HVLV       *float64 `key:"r0_hv_lv_pct"`
	R0MVLV       *float64 `key:"r0_mv_lv_pct"`
	VectorGroup  string   `key:"vector_group"`
	NeutralOhmHV *float64 `key:"neutral_ohm_hv"`
	NeutralXHV   *float64 `key:"neutral_x_ohm_hv"`
	NeutralOhmMV *float64 `key:"neutral_ohm_mv"`
	NeutralXMV   *float64 `key:"neutral_x_ohm_mv"`
	NeutralOhmLV *float64 `key:"neutral_ohm_lv"`
	NeutralXLV   *float64 `key:"neutral_x_ohm_lv"`
	NoCorrection *bool    `key:"no_kt_correction"`
}

type rawEarthing struct {
	Name       string   `key:"name"`
	Bus        string   `key:"bus"`
	Kind       string   `key:"kind"`
	R0Ohm      *float64 `key:"r0_ohm"`
	X0Ohm      *float64 `key:"x0_ohm"`
	NeutralOhm *float64 `key:"neutral_ohm"`
	NeutralX   *float64 `key:"neutral_x_ohm"`
}

type rawLoad struct {
	Name     string   `key:"name"`
	Bus      string   `key:"bus"`
	MVA      *float64 `key:"mva"`
	CurrentA *float64 `key:"current_a"`
}

type rawRelay struct {
	Name            string     `key:"name"`
	Branch          string     `key:"branch"`
	At              string     `key:"at"`
	CTPrimaryA      *float64   `key:"ct_primary_a"`
	CTSecondaryA    *float64   `key:"ct_secondary_a"`
	CTThermalFactor *float64   `key:"ct_thermal_factor"`
	CTClass         string     `key:"ct_class"`
	CTBurdenOhm     *float64   `key:"ct_burden_ohm"`
	BreakerS        *float64   `key:"breaker_s"`
	AccuracyPct     *float64   `key:"accuracy_class_pct"`
	AccuracyMinS    *float64   `key:"accuracy_min_s"`
	MaxLoadA        *float64   `key:"max_load_a"`
	InstTimeS       *float64   `key:"instantaneous_time_s"`
	MarginS         *float64   `key:"margin_s"`
	EarthFaultsBy   string     `key:"earth_faults_cleared_by"`
	Stages          []rawStage `key:"stage"`
	// Directional elements (see directional.go).
	PhaseAngleDeg    *float64 `key:"phase_angle_deg"`
	GroundAngleDeg   *float64 `key:"ground_angle_deg"`
	SectorDeg        *float64 `key:"sector_deg"`
	PhaseMinPct      *float64 `key:"phase_min_polarising_pct"`
	GroundMinPct     *float64 `key:"ground_min_polarising_pct"`
	VoltageMemory    *bool    `key:"voltage_memory"`
	GroundPolarising string   `key:"ground_polarising"`
	PolarisingBranch string   `key:"polarising_branch"`
	PolarisingAt     string   `key:"polarising_at"`
	PolarisingMinA   *float64 `key:"polarising_min_a"`
	NeutralCT        string   `key:"neutral_ct"`
	NeutralCTAt      string   `key:"neutral_ct_at"`
}

type rawStage struct {
	Label            string    `key:"label"`
	Measures         string    `key:"measures"`
	Direction        string    `key:"direction"`
	Curve            string    `key:"curve"`
	PickupA          *float64  `key:"pickup_a"`
	PickupSecondaryA *float64  `key:"pickup_secondary_a"`
	TMS              *float64  `key:"tms"`
	TD               *float64  `key:"td"`
	DelayS           *float64  `key:"delay_s"`
	MaxMultiple      *float64  `key:"max_multiple"`
	MinTimeS         *float64  `key:"min_time_s"`
	K                *float64  `key:"k"`
	Alpha            *float64  `key:"alpha"`
	C                *float64  `key:"c"`
	A                *float64  `key:"a"`
	B                *float64  `key:"b"`
	P                *float64  `key:"p"`
	TR               *float64  `key:"tr"`
	PickupRangeA     []float64 `key:"pickup_range_a"`
	PickupRangeSecA  []float64 `key:"pickup_range_secondary_a"`
	MultiplierRange  []float64 `key:"multiplier_range"`
}

type rawFuse struct {
	Name    string       `key:"name"`
	Branch  string       `key:"branch"`
	At      string       `key:"at"`
	RatingA *float64     `key:"rating_a"`
	Melt    [][2]float64 `key:"melt"`
	Clear   [][2]float64 `key:"clear"`
	// EarthFaultsBy is as for a relay.
	EarthFaultsBy string `key:"earth_faults_cleared_by"`
}

type rawPair struct {
	Upstream   string   `key:"upstream"`
	Downstream string   `key:"downstream"`
	Exclude    *bool    `key:"exclude"`
	MarginS    *float64 `key:"margin_s"`
}
