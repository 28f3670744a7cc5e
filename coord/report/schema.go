package report

// SchemaVersion is the version of the findings JSON (check --format json).
// It rises by one whenever a field is renamed or removed or its meaning
// changes; adding a field keeps the version. README.md documents every
// field of the current version, and ReadSnapshots refuses a document of a
// newer version than it knows.
const SchemaVersion = 1

// accepted is an acceptance in the findings JSON: on a finding, the entry
// that covers it and the verdict it had (was); in the document's
// acceptances list, the study's entries as written.
type accepted struct {
	Check  string `json:"check,omitempty"`
	Device string `json:"device,omitempty"`
	Other  string `json:"other,omitempty"`
	Stage  string `json:"stage,omitempty"`
	Reason string `json:"reason"`
	By     string `json:"by"`
	Date   string `json:"date"`
	Was    string `json:"was,omitempty"`
}
