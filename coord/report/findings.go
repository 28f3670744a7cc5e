package report

import (
	"fmt"
	"math"
	"runtime"
	"strconv"
	"strings"
	"sync"

	"tripgrade/coord"
)

// Findings is the verdict of a coordination check, ready to render.
type Findings struct {
	Study    string
	Cases    []string
	Criteria []string
	// CheckNotes are the lines the check added to the criteria (faults
	// left to a source's own protection, parts no device clears): the
	// tail of Criteria, which a scenario's section prints under its
	// heading.
	CheckNotes []string
	// Notes are what loading the study assumed where its input left a
	// choice (coord.Study.Notes).
	Notes    []string
	Pairs    []PairRow
	Excluded []PairRow
	Rows     []Row
	Pass     int
	Warn     int
	Fail     int
	// Accepted counts the findings an [[accept]] entry covers, apart
	// from the others; Acceptances are the study's entries.
	Accepted    int
	Acceptances []coord.Acceptance
	// Scope is set for a scoped check, Baseline for one compared with an
	// earlier run.
	Scope    *ScopeInfo
	Baseline *Comparison
	// Scenarios lists the study's scenarios, the study as drawn first,
	// when it has any: each finding is then the worst of its check,
	// device, other device and stage over them all, and names the
	// scenario it comes from. ScenarioNotes say what the N-1 sweep left
	// out. Section, when set, names the one scenario this table is of
	// (check --scenarios all), whose header the full report gives.
	Scenarios     []ScenarioLine
	ScenarioNotes []string
	Section       *ScenarioLine
	// Picked is set when only some of the study's scenarios were checked
	// (KeepScenarios).
	Picked bool
}

// KeepScenarios leaves in Scenarios only those that keep picks: the
// scenarios a run checked, when it did not check them all.
func (f *Findings) KeepScenarios(keep func(name string) bool) {
	var kept []ScenarioLine
	for _, s := range f.Scenarios {
		if keep(s.Name) {
			kept = append(kept, s)
		}
	}
	if len(kept) < len(f.Scenarios) {
		f.Scenarios, f.Picked = kept, true
	}
}

// ScenarioLine is one scenario in a report's header.
type ScenarioLine struct {
	Name, Changes string
	Outage        bool
}

// NewScenarioLines lists a study's scenarios for a report, the study as
// drawn first; nil when it has none.
func NewScenarioLines(s *coord.Study) []ScenarioLine {
	if len(s.Scenarios) == 0 {
		return nil
	}
	out := []ScenarioLine{{Name: coord.AsDrawn, Changes: "every element in service, every switch as normally operated"}}
	for _, sc := range s.Scenarios {
		out = append(out, ScenarioLine{Name: sc.Name, Changes: sc.Changes, Outage: sc.Outage})
	}
	return out
}

// PairRow is one backup pair by name; Scenario names the scenario it was
// first found in when the study as drawn does not have it.
type PairRow struct {
	Upstream, Downstream string
	Manual               bool
	Scenario             string
}

// Row is one finding with its figures formatted.
type Row struct {
	// Finding points into the checked result's findings, which the
	// table does not copy (a large study has hundreds of thousands).
	Finding *coord.Finding
	// Text forms of the figures, for the text and Markdown tables.
	Measured, Required, Margin, Fault, Detail string
}

// NewFindings formats a check's result.
func NewFindings(s *coord.Study, r *coord.Result) *Findings {
	f := &Findings{Study: s.Name, Cases: CaseLines(s), Criteria: append(criteriaLines(s.Criteria), r.Notes...), CheckNotes: r.Notes, Notes: s.Notes}
	name := func(i int) string { return s.Devices[i].Name }
	for _, p := range r.Pairs {
		f.Pairs = append(f.Pairs, PairRow{Upstream: name(p.Upstream), Downstream: name(p.Downstream), Manual: p.Manual})
	}
	for _, p := range r.Excluded {
		f.Excluded = append(f.Excluded, PairRow{Upstream: name(p.Upstream), Downstream: name(p.Downstream)})
	}
	f.Rows = newRows(r.Findings)
	f.Pass, f.Warn, f.Fail = r.Counts()
	f.Accepted = r.Accepted()
	f.Acceptances = s.Accepts
	f.Scenarios = NewScenarioLines(s)
	f.ScenarioNotes = s.ScenarioNotes
	return f
}

// AddScenarioPairs adds the backup pairs that only scenarios other than
// the study as drawn have.
func (f *Findings) AddScenarioPairs(ps []coord.ScenarioPair) {
	for _, p := range ps {
		f.Pairs = append(f.Pairs, PairRow{Upstream: p.Upstream, Downstream: p.Downstream, Manual: p.Manual, Scenario: p.Scenario})
	}
}

// newRows makes the rows of the findings, in their order, the share of
// each CPU at once (a large study has hundreds of thousands).
func newRows(fs []coord.Finding) []Row {
	rows := make([]Row, len(fs))
	workers := min(runtime.GOMAXPROCS(0), len(fs)/rowsPerWorker+1)
	var wg sync.WaitGroup
	per := (len(fs) + workers - 1) / workers
	for lo := 0; lo < len(fs); lo += per {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := lo; i < min(lo+per, len(fs)); i++ {
				rows[i] = newRow(&fs[i])
			}
		}()
	}
	wg.Wait()
	return rows
}

// rowsPerWorker is the least number of rows worth a worker of its own.
const rowsPerWorker = 5000

func newRow(x *coord.Finding) Row {
	r := Row{Finding: x, Measured: "-", Required: "-", Margin: "-"}
	if x.Valid {
		r.Measured, r.Required = quantity(x.Measured, x.Unit), x.Relation+" "+quantity(x.Required, x.Unit)
		r.Margin = signed(x.Margin, x.Unit)
	}
	if ft := x.Fault; ft != nil {
		r.Fault = fmt.Sprintf("%s %s @ %s", ft.Kind, ft.Case, ft.Place)
		if ft.Interpolated {
			r.Fault += fmt.Sprintf(" (sweep, %s %%)", percent(ft.Scale))
		}
		r.Detail = detail(x)
	}
	return r
}

// percent formats a sweep's scale as a percentage of the solved fault.
func percent(scale float64) string {
	if scale >= 0.1 {
		return fmt.Sprintf("%.0f", scale*100)
	}
	return fmt.Sprintf("%.2g", scale*100)
}

// current names a current with its quantity: "1544 A", "97.0 A 3I0", or
// "none" for a device that carries no current of that quantity.
func current(a float64, q coord.Quantity) string {
	switch {
	case a == 0:
		return "none"
	case q == coord.Residual:
		return amps(a) + " A 3I0"
	}
	return amps(a) + " A"
}

// detail gives the currents and times behind a figure, each current with
// the device it belongs to.
func detail(x *coord.Finding) string {
	ft := x.Fault
	switch x.Check {
	case coord.Grading, coord.Discrimination:
		return fmt.Sprintf("%s: %s, %s; %s: %s, %s", x.Device, current(ft.DeviceA, ft.DeviceQty), seconds(ft.DeviceS), x.Other, current(ft.OtherA, ft.OtherQty), seconds(ft.OtherS))
	case coord.Clearing:
		return ""
	case coord.Damage:
		return fmt.Sprintf("%s clears %s in %s; %s carries %s for %s", x.Device, current(ft.DeviceA, ft.DeviceQty), seconds(ft.DeviceS), x.Other, current(ft.OtherA, coord.Phase), seconds(ft.OtherS))
	case coord.BackupSensitivity:
		return fmt.Sprintf("%s at %s (upstream); %s at %s", current(ft.OtherA, ft.OtherQty), x.Other, current(ft.DeviceA, ft.DeviceQty), x.Device)
	}
	return fmt.Sprintf("%s at %s", current(ft.DeviceA, ft.DeviceQty), x.Device)
}

func seconds(s float64) string {
	if math.IsInf(s, 1) || math.IsNaN(s) {
		return "does not operate"
	}
	return secondsText(s) + " s"
}

// secondsText formats a time to the millisecond, or with four significant
// digits from 100,000 s (over a day: a relay barely above its pickup),
// where milliseconds would only stretch the column (3.5e+06, not
// 3500000.229).
func secondsText(s float64) string {
	if math.Abs(s) >= 1e5 && !math.IsInf(s, 0) {
		return strconv.FormatFloat(s, 'g', 4, 64)
	}
	return fixed(s, 3)
}

// quantity formats a figure with its unit, with a typographic minus like
// the margins.
func quantity(v float64, unit string) string {
	var s string
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		s = strconv.FormatFloat(v, 'g', -1, 64) + " " + unit
	case unit == "s":
		s = secondsText(v) + " s"
	case unit == "A":
		s = amps(v) + " A"
	case unit == "×":
		s = fixed(v, 2) + " ×"
	default:
		s = fixed(v, 2)
	}
	s = strings.TrimSpace(s)
	if strings.HasPrefix(s, "-") {
		s = "−" + s[1:]
	}
	return s
}

func signed(v float64, unit string) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return quantity(v, unit)
	}
	q := quantity(math.Abs(v), unit)
	if v < 0 {
		return "−" + q
	}
	return "+" + q
}

// criteriaLines describes the criteria in words.
func criteriaLines(c coord.Criteria) []string {
	margin := fmt.Sprintf("grading margin %.2f s relay over relay", c.MarginS)
	if k := c.Components; k != nil {
		margin = fmt.Sprintf("grading margin (2·E_R + %g %%)·t_D + breaker + %.2f s overtravel + %.2f s safety", k.CTErrorPct, k.OvertravelS, k.SafetyS)
	}
	times := "nominal operating times"
	if c.WorstCaseTimes && c.Components == nil {
		times = "worst-case times within declared accuracy (upstream earliest, downstream latest)"
	}
	return []string{
		fmt.Sprintf("%s, %.2f s relay over fuse, downstream clearing ≤ %g × upstream fuse melting; %s; instantaneous stages operate in %.3f s unless a relay gives its own", margin, c.MarginFuseS, c.FuseMeltRatio, times, c.InstantaneousTimeS),
		fmt.Sprintf("sensitivity ≥ %g × pickup in the own zone, ≥ %g × at the end of the next zone; pickup ≥ %g × maximum load; instantaneous pickup ≥ %g × maximum through-fault (stages up to %g s)",
			c.SensitivityPrimary, c.SensitivityBackup, c.LoadFactor, c.InstantaneousFactor, c.ShortDelayS),
		fmt.Sprintf("inrush %g × transformer full-load current for %g s; damage: clear before the IEEE C57.109 or adiabatic withstand", c.InrushMultiple, c.InrushTimeS),
		fmt.Sprintf("every fault cleared within %g s by the devices nearest it on every side that feeds it; no other device operates first (the grading margins above)", c.MaxClearingS),
	}
}

// Verdict is the overall verdict line. Accepted findings are counted
// apart, and only when there are any.
func (f *Findings) Verdict() string {
	overall := "PASS"
	switch {
	case f.Fail > 0:
		overall = "FAIL"
	case f.Warn > 0:
		overall = "PASS with warnings"
	case f.Accepted > 0:
		overall = "PASS with accepted findings"
	}
	accepted := ""
	if f.Accepted > 0 {
		accepted = fmt.Sprintf(", %d ACCEPTED", f.Accepted)
	}
	return fmt.Sprintf("%d PASS, %d WARN, %d FAIL%s: %s", f.Pass, f.Warn, f.Fail, accepted, overall)
}

// groups returns the rows of each check in report order.
func (f *Findings) groups() [][]Row {
	if out, ok := f.runs(); ok {
		return out
	}
	var out [][]Row
	for _, c := range coord.CheckKinds {
		var g []Row
		for _, r := range f.Rows {
			if r.Finding.Check == c {
				g = append(g, r)
			}
		}
		if len(g) > 0 {
			out = append(out, g)
		}
	}
	return out
}

// runs returns the groups as parts of f.Rows, without copying them, when
// the rows already come check by check in the order of coord.CheckKinds
// (as a check's result gives them).
func (f *Findings) runs() ([][]Row, bool) {
	rank := map[coord.CheckKind]int{}
	for i, c := range coord.CheckKinds {
		rank[c] = i
	}
	var out [][]Row
	start := 0
	for i := 1; i <= len(f.Rows); i++ {
		if i < len(f.Rows) && f.Rows[i].Finding.Check == f.Rows[start].Finding.Check {
			continue
		}
		if i < len(f.Rows) {
			a, oka := rank[f.Rows[start].Finding.Check]
			b, okb := rank[f.Rows[i].Finding.Check]
			if !oka || !okb || a >= b {
				return nil, false
			}
		} else if _, ok := rank[f.Rows[start].Finding.Check]; !ok {
			return nil, false
		}
		out = append(out, f.Rows[start:i:i])
		start = i
	}
	return out, true
}

// withHeading names the "other" column for a check.
func withHeading(c coord.CheckKind) string {
	switch c {
	case coord.Grading, coord.BackupSensitivity:
		return "upstream"
	case coord.Damage:
		return "equipment"
	case coord.Discrimination:
		return "must clear"
	case coord.Clearing:
		return "cleared by"
	}
	return ""
}

// subjectHeading names the first column of a check's table: the device
// checked, or for fault clearing the faulted element.
func subjectHeading(c coord.CheckKind) string {
	if c == coord.Clearing {
		return "element"
	}
	return "device"
}

func pairText(p PairRow) string {
	s := p.Upstream + " → " + p.Downstream
	if p.Manual {
		s += " (added by [[pair]])"
	}
	if p.Scenario != "" {
		s += " (in scenario " + p.Scenario + ")"
	}
	return s
}

func joinPairs(ps []PairRow) string {
	parts := make([]string, len(ps))
	for i, p := range ps {
		parts[i] = pairText(p)
	}
	return strings.Join(parts, ", ")
}
