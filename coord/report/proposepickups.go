package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"strings"

	"tripgrade/coord/propose"
)

// ProposedPickup is one pickup of a proposal made with --pickups: the
// stage's pickup before and after, its admissible interval and the
// limits that set it, and what holds the chosen pickup.
type ProposedPickup struct {
	Device, Stage     string
	Old, New          float64
	Low, High         float64 // the admissible interval, primary amperes
	LowBy, HighBy     string  // the limits that set its ends
	Bound             string  // load, sensitivity, range, CT, grading or checker
	BoundNote         string  // the figures behind it
	LowNote, HighNote string
}

// KeptPickupRow is a stage whose pickup a proposal left as given.
type KeptPickupRow struct {
	Device string `json:"device"`
	Stage  string `json:"stage"`
	Why    string `json:"why"`
}

// newPickups prepares the pickups of a proposal.
func newPickups(pr *propose.Proposal) ([]ProposedPickup, []KeptPickupRow) {
	s := pr.Study
	var out []ProposedPickup
	for k, v := range pr.Pickups {
		d := s.Devices[v.Device]
		by := pr.PickupBy[k]
		out = append(out, ProposedPickup{Device: d.Name, Stage: d.Stages[v.Stage].Label, Old: v.Was, New: pr.P[k],
			Low: v.Low, High: v.High, LowBy: v.LowBy.Kind.String(), HighBy: v.HighBy.Kind.String(),
			Bound: by.Kind.String(), BoundNote: by.Note, LowNote: v.LowBy.Note, HighNote: v.HighBy.Note})
	}
	var kept []KeptPickupRow
	for _, k := range pr.KeptPickups {
		d := s.Devices[k.Device]
		kept = append(kept, KeptPickupRow{Device: d.Name, Stage: d.Stages[k.Stage].Label, Why: k.Why})
	}
	return out, kept
}

// pickupsChanged counts the pickups the proposal moves.
func (p *Proposal) pickupsChanged() int {
	n := 0
	for _, q := range p.Pickups {
		if q.New != q.Old {
			n++
		}
	}
	return n
}

func fmtPickup(a float64) string { return fmt.Sprintf("%.4g A", a) }

// interval prints an admissible interval with the limits that set it.
func (q ProposedPickup) interval() string {
	return fmt.Sprintf("%s (%s) – %s (%s)", fmtPickup(q.Low), q.LowBy, fmtPickup(q.High), q.HighBy)
}

// why gives what holds the pickup and the limits of its interval that
// the first part does not already name.
func (q ProposedPickup) why() string {
	out := q.BoundNote
	if q.LowNote != q.BoundNote {
		out += "; lowest: " + q.LowNote
	}
	if !strings.Contains(q.BoundNote, q.HighNote) {
		out += "; highest: " + q.HighNote
	}
	return out
}

func (p *Proposal) writePickupsText(ew io.Writer) {
	if len(p.Pickups) > 0 {
		fmt.Fprintf(ew, "\nPICKUPS\n")
		t := &textTable{head: []string{"relay", "stage", "old", "new", "admissible", "bound by"}}
		for _, q := range p.Pickups {
			t.rows = append(t.rows, []string{q.Device, q.Stage, fmtPickup(q.Old), fmtPickup(q.New), q.interval(), q.Bound})
			t.under = append(t.under, q.why())
		}
		t.write(ew)
	}
	if len(p.KeptPickups) > 0 {
		fmt.Fprintf(ew, "\nPICKUPS KEPT AS GIVEN\n")
		for _, k := range p.KeptPickups {
			fmt.Fprintf(ew, "- %s %s: %s\n", k.Device, k.Stage, k.Why)
		}
	}
}

func (p *Proposal) writePickupsMarkdown(ew io.Writer) {
	if len(p.Pickups) > 0 {
		fmt.Fprintf(ew, "\n## Pickups\n\n| relay | stage | old | new | admissible | bound by | why |\n| --- | --- | --- | --- | --- | --- | --- |\n")
		for _, q := range p.Pickups {
			fmt.Fprintf(ew, "| %s | %s | %s | %s | %s | %s | %s |\n", md(q.Device), md(q.Stage), fmtPickup(q.Old), fmtPickup(q.New),
				q.interval(), q.Bound, md(q.why()))
		}
	}
	if len(p.KeptPickups) > 0 {
		fmt.Fprintf(ew, "\n## Pickups kept as given\n\n")
		for _, k := range p.KeptPickups {
			fmt.Fprintf(ew, "- %s %s: %s\n", md(k.Device), md(k.Stage), md(k.Why))
		}
	}
}

// writePickupsCSV writes a "pickup" row per chosen pickup (old, new,
// the admissible interval in the range column, what binds it in the
// note) and a "pickup_kept" row per stage left as given.
func (p *Proposal) writePickupsCSV(cw *csv.Writer) {
	for _, q := range p.Pickups {
		_ = cw.Write([]string{"pickup", textCell(q.Device), textCell(q.Stage), "", "pickup_a", numberCell(q.Old), numberCell(q.New), "",
			textCell(fmt.Sprintf("%s–%s A", numberCell(q.Low), numberCell(q.High))), "", "", "", "", "",
			textCell("bound by " + q.Bound + ": " + q.why())})
	}
	for _, k := range p.KeptPickups {
		_ = cw.Write([]string{"pickup_kept", textCell(k.Device), textCell(k.Stage), "", "pickup_a", "", "", "", "", "", "", "", "", "", textCell(k.Why)})
	}
}

// pickupJSON is one chosen pickup in the JSON document.
type pickupJSON struct {
	Device    string     `json:"device"`
	Stage     string     `json:"stage"`
	Old       jsonNumber `json:"old_a"`
	New       *float64   `json:"new_a,omitempty"`
	Low       jsonNumber `json:"lowest_a"`
	High      jsonNumber `json:"highest_a"`
	LowBy     string     `json:"lowest_by"`
	HighBy    string     `json:"highest_by"`
	LowNote   string     `json:"lowest_note"`
	HighNote  string     `json:"highest_note"`
	Bound     string     `json:"bound_by"`
	BoundNote string     `json:"bound_note"`
}

func (p *Proposal) pickupsJSON() ([]pickupJSON, []KeptPickupRow) {
	out := []pickupJSON{}
	for _, q := range p.Pickups {
		row := pickupJSON{Device: q.Device, Stage: q.Stage, Old: jsonNumber(q.Old), Low: jsonNumber(q.Low), High: jsonNumber(q.High),
			LowBy: q.LowBy, HighBy: q.HighBy, LowNote: q.LowNote, HighNote: q.HighNote, Bound: q.Bound, BoundNote: q.BoundNote}
		if p.Verified {
			v := q.New
			row.New = &v
		}
		out = append(out, row)
	}
	kept := p.KeptPickups
	if kept == nil {
		kept = []KeptPickupRow{}
	}
	return out, kept
}
