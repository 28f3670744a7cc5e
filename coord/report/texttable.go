package report

import (
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"tripgrade/coord"
)

// TextWidth is the width in columns the text findings tables aim to fit:
// notes that repeat or run long become footnotes, and when a table is
// still wider, each row's detail and note go on a line of their own
// under it.
const TextWidth = 120

// longNote is the length above which a note becomes a footnote, printed
// once under its table however many rows share it.
const longNote = 40

// gap is the space between two columns.
const gap = "  "

// textTable lays out one findings table for a terminal: the cells of each
// row, and the text that goes under the row when the table is too wide.
type textTable struct {
	head  []string
	rows  [][]string
	under []string // per row; empty for none
	notes footnotes
}

// footnotes numbers the distinct long or repeated notes of one table.
type footnotes struct {
	texts []string
	index map[string]int
}

// ref returns the marker of text, numbering it on first use.
func (n *footnotes) ref(text string) string {
	if n.index == nil {
		n.index = map[string]int{}
	}
	k, ok := n.index[text]
	if !ok {
		n.texts = append(n.texts, text)
		k = len(n.texts)
		n.index[text] = k
	}
	return fmt.Sprintf("[%d]", k)
}

// width returns the table's width with the given cells per row.
func width(head []string, rows [][]string) int {
	ws := columnWidths(head, rows)
	total := 0
	for _, w := range ws {
		total += w + len(gap)
	}
	return total - len(gap)
}

func columnWidths(head []string, rows [][]string) []int {
	ws := make([]int, len(head))
	for _, r := range append([][]string{head}, rows...) {
		for i, c := range r {
			if n := utf8.RuneCountInString(c); n > ws[i] {
				ws[i] = n
			}
		}
	}
	return ws
}

// write prints the table: the rows padded to their columns with trailing
// space trimmed, each row's under-text indented below it, then the
// footnotes.
func (t *textTable) write(w io.Writer) {
	ws := columnWidths(t.head, t.rows)
	line := func(cells []string) {
		var b strings.Builder
		for i, c := range cells {
			b.WriteString(c)
			if i < len(cells)-1 {
				b.WriteString(strings.Repeat(" ", ws[i]-utf8.RuneCountInString(c)))
				b.WriteString(gap)
			}
		}
		fmt.Fprintln(w, strings.TrimRight(b.String(), " "))
	}
	line(t.head)
	for i, r := range t.rows {
		line(r)
		if t.under[i] != "" {
			fmt.Fprintf(w, "%s↳ %s\n", strings.Repeat(" ", ws[0]+len(gap)), t.under[i])
		}
	}
	for k, n := range t.notes.texts {
		fmt.Fprintln(w, wrap(fmt.Sprintf("[%d] %s", k+1, n), TextWidth, "    "))
	}
}

// wrap breaks text at spaces into lines of at most width runes (a word
// longer than that stays whole), starting each further line with indent.
func wrap(text string, width int, indent string) string {
	var b strings.Builder
	n := 0
	for i, word := range strings.Fields(text) {
		wl := utf8.RuneCountInString(word)
		switch {
		case i == 0:
		case n+1+wl > width:
			b.WriteString("\n" + indent)
			n = utf8.RuneCountInString(indent)
		default:
			b.WriteByte(' ')
			n++
		}
		b.WriteString(word)
		n += wl
	}
	return b.String()
}

// findingsTable builds the text table of one check's rows.
// With scenarios it has a scenario column, before the fault.
func findingsTable(g []Row, scenarios bool) *textTable {
	with := withHeading(g[0].Finding.Check)
	t := &textTable{head: []string{"verdict", subjectHeading(g[0].Finding.Check)}}
	if with != "" {
		t.head = append(t.head, with)
	}
	t.head = append(t.head, "stage", "measured", "required", "margin")
	if scenarios {
		t.head = append(t.head, "scenario")
	}
	t.head = append(t.head, "fault", "detail", "note")
	var notes []string
	for _, r := range g {
		x := r.Finding
		var refs []string
		if n := x.Note; n != "" {
			if utf8.RuneCountInString(n) > longNote {
				refs = append(refs, t.notes.ref(n))
			} else {
				refs = append(refs, n)
			}
		}
		if x.Acceptance != nil {
			refs = append(refs, t.notes.ref(acceptanceText(x.Acceptance)))
		}
		notes = append(notes, strings.Join(refs, " "))
	}
	var details []string
	for _, r := range g {
		x := r.Finding
		row := []string{x.Verdict.String(), x.Device}
		if with != "" {
			row = append(row, x.Other)
		}
		row = append(row, dash(x.Stage), r.Measured, r.Required, r.Margin)
		if scenarios {
			row = append(row, dash(x.Scenario))
		}
		row = append(row, dash(r.Fault))
		t.rows = append(t.rows, row)
		details = append(details, dash(r.Detail))
		t.under = append(t.under, "")
	}
	// The width with the detail and note columns, measured without a
	// second copy of every row (a table of 10,000 buses has some 270,000).
	ws := columnWidths(t.head[:len(t.head)-2], t.rows)
	total := 0
	for _, w := range ws {
		total += w + len(gap)
	}
	for _, extra := range [][]string{details, notes} {
		w := utf8.RuneCountInString(t.head[len(ws)])
		for _, c := range extra {
			w = max(w, utf8.RuneCountInString(c))
		}
		ws = append(ws, w)
		total += w + len(gap)
	}
	if total-len(gap) <= TextWidth {
		for i := range t.rows {
			t.rows[i] = append(t.rows[i], details[i], notes[i])
		}
		return t
	}
	// Too wide: the detail and the note go under each row.
	t.head = t.head[:len(t.head)-2]
	for i := range t.rows {
		var parts []string
		if d := details[i]; d != "-" {
			parts = append(parts, d)
		}
		if notes[i] != "" {
			parts = append(parts, notes[i])
		}
		t.under[i] = strings.Join(parts, "; ")
	}
	return t
}

// acceptanceText is how the tables word an acceptance.
func acceptanceText(a *coord.Acceptance) string {
	return fmt.Sprintf("%s accepted by %s on %s: %s", a.Was, a.By, a.Date, a.Reason)
}
