package study

import (
	"fmt"
	"strings"
	"unicode"
)

// named checks an element's name: present, readable as it is, and unique
// in its namespace. A name with a character that hides or disguises
// itself is reported but still registered, so that the elements referring
// to it are not reported a second time for the same cause.
func (b *builder) named(w where, name string, seen map[string]int, kind string) bool {
	if strings.TrimSpace(name) == "" {
		b.fail(w, "name", "name is missing")
		b.badNames[name] = true // an island of it follows from this
		return false
	}
	readable := b.readable(w, "name", name)
	if first, dup := seen[name]; dup {
		at := ""
		if line := b.lines.table(b.namePaths[first]); line > 0 {
			at = fmt.Sprintf(" (line %d)", line)
		}
		b.fail(w, "name", "duplicate name: another %s is called %q%s", kind, name, at)
		return false
	}
	seen[name] = len(b.namePaths) // the line is looked up only for a message
	b.namePaths = append(b.namePaths, w.path)
	if !readable {
		b.badNames[name] = true
	}
	return true
}

// readable checks user text that reports print (names, labels, the
// study's title): no control characters and nothing invisible or
// direction-changing, so that what a reviewer reads is what the file
// says ("R\u200b1" must not pass for "R1").
func (b *builder) readable(w where, key, text string) bool {
	for _, r := range text {
		if what := deceptive(r); what != "" {
			b.fail(w, key, "%s %q contains %U, %s; write it with visible characters only", key, text, r, what)
			return false
		}
	}
	return true
}

// deceptive says why a character may not stand in a name, or "".
func deceptive(r rune) string {
	switch {
	case r == '\t' || r == '\n' || r == '\r':
		return "a tab or line break"
	case unicode.IsControl(r):
		return "a control character"
	case r >= 0x202A && r <= 0x202E, r >= 0x2066 && r <= 0x2069, r == 0x200E, r == 0x200F, r == 0x061C:
		return "a character that changes the direction of text"
	case unicode.Is(unicode.Cf, r):
		return "an invisible formatting character"
	case unicode.Is(unicode.Zl, r), unicode.Is(unicode.Zp, r):
		return "a line or paragraph separator"
	case unicode.Is(unicode.Zs, r) && r != ' ':
		return "a space that is not an ordinary space"
	case r >= 0xFE00 && r <= 0xFE0F, r >= 0xE0100 && r <= 0xE01EF, r == 0x034F:
		return "an invisible variation selector or joiner"
	case r == 0x115F, r == 0x1160, r == 0x3164, r == 0xFFA0, r == 0x2800:
		return "a blank character that looks like nothing"
	case r == 0xFFFD:
		return "a replacement character (the text was not UTF-8)"
	case !unicode.IsPrint(r):
		return "a character with no agreed appearance"
	}
	return ""
}
