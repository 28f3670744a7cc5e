package study

import (
	"fmt"
	"sort"
	"strings"
	"unicode/utf8"
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
	text := make(map[*Error]string, len(l))
	for _, e := range l {
		text[e] = e.Error()
	}
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
		return text[a] < text[b]
	})
	var out ErrorList
	for _, e := range l {
		if len(out) > 0 && text[e] == text[out[len(out)-1]] {
			continue
		}
		out = append(out, e)
	}
	return out
}

// How much user text a message echoes: a name or a value, an element
// (kind and name), and a whole message. A 20 MB key name must not become
// 20 MB of messages.
const (
	maxEchoName    = 60
	maxEchoElement = 90
	maxEchoMessage = 400
)

// clipText shortens s to at most n runes, marking the cut with "…".
func clipText(s string, n int) string {
	if len(s) <= n {
		return s
	}
	i, count := 0, 0
	for i < len(s) && count < n {
		_, size := utf8.DecodeRuneInString(s[i:])
		i += size
		count++
	}
	if i >= len(s) {
		return s
	}
	return s[:i] + "…"
}

// verbatim marks text of our own passed as an argument of a message,
// which message does not shorten as it does user text.
type verbatim string

// message formats a problem, shortening long text arguments (user text)
// and the result.
func message(format string, args ...any) string {
	for i, a := range args {
		if s, ok := a.(string); ok && len(s) > maxEchoName {
			args[i] = clipText(s, maxEchoName)
		}
	}
	return clipText(fmt.Sprintf(format, args...), maxEchoMessage)
}

func sortStrings(s []string) { sort.Strings(s) }
