package report

import (
	"encoding/json"
	"io"
)

// jsonFault is the fault behind a finding's figure.
type jsonFault struct {
	Kind         string      `json:"kind"`
	Case         string      `json:"case"`
	Place        string      `json:"place"`
	Interpolated bool        `json:"interpolated"`
	Scale        *jsonNumber `json:"sweep_scale,omitempty"`
	DeviceA      *jsonNumber `json:"device_current_a,omitempty"`
	DeviceQty    string      `json:"device_quantity,omitempty"`
	OtherA       *jsonNumber `json:"other_current_a,omitempty"`
	OtherQty     string      `json:"other_quantity,omitempty"`
	DeviceS      *jsonNumber `json:"device_time_s,omitempty"`
	OtherS       *jsonNumber `json:"other_time_s,omitempty"`
}

// jsonFinding is one finding of the findings JSON.
type jsonFinding struct {
	Check    string      `json:"check"`
	Verdict  string      `json:"verdict"`
	Device   string      `json:"device"`
	Other    string      `json:"other,omitempty"`
	Stage    string      `json:"stage,omitempty"`
	Measured *jsonNumber `json:"measured,omitempty"`
	Required *jsonNumber `json:"required,omitempty"`
	Margin   *jsonNumber `json:"margin,omitempty"`
	Unit     string      `json:"unit,omitempty"`
	Relation string      `json:"relation,omitempty"`
	Fault    *jsonFault  `json:"fault,omitempty"`
	Note     string      `json:"note,omitempty"`
	Accepted *accepted   `json:"accepted,omitempty"`
	Scenario string      `json:"scenario,omitempty"`
}

// jsonPair is a backup pair.
type jsonPair struct {
	Upstream   string `json:"upstream"`
	Downstream string `json:"downstream"`
	Manual     bool   `json:"added_by_study"`
	Scenario   string `json:"scenario,omitempty"`
}

// jsonScenario is a scenario in the header.
type jsonScenario struct {
	Name    string `json:"name"`
	Changes string `json:"changes"`
	Outage  bool   `json:"n_minus_1,omitempty"`
}

// jsonSummary counts the verdicts.
type jsonSummary struct {
	Pass     int    `json:"pass"`
	Warn     int    `json:"warn"`
	Fail     int    `json:"fail"`
	Accepted int    `json:"accepted"`
	Text     string `json:"text"`
}

// jsonDoc is the findings JSON (README.md documents every field).
type jsonDoc struct {
	Schema   int             `json:"schema_version"`
	Study    string          `json:"study"`
	Caution  string          `json:"caution"`
	Cases    []string        `json:"cases"`
	Criteria []string        `json:"criteria"`
	Notes    []string        `json:"notes,omitempty"`
	Pairs    []jsonPair      `json:"pairs"`
	Excluded []jsonPair      `json:"excluded_pairs"`
	Findings []jsonFinding   `json:"findings"`
	Accepts  []accepted      `json:"acceptances"`
	Summary  jsonSummary     `json:"summary"`
	Scope    *jsonScope      `json:"scope,omitempty"`
	Baseline *jsonComparison `json:"baseline,omitempty"`
	// With scenarios: the scenarios, and what the N-1 sweep left out.
	Scenarios     []jsonScenario `json:"scenarios,omitempty"`
	ScenarioNotes []string       `json:"scenario_notes,omitempty"`
}

// WriteJSON writes the findings as one JSON document.
func (f *Findings) WriteJSON(w io.Writer) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(f.jsonDoc())
}

// jsonDoc builds the findings JSON.
func (f *Findings) jsonDoc() *jsonDoc {
	doc := &jsonDoc{Schema: SchemaVersion, Study: f.Study, Accepts: []accepted{}, Caution: Caution, Cases: f.Cases, Criteria: f.Criteria, Notes: f.Notes,
		Pairs: []jsonPair{}, Excluded: []jsonPair{}, Findings: []jsonFinding{}}
	for _, p := range f.Pairs {
		doc.Pairs = append(doc.Pairs, jsonPair{p.Upstream, p.Downstream, p.Manual, p.Scenario})
	}
	for _, p := range f.Excluded {
		doc.Excluded = append(doc.Excluded, jsonPair{p.Upstream, p.Downstream, false, ""})
	}
	for _, s := range f.Scenarios {
		doc.Scenarios = append(doc.Scenarios, jsonScenario{s.Name, s.Changes, s.Outage})
	}
	doc.ScenarioNotes = f.ScenarioNotes
	for _, r := range f.Rows {
		x := r.Finding
		j := jsonFinding{Check: x.Check.Slug(), Verdict: x.Verdict.String(), Device: x.Device, Other: x.Other, Stage: x.Stage,
			Unit: x.Unit, Relation: x.Relation, Note: x.Note, Scenario: x.Scenario}
		if x.Valid {
			j.Measured, j.Required, j.Margin = num(x.Measured), num(x.Required), num(x.Margin)
		}
		if a := x.Acceptance; a != nil {
			j.Accepted = &accepted{Reason: a.Reason, By: a.By, Date: a.Date, Was: a.Was.String()}
		}
		if ft := x.Fault; ft != nil {
			jf := &jsonFault{Kind: ft.Kind.String(), Case: ft.Case.String(), Place: ft.Place, Interpolated: ft.Interpolated,
				DeviceQty: quantityName(ft.DeviceA, ft.DeviceQty), OtherQty: quantityName(ft.OtherA, ft.OtherQty)}
			if ft.Interpolated {
				jf.Scale = num(ft.Scale)
			}
			// A current of 0 is "none": the device carries no current of
			// that quantity (the engine cuts rounding residue to exact 0).
			if ft.DeviceA != 0 {
				jf.DeviceA = num(ft.DeviceA)
			}
			if ft.OtherA != 0 {
				jf.OtherA = num(ft.OtherA)
			}
			if x.Check.Timed() {
				jf.DeviceS, jf.OtherS = num(ft.DeviceS), num(ft.OtherS)
			}
			j.Fault = jf
		}
		doc.Findings = append(doc.Findings, j)
	}
	for _, a := range f.Acceptances {
		doc.Accepts = append(doc.Accepts, accepted{Check: a.Check, Device: a.Device, Other: a.Other, Stage: a.Stage, Reason: a.Reason, By: a.By, Date: a.Date})
	}
	doc.Summary.Pass, doc.Summary.Warn, doc.Summary.Fail, doc.Summary.Text = f.Pass, f.Warn, f.Fail, f.Verdict()
	doc.Summary.Accepted = f.Accepted
	doc.Scope = f.Scope.json()
	doc.Baseline = f.Baseline.json()
	return doc
}
