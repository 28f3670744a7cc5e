// Package report renders tripgrade's results: the fault tables and the
// coordination findings, as aligned text for a terminal, Markdown, CSV and
// JSON. It computes nothing; every figure comes from packages coord and
// faults. Every rendering carries Caution.
//
// Text output is deterministic: the same study gives byte-identical
// tables. CSV and JSON carry the same figures as the text with the unit in
// each field name (current_a, time_s).
package report

// Caution is printed with every report.
const Caution = "Caution: these results support, and never replace, review by a qualified protection engineer under local codes and licensed practice. Wrong settings can fail to clear faults."
