package report

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"

	"tripgrade/coord"
)

// SettingsDiff is what changed between two studies' settings and what
// that did to every finding.
type SettingsDiff struct {
	Old, New           string // the files as the user named them
	OldStudy, NewStudy string // their study names
	Changes            []coord.SettingChange
	// NetworkNote is set when the networks differ too, so that a margin
	// may have moved for another reason than a setting.
	NetworkNote string
	Margins     *Comparison
}

func changeText(c coord.SettingChange) string {
	if c.What != "changed" {
		return c.What
	}
	parts := make([]string, len(c.Fields))
	for i, f := range c.Fields {
		parts[i] = f.Name + " " + f.Old + " → " + f.New
	}
	return strings.Join(parts, "; ")
}

func (d *SettingsDiff) header(w io.Writer, mdown bool) {
	esc := func(s string) string { return s }
	if mdown {
		esc = md
	}
	fmt.Fprintf(w, "%s → %s (%q → %q)\n", esc(d.Old), esc(d.New), d.OldStudy, d.NewStudy)
	if d.NetworkNote != "" {
		fmt.Fprintf(w, "\n%s\n", esc(d.NetworkNote))
	}
}

// WriteText writes the setting changes, then the comparison of every
// finding, then the caution.
func (d *SettingsDiff) WriteText(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprint(ew, "tripgrade diff: ")
	d.header(ew, false)
	fmt.Fprintf(ew, "\nSETTINGS CHANGED (%d)\n", len(d.Changes))
	if len(d.Changes) == 0 {
		fmt.Fprintln(ew, "no setting changed")
	} else {
		t := &textTable{head: []string{"device", "stage", "change"}}
		for _, c := range d.Changes {
			t.rows = append(t.rows, []string{c.Device, dash(c.Stage), changeText(c)})
			t.under = append(t.under, "")
		}
		t.write(ew)
	}
	d.Margins.writeText(ew)
	fmt.Fprintf(ew, "\n%s\n", Caution)
	return ew.err
}

// WriteMarkdown writes the same as Markdown.
func (d *SettingsDiff) WriteMarkdown(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprint(ew, "# Settings diff: ")
	d.header(ew, true)
	fmt.Fprintf(ew, "\n> %s\n\n## Settings changed (%d)\n\n", Caution, len(d.Changes))
	if len(d.Changes) == 0 {
		fmt.Fprintln(ew, "No setting changed.")
	} else {
		fmt.Fprintln(ew, "| device | stage | change |\n| --- | --- | --- |")
		for _, c := range d.Changes {
			fmt.Fprintf(ew, "| %s | %s | %s |\n", md(c.Device), md(c.Stage), md(changeText(c)))
		}
	}
	d.Margins.writeMarkdown(ew)
	return ew.err
}

// WriteJSON writes the diff as one JSON document of the findings
// schema's version.
func (d *SettingsDiff) WriteJSON(w io.Writer) error {
	type field struct {
		Name string `json:"setting"`
		Old  string `json:"old"`
		New  string `json:"new"`
	}
	type change struct {
		Device string  `json:"device"`
		Stage  string  `json:"stage,omitempty"`
		What   string  `json:"change"`
		Fields []field `json:"settings,omitempty"`
	}
	doc := struct {
		Schema      int             `json:"schema_version"`
		Old         string          `json:"old"`
		New         string          `json:"new"`
		Caution     string          `json:"caution"`
		NetworkNote string          `json:"network_note,omitempty"`
		Changes     []change        `json:"settings_changed"`
		Margins     *jsonComparison `json:"findings"`
	}{Schema: SchemaVersion, Old: d.Old, New: d.New, Caution: Caution, NetworkNote: d.NetworkNote, Changes: []change{}, Margins: d.Margins.json()}
	for _, c := range d.Changes {
		j := change{Device: c.Device, Stage: c.Stage, What: c.What}
		for _, f := range c.Fields {
			j.Fields = append(j.Fields, field{f.Name, f.Old, f.New})
		}
		doc.Changes = append(doc.Changes, j)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
