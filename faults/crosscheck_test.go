package faults_test

import (
	"encoding/json"
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"tripgrade/faults"
	"tripgrade/faults/numpytest"
)

// The cross-check compares the engine with an independent numpy/scipy
// computation (testdata/crosscheck.py) on a generated meshed network: every
// fault current, and every current a relay point needs (the faults of
// Engine.Reach for each measuring point), plus the currents at the points
// near each fault and at a seeded sample of remote points, so that transfer
// impedances across several transformers are checked too. The script is
// written from the documented method (Grainger & Stevenson ch. 11–12 for
// the sequence networks and fault connections; IEC 60909-0 for the
// equivalent voltage source, the c factors and K_T, K_G) by a different
// route: complex off-nominal ratios for the phase shifts, dense inverses,
// the fault node inserted explicitly, phase-domain boundary conditions.

const (
	// crossRelTol is the agreement asked of the two computations, relative
	// to the larger of the two magnitudes. They share no code and differ
	// only in rounding (a sparse LDLᵀ against a dense pivoted LU, equivalent
	// but different formulations), which stays many orders below this; a
	// modelling difference shows up at 1e-3 or more.
	crossRelTol = 1e-6
	// crossFloorPU is the absolute floor of the tolerance, in per unit of
	// the base current at the point (or fault) compared, for currents that
	// are zero in both computations (the third HV phase behind a Dyn
	// transformer for an LV earth fault, any current beyond an open
	// zero-sequence path), where a relative difference of rounding residue
	// means nothing.
	crossFloorPU = 1e-6
	// crossBuses is the size of the generated network: big enough for
	// meshed regions, every special zone and a few hundred relay points,
	// small enough for dense inverses in the script.
	crossBuses = 240
	// remoteSample is the number of measuring points drawn at random, per
	// fault place, besides the points near the fault.
	remoteSample = 8
)

// TestCrossCheckNumpy runs the independent numpy/scipy computation on a
// generated 240-bus meshed network, with three-winding transformers,
// motors and power station units added, and compares every fault current
// and relay-point current with the engine's.
func TestCrossCheckNumpy(t *testing.T) {
	py := numpytest.Interpreter(t, "the independent cross-check", "numpy", "scipy")
	net, pts := generateMachineNetwork(2024, crossBuses)
	units := 0
	for _, g := range net.Generators {
		if g.Unit != nil {
			units++
		}
	}
	if len(net.Transformers3) < 3 || len(net.Motors) < 4 || units < 2 {
		t.Fatalf("the generated network has %d three-winding transformers, %d motors, %d power station units; want 3, 4, 2",
			len(net.Transformers3), len(net.Motors), units)
	}
	settings := map[string]faults.Settings{
		"defaults": {},
		"study": {
			LVTolerance10:   true,
			EarthFaultOhm:   10,
			EarthFaultOhmLV: 0.05,
			PhaseFaultOhm:   0.3,
			EndTempC:        80,
			LineFractions:   []float64{0.2, 0.7},
		},
	}
	for _, name := range []string{"defaults", "study"} {
		t.Run(name, func(t *testing.T) {
			t.Parallel()
			eng, err := faults.New(net, settings[name])
			if err != nil {
				t.Fatal(err)
			}
			places := crossPlaces(eng, pts, rand.New(rand.NewPCG(7, 11)))
			res := runCrossCheck(t, py, eng, pts, places)
			compareCrossCheck(t, eng, pts, places, res)
		})
	}
}

// crossPlace is one fault place and the measuring points compared for it.
type crossPlace struct {
	place  faults.Place
	points []int        // indices into the point list
	reach  map[int]bool // the points whose Reach includes this place
}

// crossPlaces lists every bus, both terminals of every branch and the
// line positions of the Settings on every line, each with the points whose
// reach includes it, the points on the branches at the fault, and a
// seeded sample of others.
func crossPlaces(eng *faults.Engine, pts []faults.Point, rng *rand.Rand) []crossPlace {
	net := eng.Network()
	var out []crossPlace
	index := map[faults.Place]int{}
	add := func(p faults.Place) {
		if fictitious(net, p) {
			return // a three-winding transformer's internal star point: the script has no such node
		}
		index[p] = len(out)
		out = append(out, crossPlace{place: p, reach: map[int]bool{}})
	}
	for k := range net.Buses {
		add(faults.AtBus(k))
	}
	fracs := eng.Settings().LineFractions
	if fracs == nil {
		fracs = []float64{0.5}
	}
	for b := 0; b < net.BranchCount(); b++ {
		add(faults.OnBranch(b, 0))
		add(faults.OnBranch(b, 1))
		if !net.IsTransformer(b) {
			for _, f := range fracs {
				add(faults.OnBranch(b, f))
			}
		}
	}
	atBus := make([][]int, len(net.Buses)) // points on branches incident to each bus
	for n, pt := range pts {
		f, to := net.BranchEnds(pt.Branch)
		atBus[f] = append(atBus[f], n)
		atBus[to] = append(atBus[to], n)
		for _, pl := range eng.Reach(pt) {
			if fictitious(net, pl) {
				panic(fmt.Sprintf("Reach of %v gives the internal place %v", pt, pl))
			}
			i, ok := index[pl]
			if !ok {
				panic(fmt.Sprintf("Reach of %v gives %v, not among the places", pt, pl))
			}
			out[i].reach[n] = true
		}
	}
	for i := range out {
		cp := &out[i]
		seen := map[int]bool{}
		take := func(n int) {
			if !seen[n] {
				seen[n] = true
				cp.points = append(cp.points, n)
			}
		}
		for n := range pts {
			if cp.reach[n] {
				take(n)
			}
		}
		if cp.place.IsBus() {
			for _, n := range atBus[cp.place.Bus] {
				take(n)
			}
		} else {
			f, to := net.BranchEnds(cp.place.Branch)
			for _, n := range append(atBus[f], atBus[to]...) {
				take(n)
			}
		}
		for s := 0; s < remoteSample; s++ {
			take(rng.IntN(len(pts)))
		}
	}
	return out
}

// fictitious reports a fault place on an internal node: a star point, at
// the bus or close in at a winding's star end.
func fictitious(net *faults.Network, p faults.Place) bool {
	if p.IsBus() {
		return net.Buses[p.Bus].Internal
	}
	f, t := net.BranchEnds(p.Branch)
	return (p.Frac == 0 && net.Buses[f].Internal) || (p.Frac == 1 && net.Buses[t].Internal)
}

// The JSON the script reads: the network in SI units, the settings, the
// points and the places.
type (
	jsonComplex [2]float64
	jsonNeutral struct {
		Isolated bool        `json:"isolated"`
		ZOhm     jsonComplex `json:"z_ohm"`
	}
	jsonStrength struct {
		SCMVA float64     `json:"sc_mva"`
		XR    float64     `json:"x_r"`
		Z1Ohm jsonComplex `json:"z1_ohm"`
		Z0Ohm jsonComplex `json:"z0_ohm"`
	}
	jsonInput struct {
		BaseMVA  float64 `json:"base_mva"`
		Settings struct {
			LVTolerance10   bool    `json:"lv_tolerance_10"`
			EarthFaultOhm   float64 `json:"earth_fault_ohm"`
			EarthFaultOhmLV float64 `json:"earth_fault_ohm_lv"`
			PhaseFaultOhm   float64 `json:"phase_fault_ohm"`
			EndTempC        float64 `json:"end_temp_c"`
		} `json:"settings"`
		Buses         []jsonBus          `json:"buses"`
		Sources       []jsonSource       `json:"sources"`
		Generators    []jsonGenerator    `json:"generators"`
		Motors        []jsonMotor        `json:"motors"`
		Lines         []jsonLine         `json:"lines"`
		Transformers  []jsonTransformer  `json:"transformers"`
		Transformers3 []jsonTransformer3 `json:"transformers3"`
		Earthings     []jsonEarthing     `json:"earthings"`
		Points        []jsonPoint        `json:"points"`
		Places        []jsonPlace        `json:"places"`
	}
	jsonBus struct {
		Name     string  `json:"name"`
		KV       float64 `json:"kv"`
		Internal bool    `json:"internal"`
	}
	jsonSource struct {
		Bus     int          `json:"bus"`
		Earthed bool         `json:"earthed"`
		Z0Z1    float64      `json:"z0_z1"`
		X0R0    float64      `json:"x0_r0"`
		Max     jsonStrength `json:"max"`
		Min     jsonStrength `json:"min"`
	}
	jsonGenerator struct {
		Bus     int         `json:"bus"`
		MVA     float64     `json:"mva"`
		KV      float64     `json:"kv"`
		XdPct   float64     `json:"xd_pct"`
		X2Pct   float64     `json:"x2_pct"`
		X0Pct   float64     `json:"x0_pct"`
		RPct    float64     `json:"r_pct"`
		PF      float64     `json:"pf"`
		InMax   bool        `json:"in_max"`
		InMin   bool        `json:"in_min"`
		Neutral jsonNeutral `json:"neutral"`
		Unit    *jsonUnit   `json:"unit"`
	}
	jsonUnit struct {
		Transformer      int     `json:"transformer"` // index into transformers
		OnLoadTapChanger bool    `json:"on_load_tap_changer"`
		TapPct           float64 `json:"tap_pct"`
		PGPct            float64 `json:"pg_pct"`
	}
	jsonMotor struct {
		Bus         int     `json:"bus"`
		MW          float64 `json:"mw"`
		KV          float64 `json:"kv"`
		PF          float64 `json:"pf"`
		Eff         float64 `json:"efficiency"`
		LockedRotor float64 `json:"ilr_irm"`
		PolePairs   int     `json:"pole_pairs"`
		RX          float64 `json:"r_x"`
		Count       int     `json:"count"`
	}
	jsonPair struct {
		MVA   float64 `json:"mva"`
		ZPct  float64 `json:"z_pct"`
		RPct  float64 `json:"r_pct"`
		Z0Pct float64 `json:"z0_pct"`
		R0Pct float64 `json:"r0_pct"`
	}
	// jsonTransformer3 is a three-winding transformer: its terminal buses,
	// windings HV, MV, LV, and the branch indices the engine gives its
	// windings (its star point is the engine's; the script has none).
	jsonTransformer3 struct {
		Buses        [3]int         `json:"buses"`
		KV           [3]float64     `json:"kv"`
		Pairs        [3]jsonPair    `json:"pairs"` // HV–MV, HV–LV, MV–LV
		Group        string         `json:"vector_group"`
		Neutrals     [3]jsonNeutral `json:"neutrals"`
		Branches     [3]int         `json:"branches"`
		Star         int            `json:"star_bus"`
		NotCorrected bool           `json:"not_corrected"`
	}
	jsonLine struct {
		Name     string      `json:"name"`
		From     int         `json:"from"`
		To       int         `json:"to"`
		Z1Ohm    jsonComplex `json:"z1_ohm"`
		Z0Ohm    jsonComplex `json:"z0_ohm"`
		EndTempC float64     `json:"end_temp_c"`
	}
	jsonTransformer struct {
		From         int         `json:"from"`
		To           int         `json:"to"`
		MVA          float64     `json:"mva"`
		KVFrom       float64     `json:"kv_from"`
		KVTo         float64     `json:"kv_to"`
		ZPct         float64     `json:"z_pct"`
		XR           float64     `json:"x_r"`
		Z0Pct        float64     `json:"z0_pct"`
		X0R0         float64     `json:"x0_r0"`
		Group        string      `json:"vector_group"`
		NeutralFrom  jsonNeutral `json:"neutral_from"`
		NeutralTo    jsonNeutral `json:"neutral_to"`
		NotCorrected bool        `json:"not_corrected"`
	}
	jsonEarthing struct {
		Bus      int         `json:"bus"`
		Z0Ohm    jsonComplex `json:"z0_ohm"`
		NeutralZ jsonComplex `json:"neutral_ohm"`
	}
	jsonPoint struct {
		Branch int    `json:"branch"`
		End    string `json:"end"`
	}
	jsonPlace struct {
		Kind   string  `json:"kind"` // bus, terminal or line
		Bus    int     `json:"bus"`
		Branch int     `json:"branch"`
		End    string  `json:"end"`
		Frac   float64 `json:"frac"`
		Points []int   `json:"points"`
	}
	// jsonOutput is what the script writes: per place, [case][kind] the
	// fault's phase currents and [case][kind][point] the points' phase
	// currents, each as re, im of Ia, Ib, Ic in amperes.
	jsonOutput struct {
		Places []struct {
			Fault  [][][]float64   `json:"fault"`
			Points [][][][]float64 `json:"points"`
		} `json:"places"`
	}
)

// jc, jn and js translate a complex value, a neutral and a source strength.
func jc(z complex128) jsonComplex { return jsonComplex{real(z), imag(z)} }

func jn(n faults.Neutral) jsonNeutral { return jsonNeutral{Isolated: n.Isolated, ZOhm: jc(n.ZOhm)} }

func js(s faults.Strength) jsonStrength {
	return jsonStrength{SCMVA: s.SCMVA, XR: s.XR, Z1Ohm: jc(s.Z1Ohm), Z0Ohm: jc(s.Z0Ohm)}
}

// crossInput translates the network, settings, points and places for the
// script, field by field, in SI units.
func crossInput(eng *faults.Engine, pts []faults.Point, places []crossPlace) *jsonInput {
	net, set := eng.Network(), eng.Settings()
	in := &jsonInput{BaseMVA: net.BaseMVA}
	in.Settings.LVTolerance10 = set.LVTolerance10
	in.Settings.EarthFaultOhm = set.EarthFaultOhm
	in.Settings.EarthFaultOhmLV = set.EarthFaultOhmLV
	in.Settings.PhaseFaultOhm = set.PhaseFaultOhm
	in.Settings.EndTempC = set.EndTempC
	for _, b := range net.Buses {
		in.Buses = append(in.Buses, jsonBus{Name: b.Name, KV: b.KV, Internal: b.Internal})
	}
	in.Motors = make([]jsonMotor, len(net.Motors))
	for i, m := range net.Motors {
		in.Motors[i] = jsonMotor{Bus: m.Bus, MW: m.MW, KV: m.KV, PF: m.PF, Eff: m.Eff, LockedRotor: m.LockedRotor,
			PolePairs: m.PolePairs, RX: m.RX, Count: m.Count}
	}
	in.Transformers3 = make([]jsonTransformer3, len(net.Transformers3))
	for i, t := range net.Transformers3 {
		o := &in.Transformers3[i]
		o.Buses, o.KV, o.Group, o.Star, o.NotCorrected = t.Buses, t.KV, t.Group.String(), t.StarBus, t.NotCorrected
		for p, pr := range t.Pairs {
			o.Pairs[p] = jsonPair{MVA: pr.MVA, ZPct: pr.ZPct, RPct: pr.RPct, Z0Pct: pr.Z0Pct, R0Pct: pr.R0Pct}
		}
		for w := range o.Branches {
			o.Branches[w] = net.StarBranch(i, w)
			o.Neutrals[w] = jn(t.Neutral[w])
		}
	}
	in.Sources = make([]jsonSource, len(net.Sources))
	for i, s := range net.Sources {
		o := &in.Sources[i]
		o.Bus, o.Earthed, o.Z0Z1, o.X0R0, o.Max, o.Min = s.Bus, s.Earthed, s.Z0Z1, s.X0R0, js(s.Max), js(s.Min)
	}
	in.Generators = make([]jsonGenerator, len(net.Generators))
	for i, g := range net.Generators {
		o := &in.Generators[i]
		o.Bus, o.MVA, o.KV, o.XdPct, o.X2Pct, o.X0Pct = g.Bus, g.MVA, g.KV, g.XdPct, g.X2Pct, g.X0Pct
		o.RPct, o.PF, o.InMax, o.InMin, o.Neutral = g.RPct, g.PF, g.InMax, g.InMin, jn(g.Earth)
		if u := g.Unit; u != nil {
			o.Unit = &jsonUnit{Transformer: u.Transformer, OnLoadTapChanger: u.OnLoadTapChanger, TapPct: u.TapPct, PGPct: u.PGPct}
		}
	}
	in.Lines = make([]jsonLine, len(net.Lines))
	for i, l := range net.Lines {
		o := &in.Lines[i]
		o.Name, o.From, o.To, o.Z1Ohm, o.Z0Ohm, o.EndTempC = l.Name, l.From, l.To, jc(l.Z1Ohm), jc(l.Z0Ohm), l.EndTempC
	}
	in.Transformers = make([]jsonTransformer, len(net.Transformers))
	for i, tr := range net.Transformers {
		o := &in.Transformers[i]
		o.From, o.To, o.MVA, o.KVFrom, o.KVTo = tr.From, tr.To, tr.MVA, tr.KVFrom, tr.KVTo
		o.ZPct, o.XR, o.Z0Pct, o.X0R0, o.Group = tr.ZPct, tr.XR, tr.Z0Pct, tr.X0R0, tr.Group.String()
		o.NeutralFrom, o.NeutralTo, o.NotCorrected = jn(tr.NeutralFrom), jn(tr.NeutralTo), tr.NotCorrected
	}
	in.Earthings = make([]jsonEarthing, len(net.Earthings))
	for i, e := range net.Earthings {
		in.Earthings[i].Bus, in.Earthings[i].Z0Ohm, in.Earthings[i].NeutralZ = e.Bus, jc(e.Z0Ohm), jc(e.NeutralZ)
	}
	for _, pt := range pts {
		in.Points = append(in.Points, jsonPoint{Branch: pt.Branch, End: pt.End.String()})
	}
	for _, cp := range places {
		jp := jsonPlace{Kind: "bus", Bus: cp.place.Bus, Branch: cp.place.Branch, Frac: cp.place.Frac, Points: cp.points}
		switch {
		case cp.place.IsBus():
		case cp.place.Frac == 0:
			jp.Kind, jp.End = "terminal", "from"
		case cp.place.Frac == 1:
			jp.Kind, jp.End = "terminal", "to"
		default:
			jp.Kind = "line"
		}
		in.Places = append(in.Places, jp)
	}
	return in
}

// runCrossCheck writes the input, runs the script and reads its results.
func runCrossCheck(t *testing.T, py string, eng *faults.Engine, pts []faults.Point, places []crossPlace) *jsonOutput {
	t.Helper()
	dir := t.TempDir()
	inPath, outPath := filepath.Join(dir, "network.json"), filepath.Join(dir, "results.json")
	data, err := json.Marshal(crossInput(eng, pts, places))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(inPath, data, 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.CommandContext(t.Context(), py, filepath.Join("testdata", "crosscheck.py"), inPath, outPath)
	// The subtests run in parallel; one BLAS thread each keeps them from
	// oversubscribing the CPUs (the matrices are small).
	cmd.Env = append(os.Environ(), "OPENBLAS_NUM_THREADS=1", "OMP_NUM_THREADS=1")
	if msg, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("crosscheck.py: %v\n%s", err, msg)
	}
	data, err = os.ReadFile(outPath)
	if err != nil {
		t.Fatal(err)
	}
	var res jsonOutput
	if err := json.Unmarshal(data, &res); err != nil {
		t.Fatal(err)
	}
	if len(res.Places) != len(places) {
		t.Fatalf("crosscheck.py returned %d places, want %d", len(res.Places), len(places))
	}
	return &res
}

// crossStats gathers the comparison's figures.
type crossStats struct {
	fault, point, reach int     // complex phase currents compared
	worstRel            float64 // largest relative difference above the floor
	worstWhere          string
	failures            int
}

// compare checks one complex current against the script's, with the
// tolerance of crossRelTol and crossFloorPU.
func (s *crossStats) compare(t *testing.T, got complex128, want []float64, baseA float64, where string) {
	w := complex(want[0], want[1])
	larger := math.Max(cmplx.Abs(got), cmplx.Abs(w))
	diff := cmplx.Abs(got - w)
	if larger > crossFloorPU*baseA {
		if rel := diff / larger; rel > s.worstRel {
			s.worstRel, s.worstWhere = rel, where
		}
	}
	if diff > math.Max(crossRelTol*larger, crossFloorPU*baseA) {
		s.failures++
		if s.failures <= 20 {
			t.Errorf("%s: engine %.6g A ∠%.4f°, numpy/scipy %.6g A ∠%.4f° (difference %.3g A)",
				where, cmplx.Abs(got), cmplx.Phase(got)*180/math.Pi, cmplx.Abs(w), cmplx.Phase(w)*180/math.Pi, diff)
		}
	}
}

// compareCrossCheck solves every place, kind and case with the engine and
// compares the fault's and the points' phase currents with the script's.
func compareCrossCheck(t *testing.T, eng *faults.Engine, pts []faults.Point, places []crossPlace, res *jsonOutput) {
	net := eng.Network()
	var st crossStats
	phase := [...]string{"a", "b", "c"}
	for i, cp := range places {
		r := res.Places[i]
		for _, cs := range faults.Cases {
			for _, kind := range faults.Kinds {
				sol, err := eng.Solve(eng.CaseFault(cp.place, kind, cs))
				if err != nil {
					t.Fatal(err)
				}
				desc := fmt.Sprintf("%s %s at %s", cs, kind, describePlace(net, cp.place))
				fp := sol.FaultCurrents().Phases()
				for ph := range fp {
					st.compare(t, fp[ph], r.Fault[cs][kind][2*ph:], eng.BaseCurrentA(sol.FaultBus()), desc+": fault I"+phase[ph])
					st.fault++
				}
				for m, n := range cp.points {
					pt := pts[n]
					f, to := net.BranchEnds(pt.Branch)
					bus := f
					if pt.End == faults.To {
						bus = to
					}
					pp := sol.At(pt).Phases()
					for ph := range pp {
						where := fmt.Sprintf("%s: point %s/%s I%s", desc, net.BranchName(pt.Branch), pt.End, phase[ph])
						st.compare(t, pp[ph], r.Points[cs][kind][m][2*ph:], eng.BaseCurrentA(bus), where)
						st.point++
						if cp.reach[n] {
							st.reach++
						}
					}
				}
			}
		}
	}
	if st.failures > 20 {
		t.Errorf("%d currents disagree in all (first 20 shown)", st.failures)
	}
	t.Logf("compared %d complex phase currents with the independent numpy/scipy computation: %d fault currents, %d at measuring points (%d of them relay-point currents of Engine.Reach); worst relative difference %.2e (%s)",
		st.fault+st.point, st.fault, st.point, st.reach, st.worstRel, st.worstWhere)
}

// describePlace names a fault place for messages.
func describePlace(net *faults.Network, p faults.Place) string {
	if p.IsBus() {
		return "bus " + net.Buses[p.Bus].Name
	}
	return fmt.Sprintf("%s@%g", net.BranchName(p.Branch), p.Frac)
}
