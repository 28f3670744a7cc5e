package study

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"

	"tripgrade/coord"
	"tripgrade/coord/study/internal/tomltext"
	"tripgrade/curves"
	"tripgrade/faults"
)

// Size limits, checked before anything is decoded: a study of 150,000
// buses is about 128 MiB of TOML (package gen writes 42 MiB for 50,000),
// and a settings table of 32 MiB holds some 400,000 stages. Lists and
// inline tables nest at most maxNesting deep; a study needs three.
const (
	MaxStudyBytes = tomltext.DefaultMaxBytes
	MaxTableBytes = 32 << 20
	maxNesting    = 16
)

// Load reads and checks the study file at path. Files it refers to (a
// settings table) are found relative to the study's folder, as a user
// typing a path expects: "settings.csv", "../relays/settings.csv" and
// absolute paths all work. The error, when not nil, is an ErrorList with
// every problem found, or the error of reading the file.
func Load(path string) (*coord.Study, error) {
	src, err := readLimited(path, MaxStudyBytes)
	if err != nil {
		var tl *tooLarge
		if errors.As(err, &tl) {
			return nil, ErrorList{{File: path, Line: 1, Msg: tl.Error()}}
		}
		return nil, err
	}
	return Parse(path, src, folder(filepath.Dir(path)))
}

// tooLarge reports a file beyond its size limit.
type tooLarge struct{ size, limit int64 }

func (e *tooLarge) Error() string {
	return fmt.Sprintf("the file is %s, more than the %s tripgrade reads (is it the right file?)", mib(e.size), mib(e.limit))
}

func mib(n int64) string {
	if n >= 1<<20 {
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	}
	return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
}

// readLimited reads a file of at most limit bytes, refusing a larger one
// before reading it (a special file's size shows only while reading).
func readLimited(path string, limit int64) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	if info, err := f.Stat(); err == nil && info.Mode().IsRegular() && info.Size() > limit {
		return nil, &tooLarge{info.Size(), limit}
	}
	data, err := io.ReadAll(io.LimitReader(f, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(data)) > limit {
		return nil, &tooLarge{int64(len(data)), limit}
	}
	return data, nil
}

// folder is the file system of a study's folder on disk. Unlike os.DirFS
// it takes paths that leave the folder or are absolute, since a study's
// settings table may sit anywhere the user keeps it. It opens regular
// files only: a study naming a device or a pipe gets an error, not a
// stalled read.
type folder string

func (f folder) path(name string) string {
	if filepath.IsAbs(name) {
		return filepath.Clean(name)
	}
	return filepath.Join(string(f), filepath.FromSlash(name))
}

func (f folder) Open(name string) (fs.File, error) {
	p := f.path(name)
	info, err := os.Stat(p)
	if err != nil {
		return nil, err
	}
	if !info.Mode().IsRegular() {
		return nil, &fs.PathError{Op: "open", Path: p, Err: errNotRegular}
	}
	return os.Open(p)
}

func (f folder) Stat(name string) (fs.FileInfo, error) { return os.Stat(f.path(name)) }

var errNotRegular = errors.New("not a regular file")

// Parse checks a study given as text; name is used in messages and dir
// resolves the files the study refers to (nil: it may refer to none).
func Parse(name string, src []byte, dir fs.FS) (*coord.Study, error) {
	root, err := tomltext.Parse(src, tomltext.Limits{MaxBytes: MaxStudyBytes, MaxDepth: maxNesting})
	if err != nil {
		var te *tomltext.Error
		if errors.As(err, &te) {
			return nil, ErrorList{{File: name, Line: te.Line, Msg: "not valid TOML: " + te.Msg}}
		}
		return nil, ErrorList{{File: name, Msg: "not valid TOML: " + err.Error()}}
	}
	d := newDecoder(name, root)
	var raw rawFile
	d.table(root, "", "", &raw)
	b := newBuilder(d, &raw)
	b.st.Inputs = []coord.InputFile{coord.NewInputFile(name, src)}
	b.build(dir)
	defs := b.buildScenarios()
	b.acceptScenarios(defs)
	if len(b.errs) > 0 {
		return nil, b.errs.sorted(name)
	}
	if errs := b.scenarios(defs, dir); len(errs) > 0 {
		return nil, errs.sorted(name)
	}
	return b.st, nil
}

// newBuilder returns a builder of the tables raw, which d decoded.
func newBuilder(d *decoder, raw *rawFile) *builder {
	b := &builder{
		decoder:     d,
		raw:         raw,
		net:         &faults.Network{},
		st:          &coord.Study{},
		bus:         map[string]int{},
		branch:      map[string]int{},
		unit3:       map[string]int{},
		starPath:    map[string]string{},
		starOf:      map[string]starRef{},
		deviceSeen:  map[string]int{},
		branchBad:   map[int]bool{},
		badNames:    map[string]bool{},
		busRaw:      map[string]int{},
		branchPaths: map[string]string{},
	}
	b.st.Network = b.net
	return b
}

func (b *builder) build(dir fs.FS) {
	b.buildStudy()
	b.buildCriteria()
	b.buildBuses()
	b.buildSources()
	b.buildGenerators()
	b.buildLines()
	b.buildTransformers()
	b.buildTransformers3()
	b.buildUnits()
	b.buildMotors()
	b.buildEarthings()
	b.buildLoads()
	if len(b.raw.Sources) == 0 && len(b.raw.Generators) == 0 && !b.blamed["source"] && !b.blamed["generator"] {
		b.errorf(0, "", "the study has no [[source]] and no [[generator]]: nothing drives fault current")
	} else if !b.badRef && len(b.raw.Buses) > 0 && !b.unread("source", "generator", "line", "transformer", "transformer3") {
		b.checkTopology() // islands and loops would follow from a table that could not be read
	}
	b.buildRelays()
	b.buildFuses()
	if name := b.raw.Study.SettingsCSV; name != "" {
		b.readSettingsCSV(dir, name, b.lines.key("study", "settings_csv"))
	}
	for _, o := range b.relayRaw {
		d := &b.st.Devices[o.device]
		if len(d.Stages) == 0 && o.tomlStages == 0 && o.csvRows == 0 && !b.csvUnread {
			b.fail(o.where, "stage", "the relay has no stages: add [[relay.stage]] tables or rows in the settings table")
		}
		b.directional(o.where, o.raw, d)
		uniqueLabels(d)
		b.instantaneousTime(o.where, d)
	}
	b.ownProtection()
	b.buildPairs()
	b.buildAccepts()
}

// instantaneousTime makes every instantaneous stage of a relay operate in
// its intentional delay plus the relay's instantaneous operating time.
func (b *builder) instantaneousTime(w where, d *coord.Device) {
	for i := range d.Stages {
		st := &d.Stages[i]
		if st.Shape != curves.ShapeInstantaneous || st.Curve == nil {
			continue
		}
		c, err := curves.NewInstantaneous(st.PickupA, st.DelayS+d.InstantaneousTimeS)
		if err != nil {
			b.fail(w, "instantaneous_time_s", "stage %s: %v", st.Label, err)
			continue
		}
		st.Curve = c
	}
}

// uniqueLabels numbers stages that would otherwise share a label (two
// definite-time phase stages become 51DT-1 and 51DT-2).
func uniqueLabels(d *coord.Device) {
	count := map[string]int{}
	for _, s := range d.Stages {
		count[s.Label]++
	}
	seen := map[string]int{}
	for i := range d.Stages {
		l := d.Stages[i].Label
		if count[l] > 1 {
			seen[l]++
			d.Stages[i].Label = fmt.Sprintf("%s-%d", l, seen[l])
		}
	}
}

func (b *builder) buildStudy() {
	r := b.raw.Study
	w := where{path: "study", element: "[study]"}
	b.st.Name = r.Name
	if r.Name == "" {
		b.fail(w, "name", "name is missing (a title for the reports)")
	} else {
		b.readable(w, "name", r.Name)
	}
	if r.FrequencyHz != nil && *r.FrequencyHz != 50 && *r.FrequencyHz != 60 {
		b.fail(w, "frequency_hz", "frequency_hz must be 50 or 60 (got %g)", *r.FrequencyHz)
	}
	b.net.BaseMVA = b.optional(w, "base_mva", r.BaseMVA, 100, minBaseMVA, maxBaseMVA, false)
	if r.LVTolerancePct != nil {
		switch *r.LVTolerancePct {
		case 6:
		case 10:
			b.st.Faults.LVTolerance10 = true
		default:
			b.fail(w, "lv_tolerance_pct", "lv_tolerance_pct must be 6 or 10 (the IEC 60909-0 Table 1 low-voltage tolerances; got %g)", *r.LVTolerancePct)
		}
	}
	b.voltageFactors(w, r)
	b.st.Faults.EndTempC = b.optional(w, "conductor_end_temp_c", r.EndTempC, 0, 20, 400, false)
	b.st.Faults.MinTimeDelayS = b.optional(w, "min_time_delay_s", r.MinTimeDelayS, 0, 0.02, 10, false)
	for _, f := range r.LinePositions {
		if !(f > 0 && f < 1) {
			b.fail(w, "line_fault_positions", "line_fault_positions must lie strictly between 0 and 1 (got %g)", f)
		}
	}
	if r.LinePositions != nil {
		b.st.Faults.LineFractions = append([]float64{}, r.LinePositions...)
	}
}

func (b *builder) buildCriteria() {
	r := b.raw.Criteria
	w := where{path: "criteria", element: "[criteria]"}
	c := coord.DefaultCriteria()
	inf := math.Inf(1)
	c.MarginS = b.optional(w, "margin_s", r.MarginS, c.MarginS, 0, 5, true)
	c.MarginFuseS = b.optional(w, "margin_fuse_s", r.MarginFuseS, c.MarginFuseS, 0, 5, true)
	c.FuseMeltRatio = b.optional(w, "fuse_melt_ratio", r.FuseMeltRatio, c.FuseMeltRatio, 0, 1, true)
	if r.OvertravelS != nil || r.SafetyS != nil || r.CTErrorPct != nil {
		if r.MarginS != nil {
			b.fail(w, "margin_s", "give margin_s or its components (overtravel_s, safety_s, ct_error_pct), not both")
		}
		c.Components = &coord.MarginComponents{
			OvertravelS: b.optional(w, "overtravel_s", r.OvertravelS, 0, 0, 1, false),
			SafetyS:     b.optional(w, "safety_s", r.SafetyS, 0, 0, 2, false),
			CTErrorPct:  b.optional(w, "ct_error_pct", r.CTErrorPct, 0, 0, 50, false),
		}
	}
	c.WorstCaseTimes = boolOr(r.WorstCaseTimes, false)
	c.SensitivityPrimary = b.optional(w, "sensitivity_primary", r.SensitivityPrimary, c.SensitivityPrimary, 1, 100, false)
	c.SensitivityBackup = b.optional(w, "sensitivity_backup", r.SensitivityBackup, c.SensitivityBackup, 1, 100, false)
	c.LoadFactor = b.optional(w, "load_factor", r.LoadFactor, c.LoadFactor, 1, 100, false)
	c.InstantaneousFactor = b.optional(w, "instantaneous_factor", r.InstantaneousFactor, c.InstantaneousFactor, 1, 100, false)
	c.ShortDelayS = b.optional(w, "short_delay_s", r.ShortDelayS, c.ShortDelayS, 0, 10, false)
	c.InstantaneousTimeS = b.optional(w, "instantaneous_time_s", r.InstantaneousTimeS, c.InstantaneousTimeS, 0, 1, false)
	c.InrushMultiple = b.optional(w, "inrush_multiple", r.InrushMultiple, c.InrushMultiple, 1, 100, false)
	c.InrushTimeS = b.optional(w, "inrush_time_s", r.InrushTimeS, c.InrushTimeS, 0, 10, true)
	c.MaxClearingS = b.optional(w, "max_clearing_s", r.MaxClearingS, c.MaxClearingS, 0, 100, true)
	b.st.Criteria = c
	b.st.Faults.EarthFaultOhm = b.optional(w, "fault_resistance_ohm", r.FaultResistanceOhm, 0, 0, inf, false)
	b.st.Faults.EarthFaultOhmLV = b.optional(w, "lv_fault_resistance_ohm", r.LVFaultResistance, 0, 0, inf, false)
	b.st.Faults.PhaseFaultOhm = b.optional(w, "phase_fault_resistance_ohm", r.PhaseFaultOhm, 0, 0, inf, false)
	b.st.Faults.EarthFaultXOhm = b.optional(w, "fault_reactance_ohm", r.FaultReactanceOhm, 0, 0, inf, false)
	b.st.Faults.EarthFaultXOhmLV = b.optional(w, "lv_fault_reactance_ohm", r.LVFaultReactance, 0, 0, inf, false)
	b.st.Faults.PhaseFaultXOhm = b.optional(w, "phase_fault_reactance_ohm", r.PhaseFaultXOhm, 0, 0, inf, false)
}

// Plausible voltage factors: IEC 60909-0 Table 1 spans 0.90–1.10, and a
// prefault voltage outside 0.8–1.2 pu is not a network in service.
const (
	lowestVoltageFactor  = 0.8
	highestVoltageFactor = 1.2
)

// voltageFactors reads c_max and c_min, which replace the IEC 60909-0
// Table 1 factors at every voltage, and checks that the minimum case's
// factor does not exceed the maximum case's at any voltage.
func (b *builder) voltageFactors(w where, r rawStudy) {
	f := &b.st.Faults
	f.CMax = b.optional(w, "c_max", r.CMax, 0, lowestVoltageFactor, highestVoltageFactor, false)
	f.CMin = b.optional(w, "c_min", r.CMin, 0, lowestVoltageFactor, highestVoltageFactor, false)
	if f.CMax == 0 && f.CMin == 0 {
		return
	}
	for _, kv := range []float64{11, 0.4} { // one voltage on each side of Table 1's 1 kV boundary
		hi, lo := f.VoltageFactor(kv, faults.Max), f.VoltageFactor(kv, faults.Min)
		if lo > hi {
			side := "above 1 kV"
			if faults.LowVoltage(kv) {
				side = "up to 1 kV"
			}
			key := "c_min"
			if r.CMin == nil {
				key = "c_max"
			}
			b.fail(w, key, "c_min %g exceeds c_max %g %s: the minimum case would drive more current than the maximum case", lo, hi, side)
			return
		}
	}
}
