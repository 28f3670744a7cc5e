package study

import (
	"strconv"
	"strings"

	"tripgrade/coord/study/internal/tomltext"
)

// lineIndex finds the line of a table or key of the study file from its
// indexed path ("relay[2].stage[0]", "" for the root) in the parsed tree,
// which keeps the line of every table and key (package tomltext). Paths
// are resolved only when a message needs a line, so loading a large study
// pays nothing for them.
type lineIndex struct {
	root *tomltext.Tab
}

func join(a, b string) string {
	if a == "" {
		return b
	}
	return a + "." + b
}

// find returns the table at path and the line of its header (or of the
// key that holds it), or nil.
func (ix *lineIndex) find(path string) (*tomltext.Tab, int) {
	t, line := ix.root, 0
	if path == "" || t == nil {
		return t, line
	}
	for _, part := range strings.Split(path, ".") {
		key, index := part, -1
		if i := strings.IndexByte(part, '['); i >= 0 && strings.HasSuffix(part, "]") {
			n, err := strconv.Atoi(part[i+1 : len(part)-1])
			if err != nil {
				return nil, 0
			}
			key, index = part[:i], n
		}
		e := t.Get(key)
		if e == nil {
			return nil, 0
		}
		v := e.Value
		if index >= 0 {
			if v.Kind != tomltext.Array || index >= len(v.Items) {
				return nil, 0
			}
			v = v.Items[index]
		}
		if v.Kind != tomltext.Table {
			return nil, 0
		}
		t, line = v.Table, v.Line
	}
	return t, line
}

// table returns the line of the header of an indexed table, or 0.
func (ix *lineIndex) table(path string) int {
	_, line := ix.find(path)
	return line
}

// key returns the line of key in the indexed table path; for a key that
// is not there, the line of a table of that name (a key given as [key]),
// or else the line of the table itself.
func (ix *lineIndex) key(path, key string) int {
	t, line := ix.find(path)
	if t == nil {
		return 0
	}
	if e := t.Get(key); e != nil {
		return e.Line
	}
	return line
}
