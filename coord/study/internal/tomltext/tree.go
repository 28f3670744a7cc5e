// Package tomltext parses TOML (version 1.1, https://toml.io/en/v1.1.0)
// into a tree that keeps the line of every table, key and value, so that a
// program checking the values afterwards can point at the line of each
// one.
//
// It exists because a study file is checked after decoding, and every
// message must name its line; and because study files come from other
// people's scripts: the parser runs in time linear in the input, never
// recurses deeper than Limits.MaxDepth, refuses input larger than
// Limits.MaxBytes before reading it, and reports the first syntax error
// with its line instead of failing in any other way.
//
// Values keep their TOML types: integers as int64, floats as float64 (inf
// and nan included; the caller decides what they mean), date-times as
// their text.
package tomltext

import "fmt"

// Kind is the type of a Value.
type Kind uint8

// The kinds of value.
const (
	String Kind = iota + 1
	Integer
	Float
	Bool
	Datetime // offset or local date-time, local date or local time, kept as text
	Array
	Table
)

// String names the kind as a message would: "text", "an integer", …
func (k Kind) String() string {
	switch k {
	case String:
		return "text"
	case Integer:
		return "an integer"
	case Float:
		return "a number"
	case Bool:
		return "true or false"
	case Datetime:
		return "a date or time"
	case Array:
		return "a list"
	case Table:
		return "a table"
	}
	return fmt.Sprintf("Kind(%d)", uint8(k))
}

// Value is one TOML value.
type Value struct {
	Kind  Kind
	Line  int     // line where the value starts (a table: its header or its key)
	Str   string  // String, and the text of a Datetime
	Int   int64   // Integer
	Float float64 // Float
	Bool  bool    // Bool
	Items []*Value
	Table *Tab
	// ArrayOfTables is true for an array made by [[name]] headers.
	ArrayOfTables bool
}

// Entry is one key of a table with its value.
type Entry struct {
	Key   string
	Line  int // line of the key
	Value *Value
}

// Tab is a table: its keys in file order.
type Tab struct {
	Entries []Entry
	index   map[string]int // built once a table has many keys
	how     defined
}

// defined says how a table came to be, for TOML's rules on defining a
// table once.
type defined uint8

const (
	implicit defined = iota // a parent named by a header, not yet defined
	byHeader                // [name] or an element of [[name]]
	byDotted                // created by a dotted key
	inline                  // { … }: closed to any later addition
)

// indexFrom is the number of keys from which a table keeps a map for its
// lookups; below it a scan is faster.
const indexFrom = 12

// Get returns the entry of key, or nil.
func (t *Tab) Get(key string) *Entry {
	if t.index != nil {
		if i, ok := t.index[key]; ok {
			return &t.Entries[i]
		}
		return nil
	}
	for i := range t.Entries {
		if t.Entries[i].Key == key {
			return &t.Entries[i]
		}
	}
	return nil
}

func (t *Tab) add(key string, line int, v *Value) {
	if t.Entries == nil {
		t.Entries = make([]Entry, 0, 8)
	}
	t.Entries = append(t.Entries, Entry{Key: key, Line: line, Value: v})
	switch {
	case t.index != nil:
		t.index[key] = len(t.Entries) - 1
	case len(t.Entries) >= indexFrom:
		t.index = make(map[string]int, 2*len(t.Entries))
		for i, e := range t.Entries {
			t.index[e.Key] = i
		}
	}
}

// Limits bound what Parse accepts. Zero fields take the defaults.
type Limits struct {
	MaxBytes int // the largest input, in bytes (default DefaultMaxBytes)
	MaxDepth int // the deepest nesting of lists, inline tables and key parts (default DefaultMaxDepth)
}

// Defaults of Limits.
const (
	DefaultMaxBytes = 128 << 20
	DefaultMaxDepth = 32
)

// Error is a syntax error, or input beyond the limits, at a line.
type Error struct {
	Line int
	Msg  string
}

func (e *Error) Error() string { return fmt.Sprintf("line %d: %s", e.Line, e.Msg) }
