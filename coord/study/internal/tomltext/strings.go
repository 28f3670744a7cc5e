package tomltext

import (
	"strings"
	"unicode/utf8"
)

// basicString reads "…" with escapes. Without escapes the result shares
// the source's memory.
func (p *parser) basicString() string {
	line := p.line
	p.pos++
	start := p.pos
	var b *strings.Builder
	for {
		if p.eof() {
			p.fail(line, "the text opened with \" is not closed")
		}
		c := p.src[p.pos]
		switch {
		case c == '"':
			s := p.src[start:p.pos]
			p.pos++
			if b != nil {
				b.WriteString(s)
				return b.String()
			}
			return s
		case c == '\\':
			if b == nil {
				b = &strings.Builder{}
			}
			b.WriteString(p.src[start:p.pos])
			p.escape(b)
			start = p.pos
		case c == '\n' || c == '\r':
			p.fail(line, "text in \"…\" must end on its line (use \"\"\"…\"\"\" for text over several lines)")
		case isControl(c):
			p.fail(line, "control character 0x%02x in text; write it as an escape such as \\t", c)
		default:
			p.pos++
		}
	}
}

// escape reads one escape sequence after a backslash.
func (p *parser) escape(b *strings.Builder) {
	p.pos++
	if p.eof() {
		p.fail(p.line, "the text ends in the middle of an escape")
	}
	c := p.src[p.pos]
	p.pos++
	switch c {
	case 'b':
		b.WriteByte('\b')
	case 't':
		b.WriteByte('\t')
	case 'n':
		b.WriteByte('\n')
	case 'f':
		b.WriteByte('\f')
	case 'r':
		b.WriteByte('\r')
	case 'e':
		b.WriteByte(0x1b)
	case '"':
		b.WriteByte('"')
	case '\\':
		b.WriteByte('\\')
	case 'x':
		b.WriteRune(p.hexRune(2))
	case 'u':
		b.WriteRune(p.hexRune(4))
	case 'U':
		b.WriteRune(p.hexRune(8))
	default:
		r, _ := utf8.DecodeRuneInString(p.src[p.pos-1:])
		p.fail(p.line, "unknown escape: a backslash before %q (write \\\\ for a backslash)", r)
	}
}

// hexRune reads n hexadecimal digits naming a Unicode scalar value.
func (p *parser) hexRune(n int) rune {
	if p.pos+n > len(p.src) {
		p.fail(p.line, "an escape needs %d hexadecimal digits", n)
	}
	var r rune
	for _, c := range []byte(p.src[p.pos : p.pos+n]) {
		var d byte
		switch {
		case c >= '0' && c <= '9':
			d = c - '0'
		case c >= 'a' && c <= 'f':
			d = c - 'a' + 10
		case c >= 'A' && c <= 'F':
			d = c - 'A' + 10
		default:
			p.fail(p.line, "an escape needs %d hexadecimal digits", n)
		}
		r = r<<4 | rune(d)
	}
	p.pos += n
	if !utf8.ValidRune(r) {
		p.fail(p.line, "escape U+%04X is not a Unicode scalar value", r)
	}
	return r
}

// multilineBasic reads """…""".
func (p *parser) multilineBasic() string {
	line := p.line
	p.pos += 3
	p.skipFirstNewline()
	var b strings.Builder
	start := p.pos
	for {
		if p.eof() {
			p.fail(line, "the text opened with \"\"\" is not closed")
		}
		c := p.src[p.pos]
		switch {
		case c == '"':
			if s, done := p.closeQuotes('"', start, &b); done {
				return s
			}
		case c == '\\':
			b.WriteString(p.src[start:p.pos])
			if p.lineEndingBackslash() {
				p.skipWhitespaceAndNewlines()
			} else {
				p.escape(&b)
			}
			start = p.pos
		case c == '\n' || c == '\r':
			p.newline()
		case isControl(c):
			p.fail(p.line, "control character 0x%02x in text; write it as an escape", c)
		default:
			p.pos++
		}
	}
}

// multilineLiteral reads ”'…”'.
func (p *parser) multilineLiteral() string {
	line := p.line
	p.pos += 3
	p.skipFirstNewline()
	var b strings.Builder
	start := p.pos
	for {
		if p.eof() {
			p.fail(line, "the text opened with ''' is not closed")
		}
		c := p.src[p.pos]
		switch {
		case c == '\'':
			if s, done := p.closeQuotes('\'', start, &b); done {
				return s
			}
		case c == '\n' || c == '\r':
			p.newline()
		case isControl(c):
			p.fail(p.line, "control character 0x%02x in text", c)
		default:
			p.pos++
		}
	}
}

// closeQuotes handles a run of quotes inside multi-line text: fewer than
// three are text; three to five close it, the extra ones being text.
func (p *parser) closeQuotes(q byte, start int, b *strings.Builder) (string, bool) {
	n := 0
	for p.pos+n < len(p.src) && p.src[p.pos+n] == q {
		n++
	}
	if n < 3 {
		p.pos += n
		return "", false
	}
	if n > 5 {
		p.fail(p.line, "too many quotes closing multi-line text")
	}
	b.WriteString(p.src[start : p.pos+n-3])
	p.pos += n
	return b.String(), true
}

func (p *parser) skipFirstNewline() {
	if strings.HasPrefix(p.src[p.pos:], "\n") || strings.HasPrefix(p.src[p.pos:], "\r\n") {
		p.newline()
	}
}

// lineEndingBackslash reports whether the backslash at pos ends its line
// (only spaces and tabs follow it before the newline).
func (p *parser) lineEndingBackslash() bool {
	i := p.pos + 1
	for i < len(p.src) && (p.src[i] == ' ' || p.src[i] == '\t') {
		i++
	}
	return i < len(p.src) && (p.src[i] == '\n' || p.src[i] == '\r')
}

func (p *parser) skipWhitespaceAndNewlines() {
	p.pos++ // the backslash
	for !p.eof() {
		switch p.src[p.pos] {
		case ' ', '\t':
			p.pos++
		case '\n', '\r':
			p.newline()
		default:
			return
		}
	}
}

// literalString reads '…', which has no escapes.
func (p *parser) literalString() string {
	line := p.line
	p.pos++
	start := p.pos
	for {
		if p.eof() {
			p.fail(line, "the text opened with ' is not closed")
		}
		c := p.src[p.pos]
		switch {
		case c == '\'':
			p.pos++
			return p.src[start : p.pos-1]
		case c == '\n' || c == '\r':
			p.fail(line, "text in '…' must end on its line (use '''…''' for text over several lines)")
		case isControl(c):
			p.fail(line, "control character 0x%02x in text", c)
		}
		p.pos++
	}
}
