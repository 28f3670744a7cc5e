package coord

import (
	"tripgrade/curves"
	"tripgrade/faults"
)

// Study is a validated study: the network, its protective devices, the
// equipment they protect and the criteria they are judged by. The study
// loader (package coord/study) builds it from a file; tests build it in
// code.
type Study struct {
	Name     string
	Network  *faults.Network
	Faults   faults.Settings
	Criteria Criteria
	Devices  []Device
	Loads    []Load
	// Equipment holds protected-equipment data per branch index (nil
	// entries for branches without any).
	Equipment []*Equipment
	// Pairs are the study's own additions to and exclusions from the
	// derived backup pairs.
	Pairs []PairRule
	// OwnProtection names the sources and generators whose own protection
	// (the supply's upstream protection, a machine's protection) removes
	// their infeed of a fault that no device of the study stands between,
	// within the maximum clearing time.
	OwnProtection []string
	// Notes are what the loader assumed where the input left a choice
	// (which separator a settings table uses, say), each naming its file
	// and line; reports print them so a reviewer sees them.
	Notes []string
	// Accepts are the study's [[accept]] entries: findings a reviewer has
	// accepted (see Accept).
	Accepts []Acceptance
	// Inputs are the files the study was read from, the study file first,
	// each with the digest of what was read.
	Inputs []InputFile
	// Scenarios are the study's operating configurations besides the one
	// it draws (its own [[scenario]] tables, then the N-1 sweep's
	// outages); ScenarioNotes say what the sweep left out and why.
	Scenarios     []Scenario
	ScenarioNotes []string
}

// Quantity is what a stage measures.
type Quantity uint8

// Stage quantities.
const (
	Phase    Quantity = iota // the largest phase current (50/51)
	Residual                 // the residual current 3I0 (50N/51N, "ground")
)

// String returns "phase" or "ground".
func (q Quantity) String() string {
	if q == Phase {
		return "phase"
	}
	return "ground"
}

// DeviceKind says whether a device is a relay-and-breaker or a fuse.
type DeviceKind uint8

// Device kinds.
const (
	Relay DeviceKind = iota
	Fuse
)

// String returns "relay" or "fuse".
func (k DeviceKind) String() string {
	if k == Relay {
		return "relay"
	}
	return "fuse"
}

// Device is a relay with its current transformer and breaker, or a fuse,
// at one end of a branch, looking into the branch.
type Device struct {
	Name  string
	Kind  DeviceKind
	Point faults.Point

	// Relay data.
	CT       CT
	BreakerS float64 // breaker interrupting time
	Stages   []Stage
	// Accuracy is the declared timing accuracy, zero when not declared.
	Accuracy curves.Accuracy
	// MaxLoadA is a declared maximum load current through the device; zero
	// means the sum of the loads beyond it.
	MaxLoadA float64
	// Dir holds the directional element settings its directional stages
	// share (unused when every stage is non-directional).
	Dir Directional
	// NeutralCT, when not nil, is the star-side end of a transformer whose
	// neutral current the relay's ground stages measure (standby earth
	// fault protection, 51N on a neutral CT) instead of the residual
	// current at the relay's own point.
	NeutralCT *faults.Point
	// EarthFaultsBy names the protection the study declares clears the
	// earth faults this device cannot see because they drive no residual
	// current through it (behind a delta winding: a standby earth-fault
	// relay on the LV neutral, restricted earth fault); "" when none. The
	// checks then leave those faults out and say they were not checked.
	EarthFaultsBy string
	// MarginS, when not 0, is the grading margin this relay asks of the
	// devices it backs up (a utility's incomer asking 0.4 s where 0.3 s
	// holds elsewhere), instead of the criteria's; a [[pair]] entry's own
	// margin comes first.
	MarginS float64
	// InstantaneousTimeS is the relay's own operating time for its
	// instantaneous stages (Criteria.InstantaneousTimeS unless the relay
	// gives one). Their Curve already includes it.
	InstantaneousTimeS float64

	// Fuse data.
	RatingA float64
	Melt    *curves.Table // minimum melting time
	Clear   *curves.Table // total clearing time
}

// CT is a current transformer.
type CT struct {
	PrimaryA, SecondaryA float64
	// ThermalFactor is the continuous thermal rating factor (1 when not
	// given): the highest continuous primary current is
	// ThermalFactor·PrimaryA.
	ThermalFactor float64
	// CClassV is the IEEE C57.13 C-class voltage rating (e.g. 200 for
	// C200), 0 when not given; BurdenOhm is the connected secondary burden.
	CClassV   float64
	BurdenOhm float64
}

// Stage is one protection stage of a relay.
type Stage struct {
	Label    string // e.g. "51", "50", "51N" (derived when the study gives none)
	Measures Quantity
	// Direction is the direction the stage trips in (67/67N when not
	// NonDirectional), judged by the relay's Directional elements.
	Direction  Direction
	Shape      curves.Shape
	PickupA    float64 // primary amperes
	Multiplier float64 // TMS or TD for inverse shapes
	DelayS     float64 // definite-time delay or instantaneous intentional delay, as set
	// Curve is the stage's characteristic in primary amperes: the time the
	// stage takes to operate. An instantaneous stage's curve operates in
	// DelayS plus the relay's InstantaneousTimeS.
	Curve curves.Characteristic
	// Declared setting ranges to audit against (zero Range: none declared).
	PickupRange     Range // in primary amperes
	MultiplierRange Range
}

// Instantaneous reports whether the stage is an instantaneous stage or a
// definite-time stage short enough to be graded as one (the checker's
// instantaneous-reach check applies to both).
func (s Stage) Instantaneous(shortS float64) bool {
	switch s.Shape {
	case curves.ShapeInstantaneous:
		return true
	case curves.ShapeDefinite:
		return s.DelayS <= shortS
	}
	return false
}

// Range is a settable range with a step; Step 0 means continuous.
type Range struct {
	Min, Max, Step float64
}

// Declared reports whether a range was given.
func (r Range) Declared() bool { return r.Max > 0 }

// Load is a load at a bus, for the load-margin check.
type Load struct {
	Name     string
	Bus      int
	CurrentA float64 // full-load current at the bus voltage
}

// Equipment is the protected-equipment data of a branch.
type Equipment struct {
	// Damage is a transformer's IEEE C57.109 through-fault withstand in
	// amperes of its From side ([0]) and of its To side ([1]); nil for
	// lines.
	Damage [2]curves.Characteristic
	// Category is the transformer's C57.109 category (0 for lines).
	Category curves.Category
	// RatedA is a transformer's rated current on its From and To sides.
	RatedA [2]float64
	// Cable is a cable's adiabatic short-circuit withstand (nil when the
	// study gives no conductor data).
	Cable curves.Characteristic
}

// PairRule adds or removes a backup pair by hand, or sets the margin of
// one.
type PairRule struct {
	Upstream, Downstream string
	Exclude              bool
	// MarginS, when not 0, is the grading margin required of this pair
	// (relay over relay or relay over fuse), instead of the criteria's.
	MarginS float64
}

// DeviceBus returns the bus where device d sits.
func DeviceBus(n *faults.Network, d Device) int {
	from, to := n.BranchEnds(d.Point.Branch)
	if d.Point.End == faults.From {
		return from
	}
	return to
}
