package report

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strings"

	"tripgrade/coord"
)

// ReadSnapshots reads the findings of an earlier run from its JSON (check
// --format json), for a baseline comparison. It refuses a document
// without a schema_version, or of a newer version than SchemaVersion.
func ReadSnapshots(r io.Reader) ([]coord.Snapshot, error) {
	var doc struct {
		Schema   *int `json:"schema_version"`
		Findings []struct {
			Check    string   `json:"check"`
			Verdict  string   `json:"verdict"`
			Device   string   `json:"device"`
			Other    string   `json:"other"`
			Stage    string   `json:"stage"`
			Margin   *float64 `json:"margin"`
			Unit     string   `json:"unit"`
			Scenario string   `json:"scenario"`
			Accepted *struct {
				Was string `json:"was"`
			} `json:"accepted"`
		} `json:"findings"`
	}
	if err := json.NewDecoder(r).Decode(&doc); err != nil {
		return nil, fmt.Errorf("not a findings JSON document: %v", err)
	}
	switch {
	case doc.Schema == nil:
		return nil, errors.New("no schema_version: not the JSON of tripgrade check --format json")
	case *doc.Schema > SchemaVersion || *doc.Schema < 1:
		return nil, fmt.Errorf("schema_version %d: this tripgrade reads versions 1 to %d", *doc.Schema, SchemaVersion)
	}
	out := []coord.Snapshot{}
	for i, f := range doc.Findings {
		if f.Check == "" || f.Device == "" || f.Verdict == "" {
			return nil, fmt.Errorf("finding %d: check, device and verdict are required", i+1)
		}
		s := coord.Snapshot{Check: f.Check, Device: f.Device, Other: f.Other, Stage: f.Stage, Verdict: f.Verdict, Unit: f.Unit, Scenario: f.Scenario}
		if f.Margin != nil {
			s.Margin, s.HasMargin = *f.Margin, true
		}
		out = append(out, s)
	}
	return out, nil
}

// Comparison is a run compared with a baseline.
type Comparison struct {
	File    string // the baseline as the user named it
	Changes []coord.Change
	// Heading replaces "compared with baseline FILE" as the section's
	// title when set.
	Heading string
}

func (c *Comparison) heading() string {
	if c.Heading != "" {
		return c.Heading
	}
	return "Compared with baseline " + c.File
}

// Count returns the number of changes of a kind.
func (c *Comparison) Count(k coord.ChangeKind) int {
	n := 0
	for _, ch := range c.Changes {
		if ch.Kind == k {
			n++
		}
	}
	return n
}

// Gating returns the number of failing findings that are new or worse.
func (c *Comparison) Gating() int {
	n := 0
	for _, ch := range c.Changes {
		if ch.Gates() {
			n++
		}
	}
	return n
}

// Summary is the comparison's count line.
func (c *Comparison) Summary() string {
	var parts []string
	for _, k := range coord.ChangeKinds {
		parts = append(parts, fmt.Sprintf("%d %s", c.Count(k), k))
	}
	return strings.Join(parts, ", ") + fmt.Sprintf("; %d failing finding(s) new or worse", c.Gating())
}

// changed returns every change but the unchanged findings, in report
// order of kind.
func (c *Comparison) changed() []coord.Change {
	var out []coord.Change
	for _, k := range coord.ChangeKinds {
		if k == coord.Same {
			continue
		}
		for _, ch := range c.Changes {
			if ch.Kind == k {
				out = append(out, ch)
			}
		}
	}
	return out
}

// either returns the snapshot that identifies a change.
func either(ch coord.Change) *coord.Snapshot {
	if ch.After != nil {
		return ch.After
	}
	return ch.Before
}

// verdictText and marginText give "before → after".
func verdictText(ch coord.Change) string {
	return side(ch.Before, func(s *coord.Snapshot) string { return s.Verdict }) + " → " +
		side(ch.After, func(s *coord.Snapshot) string { return s.Verdict })
}

func marginText(ch coord.Change) string {
	m := func(s *coord.Snapshot) string {
		if !s.HasMargin {
			return "-"
		}
		return signed(s.Margin, s.Unit)
	}
	return side(ch.Before, m) + " → " + side(ch.After, m)
}

func side(s *coord.Snapshot, f func(*coord.Snapshot) string) string {
	if s == nil {
		return "none"
	}
	return f(s)
}

// writeText writes the comparison section of the text report.
func (c *Comparison) writeText(w io.Writer) {
	if c == nil {
		return
	}
	fmt.Fprintf(w, "\n%s\n%s\n", strings.ToUpper(c.heading()), c.Summary())
	ch := c.changed()
	if len(ch) == 0 {
		fmt.Fprintln(w, "no finding changed")
		return
	}
	t := &textTable{head: []string{"change", "check", "device", "other", "stage", "verdict", "margin"}}
	scenarios := c.scenarios()
	if scenarios {
		t.head = append(t.head, "scenario")
	}
	for _, x := range ch {
		s := either(x)
		row := []string{x.Kind.String(), s.Check, s.Device, dash(s.Other), dash(s.Stage), verdictText(x), marginText(x)}
		if scenarios {
			row = append(row, scenarioText(x))
		}
		t.rows = append(t.rows, row)
		t.under = append(t.under, "")
	}
	t.write(w)
}

// scenarios reports whether the findings compared name scenarios.
func (c *Comparison) scenarios() bool {
	for _, x := range c.Changes {
		if (x.Before != nil && x.Before.Scenario != "") || (x.After != nil && x.After.Scenario != "") {
			return true
		}
	}
	return false
}

// scenarioText gives a change's scenario, "before → after" when it moved.
func scenarioText(ch coord.Change) string {
	sc := func(s *coord.Snapshot) string { return dash(s.Scenario) }
	if ch.Before != nil && ch.After != nil && ch.Before.Scenario != ch.After.Scenario {
		return sc(ch.Before) + " → " + sc(ch.After)
	}
	return sc(either(ch))
}

// writeMarkdown writes the comparison section of the Markdown report.
func (c *Comparison) writeMarkdown(w io.Writer) {
	if c == nil {
		return
	}
	fmt.Fprintf(w, "\n## %s\n\n%s\n", md(c.heading()), c.Summary())
	ch := c.changed()
	if len(ch) == 0 {
		fmt.Fprintln(w, "\nNo finding changed.")
		return
	}
	scenarios := c.scenarios()
	head, rule := "| change | check | device | other | stage | verdict | margin |", "| --- | --- | --- | --- | --- | --- | ---: |"
	if scenarios {
		head, rule = head+" scenario |", rule+" --- |"
	}
	fmt.Fprintf(w, "\n%s\n%s\n", head, rule)
	for _, x := range ch {
		s := either(x)
		line := fmt.Sprintf("| %s | %s | %s | %s | %s | %s | %s |", x.Kind, md(s.Check), md(s.Device), md(s.Other), md(s.Stage), verdictText(x), md(marginText(x)))
		if scenarios {
			line += " " + md(scenarioText(x)) + " |"
		}
		fmt.Fprintln(w, line)
	}
}

type jsonSide struct {
	Verdict  string   `json:"verdict"`
	Margin   *float64 `json:"margin,omitempty"`
	Scenario string   `json:"scenario,omitempty"`
}

type jsonChange struct {
	Change string    `json:"change"`
	Check  string    `json:"check"`
	Device string    `json:"device"`
	Other  string    `json:"other,omitempty"`
	Stage  string    `json:"stage,omitempty"`
	Unit   string    `json:"unit,omitempty"`
	Before *jsonSide `json:"before,omitempty"`
	After  *jsonSide `json:"after,omitempty"`
}

type jsonComparison struct {
	File    string         `json:"file"`
	Counts  map[string]int `json:"counts"`
	Gating  int            `json:"new_or_worse_failures"`
	Changes []jsonChange   `json:"changes"`
}

func (c *Comparison) json() *jsonComparison {
	if c == nil {
		return nil
	}
	j := &jsonComparison{File: c.File, Counts: map[string]int{}, Gating: c.Gating(), Changes: []jsonChange{}}
	for _, k := range coord.ChangeKinds {
		j.Counts[k.String()] = c.Count(k)
	}
	js := func(s *coord.Snapshot) *jsonSide {
		if s == nil {
			return nil
		}
		out := &jsonSide{Verdict: s.Verdict, Scenario: s.Scenario}
		if s.HasMargin {
			m := s.Margin
			out.Margin = &m
		}
		return out
	}
	for _, x := range c.changed() {
		s := either(x)
		j.Changes = append(j.Changes, jsonChange{x.Kind.String(), s.Check, s.Device, s.Other, s.Stage, s.Unit, js(x.Before), js(x.After)})
	}
	return j
}
