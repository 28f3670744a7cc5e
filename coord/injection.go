package coord

import (
	"fmt"
	"math"
	"sort"

	"tripgrade/curves"
)

// InjectionSettings choose the test currents of a commissioning sheet.
// The zero value is the default: 2, 5 and 10 times the setting for
// time-delayed stages, 1.2 times the setting for instantaneous ones.
type InjectionSettings struct {
	// Multiples of the setting for inverse and definite-time stages.
	Multiples []float64
	// InstantaneousMultiple of the setting for instantaneous stages.
	InstantaneousMultiple float64
}

// Default test currents. 2, 5 and 10 × setting are the multiples at
// which IEC 60255-151:2009 cl. 5.2 states the limiting error of a
// dependent-time stage (the factor changes at 5× and 10×); 1.2 × an
// instantaneous setting is common practice for proving it operates
// (a test current clearly above pickup, short of the CT's limits).
var (
	DefaultMultiples                     = []float64{2, 5, 10}
	DefaultInstantaneousMultiple float64 = 1.2
)

func (s InjectionSettings) norm() InjectionSettings {
	if len(s.Multiples) == 0 {
		s.Multiples = DefaultMultiples
	}
	if s.InstantaneousMultiple == 0 {
		s.InstantaneousMultiple = DefaultInstantaneousMultiple
	}
	return s
}

// Validate reports multiples that are not finite numbers above 1 (at or
// below the setting a stage does not operate).
func (s InjectionSettings) Validate() error {
	ms := append([]float64{}, s.Multiples...)
	if s.InstantaneousMultiple != 0 {
		ms = append(ms, s.InstantaneousMultiple)
	}
	for _, m := range ms {
		if !(m > 1) || math.IsInf(m, 0) {
			return fmt.Errorf("a test multiple must be a number above 1 (got %g): at or below the setting the stage does not operate", m)
		}
	}
	return nil
}

// StageInjections are the secondary-injection tests of one relay stage.
type StageInjections struct {
	Device int // index in Study.Devices
	Stage  int // index in the device's Stages
	// PickupSecondaryA is the setting in secondary amperes of the CT.
	PickupSecondaryA float64
	Points           []Injection
}

// Injection is one test current and what the relay must do at it.
type Injection struct {
	Multiple             float64 // of the stage's setting
	PrimaryA, SecondaryA float64
	// TimeS is the expected operating time of the stage alone (Status
	// Operates), without breaker time.
	TimeS  float64
	Status curves.Status
	// EarlyS and LateS bound the times the declared accuracy allows;
	// Banded is false when the relay declares no accuracy.
	EarlyS, LateS float64
	Banded        bool
	// Faster names the relay's other stages on the same quantity that
	// operate at this current no later than the stage under test: they
	// must be blocked (or their trip ignored) for this test.
	Faster []string
}

// Injections gives the test sheet of every stage of every relay of a
// study, or of the relay named device when it is not empty (an unknown
// name is an error). Fuses have none.
func Injections(s *Study, device string, set InjectionSettings) ([]StageInjections, error) {
	if err := set.Validate(); err != nil {
		return nil, err
	}
	set = set.norm()
	found := device == ""
	var out []StageInjections
	for i := range s.Devices {
		d := &s.Devices[i]
		if device != "" && d.Name != device {
			continue
		}
		found = true
		if d.Kind != Relay {
			if device != "" {
				return nil, fmt.Errorf("%q is a fuse: a test sheet is for relays", device)
			}
			continue
		}
		for k := range d.Stages {
			out = append(out, stageInjections(d, i, k, set))
		}
	}
	if !found {
		return nil, fmt.Errorf("no relay named %q", device)
	}
	return out, nil
}

func stageInjections(d *Device, i, k int, set InjectionSettings) StageInjections {
	st := d.Stages[k]
	ratio := d.CT.SecondaryA / d.CT.PrimaryA
	si := StageInjections{Device: i, Stage: k, PickupSecondaryA: st.PickupA * ratio}
	multiples := set.Multiples
	if st.Shape == curves.ShapeInstantaneous {
		multiples = []float64{set.InstantaneousMultiple}
	}
	var early, late curves.Characteristic
	banded := d.Accuracy != (curves.Accuracy{})
	if banded {
		early, late = curves.Banded(st.Curve, d.Accuracy)
	}
	for _, m := range multiples {
		a := m * st.PickupA
		p := Injection{Multiple: m, PrimaryA: a, SecondaryA: a * ratio, Banded: banded}
		p.TimeS, p.Status = st.Curve.Time(a)
		if banded && p.Status == curves.Operates {
			p.EarlyS, _ = early.Time(a)
			p.LateS, _ = late.Time(a)
		}
		if p.Status == curves.Operates {
			p.Faster = fasterStages(d, k, a, p.TimeS)
		}
		si.Points = append(si.Points, p)
	}
	return si
}

// fasterStages lists the other stages on stage k's quantity that operate
// at currentA within timeS, fastest first.
func fasterStages(d *Device, k int, currentA, timeS float64) []string {
	type hit struct {
		label string
		t     float64
	}
	var hits []hit
	for j, o := range d.Stages {
		if j == k || o.Measures != d.Stages[k].Measures {
			continue
		}
		if t, st := o.Curve.Time(currentA); st == curves.Operates && t <= timeS {
			hits = append(hits, hit{o.Label, t})
		}
	}
	sort.SliceStable(hits, func(a, b int) bool { return hits[a].t < hits[b].t })
	var out []string
	for _, h := range hits {
		out = append(out, fmt.Sprintf("%s (%.3f s)", h.label, h.t))
	}
	return out
}
