package study

import (
	"fmt"
	"sort"
	"strings"
)

// Error is one problem in a study file, with where it is.
type Error struct {
	File    string
	Line    int    // 1-based; 0 when the problem has no single line
	Element string // e.g. `relay "F3"`, empty for file-level problems
	Msg     string
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Element != "" {
		b.WriteString(e.Element)
		b.WriteString(": ")
	}
	b.WriteString(e.Msg)
	return b.String()
}

// ErrorList is every problem found in a study file, in file order.
type ErrorList []*Error

func (l ErrorList) Error() string {
	msgs := make([]string, len(l))
	for i, e := range l {
		msgs[i] = e.Error()
	}
	return strings.Join(msgs, "\n")
}

// sorted orders the list: the study file's problems first, then those of
// the files it refers to; within a file by line, then by message. It drops
// exact duplicates, so the report is stable.
func (l ErrorList) sorted(study string) ErrorList {
	sort.SliceStable(l, func(i, j int) bool {
		a, b := l[i], l[j]
		if (a.File == study) != (b.File == study) {
			return a.File == study
		}
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			// Problems without a line (whole-network ones) go last.
			if a.Line == 0 || b.Line == 0 {
				return b.Line == 0
			}
			return a.Line < b.Line
		}
		return a.Error() < b.Error()
	})
	var out ErrorList
	for _, e := range l {
		if len(out) > 0 && e.Error() == out[len(out)-1].Error() {
			continue
		}
		out = append(out, e)
	}
	return out
}
