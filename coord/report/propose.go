package report

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/propose"
)

// Proposal renders a setting proposal (package coord/propose): the
// proposed multipliers with what binds each, the margins before and
// after, the conflicts, and the findings the proposal leaves failing.
type Proposal struct {
	Study    string
	Verified bool
	Method   string   // how the multipliers were found, in words
	Notes    []string // defaults used, devices kept
	Settings []ProposedSetting
	// ChosePickups is true for a proposal made with --pickups: Pickups
	// are then the chosen pickups and KeptPickups the stages it left as
	// given.
	ChosePickups bool
	Pickups      []ProposedPickup
	KeptPickups  []KeptPickupRow
	Margins      []MarginChange
	// Conflicts describe the margins no multipliers within their ranges
	// meet; Unchanged and Unresolved are the failing findings of the
	// proposal (see propose.Proposal).
	Conflicts                          []ConflictRow
	Conflicting, Unchanged, Unresolved []coord.Finding
	// ShownConflicts caps the conflicts the text and Markdown tables list
	// (0: all).
	ShownConflicts int
}

// ProposedSetting is one multiplier of the proposal.
type ProposedSetting struct {
	Device, Stage, Name string // Name: TMS or TD
	Old, New, Least     float64
	Range               coord.Range
	Declared            bool
	Binding             string // the margin that holds it, or "bottom of the range"
}

// MarginChange is one finding's margin before and after.
type MarginChange struct {
	Check                  coord.CheckKind
	Device, Other          string
	Before, After          *coord.Finding // nil when the finding is absent
	RequiredS, MarginDiffS float64
}

// ConflictRow is one conflict in words.
type ConflictRow struct {
	Setting string   `json:"setting"` // "FM 51 TMS", or "" for a margin between fixed settings
	What    string   `json:"problem"` // what is asked and why it cannot be had
	Chain   []string `json:"margins"` // the margins behind it, last first
}

// NewProposal prepares a proposal for rendering.
func NewProposal(pr *propose.Proposal) *Proposal {
	s := pr.Study
	out := &Proposal{Study: s.Name, Verified: pr.Verified(), ShownConflicts: 40,
		Conflicting: pr.Conflicting, Unchanged: pr.Unchanged, Unresolved: pr.Unresolved}
	out.Method = fmt.Sprintf("least multipliers meeting every margin the checker judges: %d margins linearised, %d constraints kept after removing dominated ones, %d groups of linked multipliers (%d solved by gonum's simplex, the rest by label correcting); rounded up to each range's step and verified by the checker (%d round(s))",
		pr.Margins, pr.Constraints, pr.Groups, pr.LPGroups, pr.Rounds)
	if pr.Pickups != nil || pr.KeptPickups != nil {
		out.ChosePickups = true
		out.Pickups, out.KeptPickups = newPickups(pr)
		out.Method = fmt.Sprintf("pickups: %d stages set from their declared ranges between the load and sensitivity limits, the lowest admissible unless a higher one lets more margins be met within the multiplier ranges (%d candidate settings scored); then the ",
			len(pr.Pickups), pr.PickupEvals) + out.Method
	}
	for i, v := range pr.Vars {
		d := s.Devices[v.Device]
		st := d.Stages[v.Stage]
		ps := ProposedSetting{Device: d.Name, Stage: st.Label, Name: st.Shape.MultiplierName(), Old: v.Was, New: pr.X[i],
			Least: pr.Continuous[i], Range: v.Range, Declared: v.Declared, Binding: propose.BindingText(s, pr.Binding[i])}
		out.Settings = append(out.Settings, ps)
	}
	out.Margins = marginChanges(pr.Before, pr.After)
	for _, c := range pr.Conflicts {
		out.Conflicts = append(out.Conflicts, conflictRow(pr, c))
	}
	return out
}

// marginChanges pairs the grading and discrimination findings of two
// runs and keeps those whose margin or verdict moved.
func marginChanges(before, after *coord.Result) []MarginChange {
	type key struct {
		check         coord.CheckKind
		device, other string
	}
	old := map[key]*coord.Finding{}
	for i := range before.Findings {
		f := &before.Findings[i]
		if f.Check == coord.Grading || f.Check == coord.Discrimination {
			old[key{f.Check, f.Device, f.Other}] = f
		}
	}
	var out []MarginChange
	for i := range after.Findings {
		f := &after.Findings[i]
		if f.Check != coord.Grading && f.Check != coord.Discrimination {
			continue
		}
		b := old[key{f.Check, f.Device, f.Other}]
		if b != nil && b.Verdict == f.Verdict && b.Valid == f.Valid && math.Abs(b.Margin-f.Margin) < 5e-4 {
			continue
		}
		out = append(out, MarginChange{Check: f.Check, Device: f.Device, Other: f.Other, Before: b, After: f, RequiredS: f.Required})
	}
	return out
}

func conflictRow(pr *propose.Proposal, c propose.Conflict) ConflictRow {
	var r ConflictRow
	for _, src := range c.Chain {
		r.Chain = append(r.Chain, propose.Describe(pr.Study, src))
	}
	if c.Var < 0 {
		r.What = fmt.Sprintf("no multiplier acts on this margin (fixed stages, fuses or kept devices): it falls short by %.3f s", c.ShortS)
		return r
	}
	v := pr.Vars[c.Var]
	d := pr.Study.Devices[v.Device]
	st := d.Stages[v.Stage]
	r.Setting = fmt.Sprintf("%s %s %s", d.Name, st.Label, st.Shape.MultiplierName())
	switch {
	case c.Rounding:
		r.What = fmt.Sprintf("its steps give no setting between what the margins below ask (%s) and the bound above it (%s)", fmtX(c.NeedX), fmtX(c.LimitX))
	case c.Below:
		r.What = fmt.Sprintf("the margin asks for at most %s, below the bottom of its range (%s)", fmtX(c.NeedX), fmtX(c.LimitX))
	default:
		r.What = fmt.Sprintf("the margins ask for %s, above the top of its range or bound (%s); set to the top", fmtX(c.NeedX), fmtX(c.LimitX))
	}
	if c.More > 0 {
		r.What += fmt.Sprintf("; %d more margins ask too much of it", c.More)
	}
	return r
}

// fmtX prints a multiplier.
func fmtX(x float64) string { return fmt.Sprintf("%.4g", x) }

// fmtRange prints a range as "0.05–1 step 0.01".
func fmtRange(r coord.Range, declared bool) string {
	s := fmt.Sprintf("%g–%g", r.Min, r.Max)
	if r.Step > 0 {
		s += fmt.Sprintf(" step %g", r.Step)
	}
	if !declared {
		s += " (default)"
	}
	return s
}

func (p *Proposal) summary() string {
	changed := 0
	for _, s := range p.Settings {
		if s.New != s.Old {
			changed++
		}
	}
	if !p.Verified {
		return fmt.Sprintf("NOT VERIFIED: the checker still fails %d findings on the proposal that no conflict accounts for; no settings are proposed", len(p.Unresolved))
	}
	line := fmt.Sprintf("verified by the checker: %d of %d multipliers changed", changed, len(p.Settings))
	if p.ChosePickups {
		line += fmt.Sprintf(", %d of %d pickups", p.pickupsChanged(), len(p.Pickups))
	}
	if len(p.Conflicts) > 0 {
		line += fmt.Sprintf("; %d conflicts no multiplier can resolve (listed), %d findings still fail by them", len(p.Conflicts), len(p.Conflicting))
	}
	if len(p.Unchanged) > 0 {
		line += fmt.Sprintf("; %d findings fail before and after, unmoved by %s", len(p.Unchanged), p.moved())
	}
	return line
}

// moved names what the proposal sets.
func (p *Proposal) moved() string {
	if p.ChosePickups {
		return "pickups or multipliers"
	}
	return "multipliers"
}

func marginCell(f *coord.Finding) string {
	if f == nil {
		return "-"
	}
	if !f.Valid {
		return f.Verdict.String()
	}
	return fmt.Sprintf("%+.3f s %s", f.Margin, f.Verdict)
}

// WriteText writes the proposal as text tables.
func (p *Proposal) WriteText(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "PROPOSED SETTINGS: %s\n%s\n\n%s\n", p.Study, Caution, p.Method)
	for _, n := range p.Notes {
		fmt.Fprintf(ew, "%s\n", n)
	}
	if p.Verified {
		p.writePickupsText(ew)
		fmt.Fprintf(ew, "\nMULTIPLIERS\n")
		t := &textTable{head: []string{"relay", "stage", "setting", "old", "new", "least", "range"}}
		for _, s := range p.Settings {
			t.rows = append(t.rows, []string{s.Device, s.Stage, s.Name, fmtX(s.Old), fmtX(s.New), fmtX(s.Least), fmtRange(s.Range, s.Declared)})
			t.under = append(t.under, "bound by "+s.Binding)
		}
		t.write(ew)
		if len(p.Margins) > 0 {
			fmt.Fprintf(ew, "\nMARGINS THAT MOVE\n")
			t := &textTable{head: []string{"check", "device", "other", "before", "after", "required"}}
			for _, m := range p.Margins {
				t.rows = append(t.rows, []string{m.Check.String(), m.Device, m.Other, marginCell(m.Before), marginCell(m.After), fmt.Sprintf("%.3f s", m.RequiredS)})
				t.under = append(t.under, "")
			}
			t.write(ew)
		}
	}
	if !p.Verified && len(p.KeptPickups) > 0 {
		(&Proposal{KeptPickups: p.KeptPickups}).writePickupsText(ew)
	}
	p.writeConflictsText(ew)
	p.writeFindingsText(ew, "STILL FAILING, BY THE CONFLICTS", p.Conflicting)
	p.writeFindingsText(ew, "STILL FAILING, UNMOVED BY "+strings.ToUpper(p.moved()), p.Unchanged)
	p.writeFindingsText(ew, "STILL FAILING, NOT ACCOUNTED FOR", p.Unresolved)
	fmt.Fprintf(ew, "\n%s\n%s\n", p.summary(), Caution)
	return ew.err
}

func (p *Proposal) writeConflictsText(ew io.Writer) {
	if len(p.Conflicts) == 0 {
		return
	}
	fmt.Fprintf(ew, "\nCONFLICTS\n")
	for i, c := range p.Conflicts {
		if p.ShownConflicts > 0 && i == p.ShownConflicts {
			fmt.Fprintf(ew, "... and %d more (all of them in --format csv or json)\n", len(p.Conflicts)-i)
			break
		}
		head := c.What
		if c.Setting != "" {
			head = c.Setting + ": " + c.What
		}
		fmt.Fprintf(ew, "%d. %s\n", i+1, head)
		for _, m := range c.Chain {
			fmt.Fprintf(ew, "   ↳ %s\n", m)
		}
	}
}

func (p *Proposal) writeFindingsText(ew io.Writer, title string, fs []coord.Finding) {
	if len(fs) == 0 {
		return
	}
	fmt.Fprintf(ew, "\n%s\n", title)
	t := &textTable{head: []string{"check", "device", "other", "stage", "margin", "note"}}
	for _, f := range fs {
		m := "-"
		if f.Valid {
			m = fmt.Sprintf("%+.3f %s", f.Margin, f.Unit)
		}
		t.rows = append(t.rows, []string{f.Check.String(), f.Device, f.Other, f.Stage, m, ""})
		t.under = append(t.under, f.Note)
	}
	t.write(ew)
}

// WriteMarkdown writes the proposal as Markdown tables.
func (p *Proposal) WriteMarkdown(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "# Proposed settings: %s\n\n> %s\n\n%s\n", md(p.Study), Caution, md(p.Method))
	for _, n := range p.Notes {
		fmt.Fprintf(ew, "\n%s\n", md(n))
	}
	if p.Verified {
		p.writePickupsMarkdown(ew)
	} else if len(p.KeptPickups) > 0 {
		(&Proposal{KeptPickups: p.KeptPickups}).writePickupsMarkdown(ew)
	}
	if p.Verified {
		fmt.Fprintf(ew, "\n## Multipliers\n\n| relay | stage | setting | old | new | least | range | bound by |\n| --- | --- | --- | --- | --- | --- | --- | --- |\n")
		for _, s := range p.Settings {
			fmt.Fprintf(ew, "| %s | %s | %s | %s | %s | %s | %s | %s |\n", md(s.Device), md(s.Stage), s.Name, fmtX(s.Old), fmtX(s.New), fmtX(s.Least), fmtRange(s.Range, s.Declared), md(s.Binding))
		}
		if len(p.Margins) > 0 {
			fmt.Fprintf(ew, "\n## Margins that move\n\n| check | device | other | before | after | required |\n| --- | --- | --- | --- | --- | --- |\n")
			for _, m := range p.Margins {
				fmt.Fprintf(ew, "| %s | %s | %s | %s | %s | %.3f s |\n", m.Check, md(m.Device), md(m.Other), marginCell(m.Before), marginCell(m.After), m.RequiredS)
			}
		}
	}
	if len(p.Conflicts) > 0 {
		fmt.Fprintf(ew, "\n## Conflicts\n\n")
		for i, c := range p.Conflicts {
			if p.ShownConflicts > 0 && i == p.ShownConflicts {
				fmt.Fprintf(ew, "\n… and %d more (all of them in --format csv or json)\n", len(p.Conflicts)-i)
				break
			}
			head := md(c.What)
			if c.Setting != "" {
				head = "**" + md(c.Setting) + "**: " + head
			}
			fmt.Fprintf(ew, "%d. %s\n", i+1, head)
			for _, m := range c.Chain {
				fmt.Fprintf(ew, "   - %s\n", md(m))
			}
		}
	}
	for _, part := range []struct {
		title string
		fs    []coord.Finding
	}{{"Still failing, by the conflicts", p.Conflicting}, {"Still failing, unmoved by " + p.moved(), p.Unchanged}, {"Still failing, not accounted for", p.Unresolved}} {
		if len(part.fs) == 0 {
			continue
		}
		fmt.Fprintf(ew, "\n## %s\n\n| check | device | other | stage | note |\n| --- | --- | --- | --- | --- |\n", part.title)
		for _, f := range part.fs {
			fmt.Fprintf(ew, "| %s | %s | %s | %s | %s |\n", f.Check, md(f.Device), md(f.Other), md(f.Stage), md(f.Note))
		}
	}
	fmt.Fprintf(ew, "\n**%s**\n\n> %s\n", md(p.summary()), Caution)
	return ew.err
}

// WriteCSV writes the proposal as one long table: a row per multiplier,
// per margin that moves, per conflict and per failing finding.
func (p *Proposal) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"row", "device", "stage", "other", "setting", "old", "new", "least", "range", "before_margin_s", "after_margin_s", "required_s", "verdict_before", "verdict_after", "note"})
	if p.Verified {
		p.writePickupsCSV(cw)
	} else {
		(&Proposal{KeptPickups: p.KeptPickups}).writePickupsCSV(cw)
	}
	if p.Verified {
		for _, s := range p.Settings {
			_ = cw.Write([]string{"multiplier", textCell(s.Device), textCell(s.Stage), "", s.Name, numberCell(s.Old), numberCell(s.New), numberCell(s.Least),
				fmtRange(s.Range, s.Declared), "", "", "", "", "", textCell("bound by " + s.Binding)})
		}
		for _, m := range p.Margins {
			b, vb := "", ""
			if m.Before != nil {
				vb = m.Before.Verdict.String()
				if m.Before.Valid {
					b = numberCell(m.Before.Margin)
				}
			}
			a := ""
			if m.After.Valid {
				a = numberCell(m.After.Margin)
			}
			_ = cw.Write([]string{"margin", textCell(m.Device), "", textCell(m.Other), m.Check.Slug(), "", "", "", "", b, a, numberCell(m.RequiredS), vb, m.After.Verdict.String(), ""})
		}
	}
	for _, c := range p.Conflicts {
		_ = cw.Write([]string{"conflict", textCell(c.Setting), "", "", "", "", "", "", "", "", "", "", "", "", textCell(c.What + ": " + strings.Join(c.Chain, " ← "))})
	}
	for _, part := range []struct {
		row string
		fs  []coord.Finding
	}{{"conflict_failure", p.Conflicting}, {"unchanged_failure", p.Unchanged}, {"unresolved_failure", p.Unresolved}} {
		for _, f := range part.fs {
			_ = cw.Write([]string{part.row, textCell(f.Device), textCell(f.Stage), textCell(f.Other), f.Check.Slug(), "", "", "", "", "", numberCell(f.Margin), "", "", f.Verdict.String(), textCell(f.Note)})
		}
	}
	_ = cw.Write([]string{"summary", "", "", "", "", "", "", "", "", "", "", "", "", "", textCell(p.summary())})
	_ = cw.Write([]string{"caution", "", "", "", "", "", "", "", "", "", "", "", "", "", Caution})
	cw.Flush()
	return cw.Error()
}

// WriteJSON writes the proposal as one JSON document.
func (p *Proposal) WriteJSON(w io.Writer) error {
	type setting struct {
		Device   string     `json:"device"`
		Stage    string     `json:"stage"`
		Setting  string     `json:"setting"`
		Old      jsonNumber `json:"old"`
		New      *float64   `json:"new,omitempty"`
		Least    jsonNumber `json:"least"`
		Range    [3]float64 `json:"range"`
		Declared bool       `json:"range_declared"`
		Binding  string     `json:"bound_by"`
	}
	type margin struct {
		Check    string      `json:"check"`
		Device   string      `json:"device"`
		Other    string      `json:"other"`
		Before   *jsonNumber `json:"before_margin_s"`
		After    *jsonNumber `json:"after_margin_s"`
		Required jsonNumber  `json:"required_s"`
		VerdictB string      `json:"verdict_before,omitempty"`
		VerdictA string      `json:"verdict_after"`
	}
	type finding struct {
		Check  string      `json:"check"`
		Device string      `json:"device"`
		Other  string      `json:"other"`
		Stage  string      `json:"stage"`
		Margin *jsonNumber `json:"margin,omitempty"`
		Note   string      `json:"note"`
	}
	doc := struct {
		Study       string           `json:"study"`
		Caution     string           `json:"caution"`
		Verified    bool             `json:"verified"`
		Summary     string           `json:"summary"`
		Method      string           `json:"method"`
		Notes       []string         `json:"notes,omitempty"`
		Pickups     *[]pickupJSON    `json:"pickups,omitempty"`
		KeptPickups *[]KeptPickupRow `json:"pickups_kept,omitempty"`
		Settings    []setting        `json:"multipliers"`
		Margins     []margin         `json:"margins"`
		Conflicts   []ConflictRow    `json:"conflicts"`
		Conflicting []finding        `json:"conflict_failures"`
		Unchanged   []finding        `json:"unchanged_failures"`
		Unresolved  []finding        `json:"unresolved_failures"`
	}{Study: p.Study, Caution: Caution, Verified: p.Verified, Summary: p.summary(), Method: p.Method, Notes: p.Notes,
		Settings: []setting{}, Margins: []margin{}, Conflicts: p.Conflicts, Conflicting: []finding{}, Unchanged: []finding{}, Unresolved: []finding{}}
	if p.ChosePickups {
		ps, kept := p.pickupsJSON()
		doc.Pickups, doc.KeptPickups = &ps, &kept
	}
	if doc.Conflicts == nil {
		doc.Conflicts = []ConflictRow{}
	}
	num := func(f *coord.Finding) *jsonNumber {
		if f == nil || !f.Valid {
			return nil
		}
		v := jsonNumber(f.Margin)
		return &v
	}
	for _, s := range p.Settings {
		row := setting{Device: s.Device, Stage: s.Stage, Setting: s.Name, Old: jsonNumber(s.Old), Least: jsonNumber(s.Least),
			Range: [3]float64{s.Range.Min, s.Range.Max, s.Range.Step}, Declared: s.Declared, Binding: s.Binding}
		if p.Verified {
			v := s.New
			row.New = &v
		}
		doc.Settings = append(doc.Settings, row)
	}
	if p.Verified {
		for _, m := range p.Margins {
			r := margin{Check: m.Check.Slug(), Device: m.Device, Other: m.Other, Before: num(m.Before), After: num(m.After),
				Required: jsonNumber(m.RequiredS), VerdictA: m.After.Verdict.String()}
			if m.Before != nil {
				r.VerdictB = m.Before.Verdict.String()
			}
			doc.Margins = append(doc.Margins, r)
		}
	}
	for _, f := range p.Conflicting {
		doc.Conflicting = append(doc.Conflicting, finding{f.Check.Slug(), f.Device, f.Other, f.Stage, num(&f), f.Note})
	}
	for _, f := range p.Unchanged {
		doc.Unchanged = append(doc.Unchanged, finding{f.Check.Slug(), f.Device, f.Other, f.Stage, num(&f), f.Note})
	}
	for _, f := range p.Unresolved {
		doc.Unresolved = append(doc.Unresolved, finding{f.Check.Slug(), f.Device, f.Other, f.Stage, num(&f), f.Note})
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(doc)
}
