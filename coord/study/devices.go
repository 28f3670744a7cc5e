package study

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"tripgrade/coord"
	"tripgrade/curves"
	"tripgrade/faults"
)

// point resolves a device's branch and the end where it sits.
func (b *builder) point(w where, branch, at string) (faults.Point, bool) {
	if branch == "" {
		b.fail(w, "branch", "branch is missing (the line or transformer the device looks into)")
		return faults.Point{}, false
	}
	if k, ok := b.unit3[branch]; ok {
		return b.point3(w, branch, at, k)
	}
	k, ok := b.branch[branch]
	if !ok {
		if b.unread("line", "transformer", "transformer3") {
			return faults.Point{}, false // the branch may be in the table that could not be read
		}
		hint := ""
		if b.suggestions < maxSuggestions { // spare the copy when no suggestion is made
			known := make(map[string]int, len(b.branch)+len(b.unit3))
			for n, v := range b.branch {
				known[n] = v
			}
			for n, v := range b.unit3 {
				known[n] = v
			}
			hint = b.closest(branch, known)
		}
		b.fail(w, "branch", "branch = %q: no line or transformer of that name%s", branch, hint)
		return faults.Point{}, false
	}
	if b.branchBad[k] {
		return faults.Point{}, false // its ends are reported with the branch
	}
	// The ends as the file names them: with a closed switch two of them
	// may be one bus of the model, but a device sits at the end it says.
	fromName, toName := b.endNames[k][0], b.endNames[k][1]
	switch at {
	case "":
		b.fail(w, "at", "at is missing: the bus at the device's end of %q (%q or %q)", branch, fromName, toName)
	case fromName:
		return faults.Point{Branch: k, End: faults.From}, true
	case toName:
		return faults.Point{Branch: k, End: faults.To}, true
	default:
		b.fail(w, "at", "at = %q is not an end of %q (its ends are %q and %q)", at, branch, fromName, toName)
	}
	return faults.Point{}, false
}

func (b *builder) buildRelays() {
	for i, r := range b.raw.Relays {
		w := b.at("relay", i, r.Name)
		b.named(w, r.Name, b.deviceSeen, "relay or fuse")
		d := coord.Device{Name: r.Name, Kind: coord.Relay}
		d.Point, _ = b.point(w, r.Branch, r.At)
		d.CT = b.ct(w, r)
		d.BreakerS = b.optional(w, "breaker_s", r.BreakerS, 0, 0, 1, false)
		if r.AccuracyPct != nil || r.AccuracyMinS != nil {
			d.Accuracy = curves.Accuracy{
				ClassPct:  b.optional(w, "accuracy_class_pct", r.AccuracyPct, 0, 0, 50, true),
				MinErrorS: b.optional(w, "accuracy_min_s", r.AccuracyMinS, 0, 0, 1, false),
			}
			if r.AccuracyPct == nil {
				b.fail(w, "accuracy_min_s", "accuracy_min_s needs accuracy_class_pct too")
			}
		}
		d.MaxLoadA = b.optional(w, "max_load_a", r.MaxLoadA, 0, 0, math.Inf(1), true)
		d.InstantaneousTimeS = b.optional(w, "instantaneous_time_s", r.InstTimeS, b.st.Criteria.InstantaneousTimeS, 0, 1, false)
		d.MarginS = b.optional(w, "margin_s", r.MarginS, 0, 0, 5, true)
		d.EarthFaultsBy = b.declaration(w, r.EarthFaultsBy)
		for j, rs := range r.Stages {
			sw := where{path: w.path + ".stage[" + strconv.Itoa(j) + "]", element: w.element + " stage " + strconv.Itoa(j+1)}
			if st, ok := b.stage(sw, rs, d.CT); ok {
				d.Stages = append(d.Stages, st)
			}
		}
		b.st.Devices = append(b.st.Devices, d)
		b.relayRaw = append(b.relayRaw, relayOrigin{device: len(b.st.Devices) - 1, where: w, tomlStages: len(r.Stages), raw: r})
	}
}

// declaration checks the text of earth_faults_cleared_by: it names the
// protection a reviewer must find, so it may not be blank.
func (b *builder) declaration(w where, text string) string {
	t := strings.TrimSpace(text)
	if text != "" && t == "" {
		b.fail(w, "earth_faults_cleared_by", "earth_faults_cleared_by must name the protection that clears those earth faults (e.g. \"standby earth fault on the T1 neutral\")")
	}
	if !b.readable(w, "earth_faults_cleared_by", t) {
		return ""
	}
	return t
}

// relayOrigin remembers where a relay came from, for the settings table
// and the final "has no stages" check.
type relayOrigin struct {
	device     int
	where      where
	tomlStages int
	csvStages  int
	raw        rawRelay
	csvRows    int // rows of the settings table naming the relay, read or not
}

func (b *builder) ct(w where, r rawRelay) coord.CT {
	ct := coord.CT{
		PrimaryA:      b.positive(w, "ct_primary_a", r.CTPrimaryA),
		SecondaryA:    b.positive(w, "ct_secondary_a", r.CTSecondaryA),
		ThermalFactor: b.optional(w, "ct_thermal_factor", r.CTThermalFactor, 1, 1, 4, false),
	}
	if r.CTClass != "" {
		v, err := parseCClass(r.CTClass)
		if err != nil {
			b.fail(w, "ct_class", "%v", err)
		}
		ct.CClassV = v
		ct.BurdenOhm = b.positive(w, "ct_burden_ohm", r.CTBurdenOhm)
	} else if r.CTBurdenOhm != nil {
		b.fail(w, "ct_burden_ohm", "ct_burden_ohm needs ct_class (e.g. \"C200\") to be useful")
	}
	return ct
}

// parseCClass reads an IEEE C57.13 relaying accuracy class such as C200.
func parseCClass(s string) (float64, error) {
	t := strings.ToUpper(strings.TrimSpace(s))
	if len(t) < 2 || (t[0] != 'C' && t[0] != 'K' && t[0] != 'T') {
		return 0, fmt.Errorf("ct_class = %q: want an IEEE C57.13 class such as C100, C200, C400 or C800", s)
	}
	v, err := strconv.ParseFloat(t[1:], 64)
	if err != nil || !(v > 0) {
		return 0, fmt.Errorf("ct_class = %q: want an IEEE C57.13 class such as C100, C200, C400 or C800", s)
	}
	return v, nil
}

// stage converts one stage's settings.
func (b *builder) stage(w where, r rawStage, ct coord.CT) (coord.Stage, bool) {
	before := b.failures
	st := coord.Stage{Label: r.Label, Direction: b.direction(w, r.Direction)}
	if r.Label != "" {
		b.readable(w, "label", r.Label)
	}
	switch r.Measures {
	case "phase":
		st.Measures = coord.Phase
	case "ground":
		st.Measures = coord.Residual
	case "":
		b.fail(w, "measures", "measures is missing (phase or ground)")
	default:
		b.fail(w, "measures", "measures = %q: want phase or ground (ground measures the residual current 3I0)", r.Measures)
	}
	shape, err := curves.ParseShape(r.Curve)
	if r.Curve == "" {
		b.fail(w, "curve", "curve is missing")
	} else if err != nil {
		b.fail(w, "curve", "%v", err)
	}
	st.Shape = shape
	ratio := ct.PrimaryA / ct.SecondaryA
	if !(ratio > 0) || math.IsInf(ratio, 0) {
		// The CT is reported wrong; secondary amperes cannot be converted,
		// and what follows from that is not reported again.
		if r.PickupSecondaryA != nil || r.PickupRangeSecA != nil {
			b.failures++
			return st, false
		}
	}
	switch {
	case r.PickupA != nil && r.PickupSecondaryA != nil:
		b.fail(w, "pickup_a", "give pickup_a (primary) or pickup_secondary_a, not both")
	case r.PickupA != nil:
		st.PickupA = b.positive(w, "pickup_a", r.PickupA)
	case r.PickupSecondaryA != nil:
		st.PickupA = b.positive(w, "pickup_secondary_a", r.PickupSecondaryA) * ratio
	default:
		b.fail(w, "pickup_a", "pickup is missing: give pickup_a (primary amperes) or pickup_secondary_a")
	}
	st.PickupRange = b.rangeOf(w, "pickup_range_a", r.PickupRangeA, 1)
	if r.PickupRangeSecA != nil {
		if r.PickupRangeA != nil {
			b.fail(w, "pickup_range_secondary_a", "give pickup_range_a or pickup_range_secondary_a, not both")
		}
		st.PickupRange = b.rangeOf(w, "pickup_range_secondary_a", r.PickupRangeSecA, ratio)
	}
	st.MultiplierRange = b.rangeOf(w, "multiplier_range", r.MultiplierRange, 1)
	if b.failures > before || shape == 0 {
		return st, false
	}
	st.Curve, st.Multiplier, st.DelayS = b.characteristic(w, r, shape, st.PickupA)
	if st.Label == "" {
		st.Label = defaultLabel(st)
	}
	return st, b.failures == before
}

// characteristic checks which keys the shape takes, then builds the
// stage's curve from them.
func (b *builder) characteristic(w where, r rawStage, shape curves.Shape, pickupA float64) (curves.Characteristic, float64, float64) {
	set := curves.StageSettings{Shape: shape, PickupA: pickupA}
	before := b.failures
	if !shape.Dependent() {
		b.notFor(w, shape, given{"tms", r.TMS}, given{"td", r.TD}, given{"max_multiple", r.MaxMultiple}, given{"min_time_s", r.MinTimeS})
		b.noConstants(w, r, shape)
		if shape == curves.ShapeDefinite && r.DelayS == nil {
			b.fail(w, "delay_s", "a definite-time stage needs delay_s")
		}
		set.DelayS = b.optional(w, "delay_s", r.DelayS, 0, 0, 100, false)
	} else {
		if r.DelayS != nil {
			b.fail(w, "delay_s", "delay_s is for definite and instantaneous stages; an inverse stage takes tms or td")
		}
		if shape.UserDefined() {
			set.Law = b.userLaw(w, r, shape)
		} else {
			b.noConstants(w, r, shape)
		}
		switch {
		case r.TMS != nil && r.TD != nil:
			b.fail(w, "tms", "give tms or td, not both")
		case r.TMS != nil:
			set.Multiplier = b.positive(w, "tms", r.TMS)
		case r.TD != nil:
			set.Multiplier = b.positive(w, "td", r.TD)
		default:
			b.fail(w, "tms", "an inverse-time stage needs its time multiplier: tms (IEC) or td (IEEE)")
		}
		set.MaxMultiple = b.optional(w, "max_multiple", r.MaxMultiple, 0, 1, 1000, true)
		set.MinTimeS = b.optional(w, "min_time_s", r.MinTimeS, 0, 0, 100, false)
	}
	if b.failures > before {
		return nil, 0, 0
	}
	c, err := curves.NewStage(set)
	if err != nil {
		b.fail(w, "curve", "%v", err)
		return nil, 0, 0
	}
	return c, set.Multiplier, set.DelayS
}

// userLaw reads the constants of a user-defined inverse shape.
func (b *builder) userLaw(w where, r rawStage, shape curves.Shape) curves.Law {
	var law curves.Law
	var err error
	if shape == curves.ShapeIECUser {
		if r.A != nil || r.B != nil || r.P != nil || r.TR != nil {
			b.fail(w, "a", "%s takes the IEC constants k, alpha and c (a, b, p and tr are for ieee-user)", shape)
		}
		law, err = curves.IECLaw("iec-user", b.positive(w, "k", r.K), b.positive(w, "alpha", r.Alpha),
			b.optional(w, "c", r.C, 0, 0, 100, false))
	} else {
		if r.K != nil || r.Alpha != nil || r.C != nil {
			b.fail(w, "k", "%s takes the IEEE constants a, b, p and tr (k, alpha and c are for iec-user)", shape)
		}
		law, err = curves.IEEELaw("ieee-user", b.positive(w, "a", r.A), b.optional(w, "b", r.B, 0, 0, 100, false),
			b.positive(w, "p", r.P), b.optional(w, "tr", r.TR, 0, 0, 1000, false))
	}
	if err != nil {
		b.fail(w, "k", "%v", err)
	}
	return law
}

func (b *builder) noConstants(w where, r rawStage, shape curves.Shape) {
	b.notFor(w, shape, given{"k", r.K}, given{"alpha", r.Alpha}, given{"c", r.C},
		given{"a", r.A}, given{"b", r.B}, given{"p", r.P}, given{"tr", r.TR})
}

// given is an optional key of a stage and its value, nil when not given.
type given struct {
	key string
	v   *float64
}

// notFor reports keys given that the shape does not use.
func (b *builder) notFor(w where, shape curves.Shape, keys ...given) {
	for _, k := range keys {
		if k.v != nil {
			b.fail(w, k.key, "%s does not apply to a %s stage", k.key, shape)
		}
	}
}

// rangeOf reads [min, max, step] (step optional), scaled by k.
func (b *builder) rangeOf(w where, key string, v []float64, k float64) coord.Range {
	if v == nil {
		return coord.Range{}
	}
	if len(v) < 2 || len(v) > 3 {
		b.fail(w, key, "%s must be [min, max] or [min, max, step]", key)
		return coord.Range{}
	}
	r := coord.Range{Min: v[0] * k, Max: v[1] * k}
	if len(v) == 3 {
		r.Step = v[2] * k
	}
	if !(r.Min > 0) || r.Max < r.Min || r.Step < 0 {
		b.fail(w, key, "%s = %v: want 0 < min ≤ max and step ≥ 0", key, v)
		return coord.Range{}
	}
	return r
}

// defaultLabel gives a stage its IEEE C37.2 device number: 51 for an
// inverse-time overcurrent stage, 51DT for a definite-time one, 50 for an
// instantaneous stage, 67 for any directional stage, with N for a
// residual (ground) stage (51NDT, 67N).
func defaultLabel(s coord.Stage) string {
	l, suffix := "51", ""
	switch s.Shape {
	case curves.ShapeInstantaneous:
		l = "50"
	case curves.ShapeDefinite:
		suffix = "DT"
	}
	if s.Direction != coord.NonDirectional {
		l = "67"
	}
	if s.Measures == coord.Residual {
		l += "N"
	}
	return l + suffix
}
