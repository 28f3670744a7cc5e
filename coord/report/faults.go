package report

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"text/tabwriter"

	"tripgrade/coord"
	"tripgrade/faults"
)

// FaultTables is the fault study of a network: what each device sees over
// its own zone, and the four fault kinds at each bus.
type FaultTables struct {
	Study  string
	Cases  []string // one line per case, saying what it assumes
	Points []PointRow
	Buses  []BusRow
	// Notes qualify figures of the bus table (buses inside power station
	// units, the method of the duties).
	Notes []string
}

// PointRow is one device's currents.
type PointRow struct {
	Device, Kind, Branch, At string
	KV                       float64
	PhaseMax, PhaseMin       Figure
	GroundMax, GroundMin     Figure
}

// Figure is a current with the fault behind it.
type Figure struct {
	A     float64
	Found bool
	Fault string // fault kind
	Case  string
	Place string
	// At are the device's sequence currents for that fault; V and Pre the
	// voltages at its bus during the fault and before it.
	At     faults.Currents
	V, Pre faults.Voltages
}

// BusRow is the fault currents at one bus: [case][kind], phase current
// into the fault and earth current.
type BusRow struct {
	Bus    string
	KV     float64
	Faults [2][4]faults.BusFault
	// Duty is the three-phase duty in the maximum case (i_p, I_b, I_k); nil
	// when not computed (see AddDuties).
	Duty  *faults.Duty
	index int // the bus's index in the network
}

// NewFaultTables gathers the figures of a study's fault calculation.
func NewFaultTables(s *coord.Study, levels []faults.PointSummary, buses []faults.BusSummary) *FaultTables {
	n := s.Network
	t := &FaultTables{Study: s.Name, Cases: CaseLines(s)}
	fig := func(x faults.Extreme) Figure {
		if !x.Found {
			return Figure{}
		}
		return Figure{A: x.A, Found: true, Fault: x.Fault.Kind.String(), Case: x.Fault.Case.String(),
			Place: coord.PlaceName(n, x.Fault.Place), At: x.At, V: x.V, Pre: x.Pre}
	}
	for i, d := range s.Devices {
		lv := levels[i]
		bus := coord.DeviceBus(n, d)
		t.Points = append(t.Points, PointRow{
			Device: d.Name, Kind: d.Kind.String(), Branch: n.BranchName(d.Point.Branch), At: n.Buses[bus].Name,
			KV:       n.Buses[bus].KV,
			PhaseMax: fig(lv.PhaseMax), PhaseMin: fig(lv.PhaseMin),
			GroundMax: fig(lv.ResidualMax), GroundMin: fig(lv.ResidualMin),
		})
	}
	for _, b := range buses {
		if n.Buses[b.Bus].Internal {
			continue // a three-winding transformer's star point: no place for a fault
		}
		t.Buses = append(t.Buses, BusRow{Bus: n.Buses[b.Bus].Name, KV: n.Buses[b.Bus].KV, Faults: b.Faults, index: b.Bus})
	}
	if units := unitBuses(n); len(units) > 0 {
		t.Notes = append(t.Notes, fmt.Sprintf("%s inside power station units: the maximum case there uses the unit's K_S or K_SO, not the IEC 60909-0 factors for a fault between generator and unit transformer",
			strings.Join(units, ", ")))
	}
	return t
}

// unitBuses names the generator buses of power station units.
func unitBuses(n *faults.Network) []string {
	var out []string
	for _, g := range n.Generators {
		if g.Unit != nil {
			out = append(out, n.Buses[g.Bus].Name)
		}
	}
	return out
}

// AddDuties adds each bus's three-phase duty in the maximum case (duties
// indexed by bus, as faults.Engine.AllDuties returns them) and a note on
// how they are computed.
func (t *FaultTables) AddDuties(s *coord.Study, duties []faults.Duty) {
	for i := range t.Buses {
		d := duties[t.Buses[i].index]
		t.Buses[i].Duty = &d
	}
	tmin := s.Faults.MinTimeDelayS
	if tmin == 0 {
		tmin = 0.02
	}
	t.Notes = append(t.Notes, fmt.Sprintf("ip, Ib, Ik: three-phase fault, maximum case (IEC 60909-0): peak ip = κ·√2·I\"k with κ by method C (equivalent frequency 0.4·f); breaking Ib at t_min = %g s, less the decay of generators and motors; steady-state Ik = I\"k without motors (meshed-network rule)", tmin))
}

// CaseLines describes the two cases of a study in words.
func CaseLines(s *coord.Study) []string {
	f := s.Faults
	heat := "conductors at 20 °C"
	if f.EndTempC > 0 {
		heat = fmt.Sprintf("line resistance at %g °C", f.EndTempC)
	}
	motors, motorsMin, units := "", "", ""
	if len(s.Network.Motors) > 0 {
		motors, motorsMin = "; asynchronous motors in service", "; motors left out"
	}
	if len(unitBuses(s.Network)) > 0 {
		units = ", K_S or K_SO for power station units"
	}
	return []string{
		fmt.Sprintf("maximum case: %s; maximum source strength; generators in service%s; K_T and K_G corrections%s; bolted faults", factorText(f, faults.Max), motors, units),
		fmt.Sprintf("minimum case: %s; minimum source strength; only generators marked always_running%s; %s; %s above 1 kV, %s up to 1 kV; %s",
			factorText(f, faults.Min), motorsMin, heat, faultZ("earth-fault", f.EarthFaultOhm, f.EarthFaultXOhm, f.EarthFaultXOhmLV),
			ohms(f.EarthFaultOhmLV, f.EarthFaultXOhmLV), faultZ("phase-fault", f.PhaseFaultOhm, f.PhaseFaultXOhm, 0)),
	}
}

// factorText names the voltage factor of a case: the study's own, or
// those of IEC 60909-0 Table 1 above and up to 1 kV.
func factorText(f faults.Settings, cs faults.Case) string {
	name, given := "c_max", f.CMax
	if cs == faults.Min {
		name, given = "c_min", f.CMin
	}
	table := func(kv float64) string {
		return fmt.Sprintf("%.2f", faults.TableVoltageFactor(kv, cs, f.LVTolerance10))
	}
	if given > 0 {
		return fmt.Sprintf("%s %.2f at every voltage (set by the study; IEC 60909-0 Table 1 gives %s above 1 kV, %s up to 1 kV)", name, given, table(11), table(0.4))
	}
	s := fmt.Sprintf("%s %s above 1 kV, %s up to 1 kV", name, table(11), table(0.4))
	if cs == faults.Max {
		s += " (IEC 60909-0 Table 1)"
	}
	return s
}

// faultZ names a fault impedance: "earth-fault resistance 10 Ω" while the
// study gives no reactance (xOther: the reactance of the same faults on the
// other side of 1 kV), "earth-fault impedance 10 + j5 Ω" when it does.
func faultZ(what string, r, x, xOther float64) string {
	if x == 0 && xOther == 0 {
		return what + " resistance " + ohms(r, x)
	}
	return what + " impedance " + ohms(r, x)
}

// ohms formats a fault impedance: "10 Ω", or "10 + j5 Ω" with a reactance.
func ohms(r, x float64) string {
	if x == 0 {
		return fmt.Sprintf("%g Ω", r)
	}
	return fmt.Sprintf("%g + j%g Ω", r, x)
}

// amps formats a current for a table: whole amperes from 100 A up, one
// decimal below, and two significant digits for a current below 0.1 A,
// which is still a current (a high-resistance earth fault) and must not
// print as 0.0.
func amps(a float64) string {
	switch {
	case a >= 100:
		return fixed(a, 0)
	case a >= 0.1 || a == 0:
		return fixed(a, 1)
	}
	return strconv.FormatFloat(a, 'g', 2, 64)
}

// ampsOrNone formats a current for a table, "none" for no current.
func ampsOrNone(a float64) string {
	if a == 0 {
		return "none"
	}
	return amps(a)
}

func (f Figure) text(none string) (string, string) {
	if !f.Found {
		return "-", none
	}
	return amps(f.A), f.Fault + " @ " + f.Place
}

// WriteText writes the tables aligned for a terminal.
func (t *FaultTables) WriteText(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "tripgrade fault study: %s\n", t.Study)
	for _, c := range t.Cases {
		fmt.Fprintf(ew, "  %s\n", c)
	}
	fmt.Fprintf(ew, "\nCurrents each device sees for faults in its own zone (primary A; ground = residual 3I0, or the neutral current of a relay on a neutral CT)\n")
	tw := tabwriter.NewWriter(ew, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "device\tbranch\tat\tkV\tphase max\tfault\tphase min\tfault\tground max\tfault\tground min\tfault")
	for _, p := range t.Points {
		pmax, pmaxF := p.PhaseMax.text("no fault current")
		pmin, pminF := p.PhaseMin.text("no fault current")
		gmax, gmaxF := p.GroundMax.text("no earth-fault current")
		gmin, gminF := p.GroundMin.text("no earth-fault current")
		fmt.Fprintf(tw, "%s\t%s\t%s\t%g\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n",
			p.Device, p.Branch, p.At, p.KV, pmax, pmaxF, pmin, pminF, gmax, gmaxF, gmin, gminF)
	}
	tw.Flush()
	fmt.Fprintf(ew, "\nFault currents at each bus (A into the fault; LLG: earth current 3I0)\n")
	tw = tabwriter.NewWriter(ew, 0, 0, 2, ' ', tabwriter.AlignRight)
	duties := len(t.Buses) > 0 && t.Buses[0].Duty != nil
	head := "bus\tkV\tLLL max\tLL max\tLG max\tLLG max\tLLL min\tLL min\tLG min\tLLG min\t"
	if duties {
		head += "ip max\tIb max\tIk max\t"
	}
	fmt.Fprintln(tw, head)
	for _, b := range t.Buses {
		fmt.Fprintf(tw, "%s\t%g\t", b.Bus, b.KV)
		for _, cs := range faults.Cases {
			for _, k := range faults.Kinds {
				fmt.Fprintf(tw, "%s\t", ampsOrNone(busFigure(b.Faults[cs][k], k)))
			}
		}
		if d := b.Duty; d != nil {
			fmt.Fprintf(tw, "%s\t%s\t%s\t", amps(d.PeakA), amps(d.BreakingA), amps(d.SteadyA))
		}
		fmt.Fprintln(tw)
	}
	tw.Flush()
	for _, n := range t.Notes {
		fmt.Fprintf(ew, "  %s\n", n)
	}
	fmt.Fprintf(ew, "\n%s\n", Caution)
	return ew.err
}

// busFigure is the figure a bus table shows for a fault kind: the phase
// current, or for LLG the earth current.
func busFigure(f faults.BusFault, k faults.Kind) float64 {
	if k == faults.LLG {
		return f.EarthA
	}
	return f.PhaseA
}

// currentCell writes a current for CSV to the milliampere, or with four
// significant digits below 1 A, so that a tiny current keeps its figure.
func currentCell(a float64) string {
	if a != 0 && math.Abs(a) < 1 {
		return strconv.FormatFloat(a, 'g', 4, 64)
	}
	return fixed(a, 3)
}

// WriteCSV writes the tables as one long CSV table, a row per figure:
// table, name, kv, quantity, case, current_a, fault_kind, fault_place.
func (t *FaultTables) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"table", "name", "kv", "quantity", "case", "current_a", "fault_kind", "fault_place"})
	for _, p := range t.Points {
		for _, q := range []struct {
			name string
			f    Figure
		}{{"phase_max", p.PhaseMax}, {"phase_min", p.PhaseMin}, {"ground_max", p.GroundMax}, {"ground_min", p.GroundMin}} {
			val := ""
			if q.f.Found {
				val = currentCell(q.f.A)
			}
			cw.Write([]string{"device", textCell(p.Device), fmt.Sprint(p.KV), q.name, q.f.Case, val, q.f.Fault, textCell(q.f.Place)})
		}
	}
	for _, b := range t.Buses {
		for _, cs := range faults.Cases {
			for _, k := range faults.Kinds {
				f := b.Faults[cs][k]
				cw.Write([]string{"bus", textCell(b.Bus), fmt.Sprint(b.KV), strings.ToLower(k.String()) + "_phase", cs.String(), currentCell(f.PhaseA), k.String(), textCell(b.Bus)})
				if k.Earth() {
					cw.Write([]string{"bus", textCell(b.Bus), fmt.Sprint(b.KV), strings.ToLower(k.String()) + "_earth", cs.String(), currentCell(f.EarthA), k.String(), textCell(b.Bus)})
				}
			}
		}
		if d := b.Duty; d != nil {
			for _, q := range []struct {
				name string
				a    float64
			}{{"lll_peak", d.PeakA}, {"lll_breaking", d.BreakingA}, {"lll_steady", d.SteadyA}} {
				cw.Write([]string{"bus", b.Bus, fmt.Sprint(b.KV), q.name, "max", fmt.Sprintf("%.3f", q.a), "LLL", b.Bus})
			}
		}
	}
	cw.Flush()
	return cw.Error()
}

// phasorFloor is the share of a point's largest current below which one
// of its phase or residual currents counts as none: far above the
// rounding residue of summing sequence currents (about 1e-15), far below
// any current a network drives (the engine's own cut-off is 1e-10 of the
// fault's sequence current). It is relative, so it does not depend on
// base_mva.
const phasorFloor = 1e-9

type jsonFigure struct {
	CurrentA  *float64      `json:"current_a"`
	FaultKind string        `json:"fault_kind,omitempty"`
	Case      string        `json:"case,omitempty"`
	Place     string        `json:"place,omitempty"`
	Phases    *jsonPhasors  `json:"phases,omitempty"`
	Voltages  *jsonVoltages `json:"bus_voltages,omitempty"`
}

// jsonVoltages are the line-to-neutral voltages at a device's bus during
// one fault, phases and sequences, magnitude and angle, and the pre-fault
// phase-a voltage there (its angle shows the bus's phase shift from the
// fault location).
type jsonVoltages struct {
	VaV, VaDeg, VbV, VbDeg, VcV, VcDeg float64
	V0V, V0Deg, V1V, V1Deg, V2V, V2Deg float64
	PreVaV, PreVaDeg                   float64
}

func (v jsonVoltages) MarshalJSON() ([]byte, error) {
	return json.Marshal(struct {
		VaV      float64 `json:"va_v"`
		VaDeg    float64 `json:"va_deg"`
		VbV      float64 `json:"vb_v"`
		VbDeg    float64 `json:"vb_deg"`
		VcV      float64 `json:"vc_v"`
		VcDeg    float64 `json:"vc_deg"`
		V0V      float64 `json:"v0_v"`
		V0Deg    float64 `json:"v0_deg"`
		V1V      float64 `json:"v1_v"`
		V1Deg    float64 `json:"v1_deg"`
		V2V      float64 `json:"v2_v"`
		V2Deg    float64 `json:"v2_deg"`
		PreVaV   float64 `json:"prefault_va_v"`
		PreVaDeg float64 `json:"prefault_va_deg"`
	}(v))
}

// jsonPhasors are a device's currents for one fault, magnitude and angle.
type jsonPhasors struct {
	IaA, IaDeg, IbA, IbDeg, IcA, IcDeg, ResidualA, ResidualDeg float64
}

func (p jsonPhasors) MarshalJSON() ([]byte, error) {
	return json.Marshal(struct {
		IaA         float64 `json:"ia_a"`
		IaDeg       float64 `json:"ia_deg"`
		IbA         float64 `json:"ib_a"`
		IbDeg       float64 `json:"ib_deg"`
		IcA         float64 `json:"ic_a"`
		IcDeg       float64 `json:"ic_deg"`
		ResidualA   float64 `json:"residual_a"`
		ResidualDeg float64 `json:"residual_deg"`
	}(p))
}

func (f Figure) json() jsonFigure {
	if !f.Found {
		return jsonFigure{}
	}
	a := f.A
	ph := f.At.Phases()
	// A healthy phase of an earth fault is a sum of sequence currents that
	// cancel; rounding leaves some 1e-15 of the point's largest current.
	// Below phasorFloor of it a current is none: 0 A at 0°.
	largest := cmplx.Abs(f.At.Residual())
	for _, c := range ph {
		largest = math.Max(largest, cmplx.Abs(c))
	}
	polar := func(c complex128) (float64, float64) {
		if !(cmplx.Abs(c) > phasorFloor*largest) {
			return 0, 0
		}
		return cmplx.Abs(c), cmplx.Phase(c) * 180 / math.Pi
	}
	var p jsonPhasors
	p.IaA, p.IaDeg = polar(ph[0])
	p.IbA, p.IbDeg = polar(ph[1])
	p.IcA, p.IcDeg = polar(ph[2])
	p.ResidualA, p.ResidualDeg = polar(f.At.Residual())
	// Voltages the same way, relative to the pre-fault voltage there.
	pre := cmplx.Abs(f.Pre.Seq[1])
	vpolar := func(c complex128) (float64, float64) {
		if !(cmplx.Abs(c) > phasorFloor*pre) {
			return 0, 0
		}
		return cmplx.Abs(c), cmplx.Phase(c) * 180 / math.Pi
	}
	var v jsonVoltages
	vp := f.V.Phases()
	v.VaV, v.VaDeg = vpolar(vp[0])
	v.VbV, v.VbDeg = vpolar(vp[1])
	v.VcV, v.VcDeg = vpolar(vp[2])
	v.V0V, v.V0Deg = vpolar(f.V.Seq[0])
	v.V1V, v.V1Deg = vpolar(f.V.Seq[1])
	v.V2V, v.V2Deg = vpolar(f.V.Seq[2])
	v.PreVaV, v.PreVaDeg = vpolar(f.Pre.Seq[1])
	return jsonFigure{CurrentA: &a, FaultKind: f.Fault, Case: f.Case, Place: f.Place, Phases: &p, Voltages: &v}
}

type jsonBusCase struct {
	LLLA      float64 `json:"lll_a"`
	LLA       float64 `json:"ll_a"`
	LGA       float64 `json:"lg_a"`
	LLGPhaseA float64 `json:"llg_phase_a"`
	LLGEarthA float64 `json:"llg_earth_a"`
}

// jsonDuty is a bus's three-phase duty in the maximum case.
type jsonDuty struct {
	Kappa     float64 `json:"kappa"`
	RX        float64 `json:"r_x"`
	PeakA     float64 `json:"peak_a"`
	BreakingA float64 `json:"breaking_a"`
	SteadyA   float64 `json:"steady_a"`
}

// WriteJSON writes the tables as one JSON document.
func (t *FaultTables) WriteJSON(w io.Writer) error {
	type point struct {
		Device    string     `json:"device"`
		Kind      string     `json:"kind"`
		Branch    string     `json:"branch"`
		At        string     `json:"at"`
		KV        float64    `json:"kv"`
		PhaseMax  jsonFigure `json:"phase_max"`
		PhaseMin  jsonFigure `json:"phase_min"`
		GroundMax jsonFigure `json:"ground_max"`
		GroundMin jsonFigure `json:"ground_min"`
	}
	type bus struct {
		Bus  string      `json:"bus"`
		KV   float64     `json:"kv"`
		Max  jsonBusCase `json:"max"`
		Min  jsonBusCase `json:"min"`
		Duty *jsonDuty   `json:"duty,omitempty"`
	}
	doc := struct {
		Study   string   `json:"study"`
		Caution string   `json:"caution"`
		Cases   []string `json:"cases"`
		Notes   []string `json:"notes,omitempty"`
		Devices []point  `json:"devices"`
		Buses   []bus    `json:"buses"`
	}{Study: t.Study, Caution: Caution, Cases: t.Cases, Notes: t.Notes, Devices: []point{}, Buses: []bus{}}
	for _, p := range t.Points {
		doc.Devices = append(doc.Devices, point{p.Device, p.Kind, p.Branch, p.At, p.KV,
			p.PhaseMax.json(), p.PhaseMin.json(), p.GroundMax.json(), p.GroundMin.json()})
	}
	bc := func(f [4]faults.BusFault) jsonBusCase {
		return jsonBusCase{f[faults.LLL].PhaseA, f[faults.LL].PhaseA, f[faults.LG].PhaseA, f[faults.LLG].PhaseA, f[faults.LLG].EarthA}
	}
	for _, b := range t.Buses {
		jb := bus{Bus: b.Bus, KV: b.KV, Max: bc(b.Faults[faults.Max]), Min: bc(b.Faults[faults.Min])}
		if d := b.Duty; d != nil {
			jb.Duty = &jsonDuty{Kappa: d.Kappa, RX: d.RX, PeakA: d.PeakA, BreakingA: d.BreakingA, SteadyA: d.SteadyA}
		}
		doc.Buses = append(doc.Buses, jb)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}

// errWriter remembers the first write error so that a table can be
// written with plain Fprintf calls.
type errWriter struct {
	w   io.Writer
	err error
}

func (e *errWriter) Write(p []byte) (int, error) {
	if e.err != nil {
		return 0, e.err
	}
	n, err := e.w.Write(p)
	e.err = err
	return n, err
}
