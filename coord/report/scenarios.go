package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
)

// ScenarioStream writes "check --scenarios all": the findings of every
// scenario in turn, each as soon as it is checked (so that no scenario's
// findings need be held once written), then the table of the worst
// finding of every check, device and stage over them all. Text and
// Markdown give each scenario's tables under its name; CSV gives every
// scenario's rows under one header, with the scenario column; JSON gives
// one document, the worst findings' with a list scenario_findings of
// each scenario's pairs, findings and summary.
type ScenarioStream struct {
	format string
	w      io.Writer
	n      int
}

// NewScenarioStream returns a stream in format (text, md, csv or json).
func NewScenarioStream(format string, w io.Writer) *ScenarioStream {
	return &ScenarioStream{format: format, w: w}
}

// jsonScenarioFindings is one scenario in scenario_findings.
type jsonScenarioFindings struct {
	Name     string        `json:"name"`
	Changes  string        `json:"changes"`
	Criteria []string      `json:"criteria"`
	Pairs    []jsonPair    `json:"pairs"`
	Findings []jsonFinding `json:"findings"`
	Summary  jsonSummary   `json:"summary"`
}

// Scenario writes the findings of one scenario (f.Section names it).
func (s *ScenarioStream) Scenario(f *Findings) error {
	s.n++
	switch s.format {
	case "text":
		if s.n == 1 {
			fmt.Fprintf(s.w, "%s\n", wrap(fmt.Sprintf("tripgrade coordination check: %s, scenario by scenario (the worst finding of each check, device and stage over them all follows at the end)", f.Study), TextWidth, "  "))
		}
		return f.WriteText(s.w)
	case "md":
		if s.n == 1 {
			fmt.Fprintf(s.w, "# Coordination check: %s, scenario by scenario\n\n> %s\n\nThe worst finding of each check, device and stage over them all follows at the end.\n", md(f.Study), Caution)
		}
		return f.WriteMarkdown(s.w)
	case "csv":
		return f.WriteCSVRows(s.w, s.n == 1)
	}
	d := f.jsonDoc()
	one := jsonScenarioFindings{Criteria: d.Criteria, Pairs: d.Pairs, Findings: d.Findings, Summary: d.Summary}
	if f.Section != nil {
		one.Name, one.Changes = f.Section.Name, f.Section.Changes
	}
	b, err := json.MarshalIndent(one, "    ", "  ")
	if err != nil {
		return err
	}
	lead := ",\n    "
	if s.n == 1 {
		lead = "{\n  \"scenario_findings\": [\n    "
	}
	_, err = fmt.Fprintf(s.w, "%s%s", lead, b)
	return err
}

// Finish writes the worst findings over every scenario.
func (s *ScenarioStream) Finish(worst *Findings) error {
	switch s.format {
	case "text":
		which := "all scenarios"
		if worst.Picked {
			which = "the scenarios above"
		}
		fmt.Fprintf(s.w, "\n=== %s: the worst finding of each check, device and stage ===\n\n", which)
		return worst.WriteText(s.w)
	case "md":
		fmt.Fprintf(s.w, "\n")
		return worst.WriteMarkdown(s.w)
	case "csv":
		return nil
	}
	var buf bytes.Buffer
	if err := worst.WriteJSON(&buf); err != nil {
		return err
	}
	rest := bytes.TrimPrefix(buf.Bytes(), []byte("{\n"))
	if s.n == 0 {
		_, err := s.w.Write(buf.Bytes())
		return err
	}
	_, err := fmt.Fprintf(s.w, "\n  ],\n%s", rest)
	return err
}
