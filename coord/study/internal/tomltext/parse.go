package tomltext

import (
	"bytes"
	"fmt"
	"strings"
	"unicode/utf8"
)

// Parse reads a TOML document. The error, when not nil, is an *Error with
// the line of the first problem.
func Parse(src []byte, lim Limits) (root *Tab, err error) {
	if lim.MaxBytes <= 0 {
		lim.MaxBytes = DefaultMaxBytes
	}
	if lim.MaxDepth <= 0 {
		lim.MaxDepth = DefaultMaxDepth
	}
	if len(src) > lim.MaxBytes {
		return nil, &Error{Line: 1, Msg: fmt.Sprintf("the file is %s, more than the %s a study may have", sizeText(len(src)), sizeText(lim.MaxBytes))}
	}
	if i := invalidUTF8(src); i >= 0 {
		return nil, &Error{Line: 1 + bytes.Count(src[:i], []byte{'\n'}), Msg: fmt.Sprintf("not UTF-8 text (byte 0x%02x); save the file as UTF-8", src[i])}
	}
	p := &parser{src: string(src), line: 1, lim: lim}
	p.src = strings.TrimPrefix(p.src, "\uFEFF")
	defer func() {
		if r := recover(); r != nil {
			e, ok := r.(*Error)
			if !ok {
				panic(r)
			}
			root, err = nil, e
		}
	}()
	p.document()
	return p.root, nil
}

// sizeText gives a byte count in MiB or KiB for messages.
func sizeText(n int) string {
	if n >= 1<<20 {
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	}
	return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
}

// invalidUTF8 returns the offset of the first byte that is not part of
// valid UTF-8, or −1.
func invalidUTF8(b []byte) int {
	if utf8.Valid(b) {
		return -1
	}
	for i := 0; i < len(b); {
		r, n := utf8.DecodeRune(b[i:])
		if r == utf8.RuneError && n <= 1 {
			return i
		}
		i += n
	}
	return -1
}

// parser reads one document. Errors are raised as *Error panics and
// recovered by Parse, which keeps the reading code straight.
type parser struct {
	src   string
	pos   int
	line  int
	lim   Limits
	depth int
	root  *Tab
	cur   *Tab // the table key/value lines go to
	slab  []Value
	keys  []string // parts of the keys being read, a stack shared by nested inline tables
}

func (p *parser) fail(line int, format string, args ...any) {
	panic(&Error{Line: line, Msg: fmt.Sprintf(format, args...)})
}

// newValue hands out Values from a slab, which keeps the garbage collector
// from tracking millions of small allocations.
func (p *parser) newValue(k Kind, line int) *Value {
	if len(p.slab) == 0 {
		p.slab = make([]Value, 1024)
	}
	v := &p.slab[0]
	p.slab = p.slab[1:]
	v.Kind, v.Line = k, line
	return v
}

func (p *parser) tableValue(t *Tab, line int) *Value {
	v := p.newValue(Table, line)
	v.Table = t
	return v
}

func (p *parser) eof() bool { return p.pos >= len(p.src) }

// near quotes the text at the current position for a message.
func (p *parser) near() string {
	if p.eof() {
		return "the end of the file"
	}
	if c := p.src[p.pos]; c == '\n' || c == '\r' {
		return "the end of the line"
	}
	end := p.pos
	for end < len(p.src) && end-p.pos < 24 && p.src[end] != '\n' && p.src[end] != '\r' {
		end++
	}
	for end < len(p.src) && !utf8.RuneStart(p.src[end]) {
		end++
	}
	return fmt.Sprintf("%q", p.src[p.pos:end])
}

func (p *parser) document() {
	p.root = &Tab{how: byHeader}
	p.cur = p.root
	for {
		p.skipSpace()
		if p.eof() {
			return
		}
		switch p.src[p.pos] {
		case '#':
			p.comment()
		case '\n', '\r':
			p.newline()
		case '[':
			p.header()
			p.endOfLine("the table header")
		default:
			p.keyValue(p.cur)
			p.endOfLine("the value")
		}
	}
}

// skipSpace skips spaces and tabs.
func (p *parser) skipSpace() {
	for p.pos < len(p.src) && (p.src[p.pos] == ' ' || p.src[p.pos] == '\t') {
		p.pos++
	}
}

// skipBlank skips whitespace, newlines and comments, as inside a list.
func (p *parser) skipBlank() {
	for !p.eof() {
		switch p.src[p.pos] {
		case ' ', '\t':
			p.pos++
		case '\n', '\r':
			p.newline()
		case '#':
			p.comment()
		default:
			return
		}
	}
}

// newline consumes LF or CRLF.
func (p *parser) newline() {
	if p.src[p.pos] == '\r' {
		if p.pos+1 >= len(p.src) || p.src[p.pos+1] != '\n' {
			p.fail(p.line, "a carriage return must be followed by a line feed")
		}
		p.pos++
	}
	p.pos++
	p.line++
}

// comment skips a comment up to its line end, refusing control characters.
func (p *parser) comment() {
	for p.pos < len(p.src) {
		c := p.src[p.pos]
		if c == '\n' || (c == '\r' && p.pos+1 < len(p.src) && p.src[p.pos+1] == '\n') {
			return
		}
		if isControl(c) {
			p.fail(p.line, "control character 0x%02x in a comment", c)
		}
		p.pos++
	}
}

func isControl(c byte) bool { return (c < 0x20 && c != '\t') || c == 0x7f }

// endOfLine requires nothing but a comment after what was read.
func (p *parser) endOfLine(what string) {
	p.skipSpace()
	if p.eof() {
		return
	}
	switch p.src[p.pos] {
	case '#':
		p.comment()
		if !p.eof() {
			p.newline()
		}
	case '\n', '\r':
		p.newline()
	default:
		p.fail(p.line, "expected the end of the line after %s, found %s", what, p.near())
	}
}

// enter counts one more level of nesting.
func (p *parser) enter() {
	p.depth++
	if p.depth > p.lim.MaxDepth {
		p.fail(p.line, "lists and inline tables nested more than %d deep", p.lim.MaxDepth)
	}
}

// value reads any value.
func (p *parser) value() *Value {
	if p.eof() {
		p.fail(p.line, "a value is missing at the end of the file")
	}
	line := p.line
	switch c := p.src[p.pos]; c {
	case '"':
		v := p.newValue(String, line)
		if strings.HasPrefix(p.src[p.pos:], `"""`) {
			v.Str = p.multilineBasic()
		} else {
			v.Str = p.basicString()
		}
		return v
	case '\'':
		v := p.newValue(String, line)
		if strings.HasPrefix(p.src[p.pos:], `'''`) {
			v.Str = p.multilineLiteral()
		} else {
			v.Str = p.literalString()
		}
		return v
	case '[':
		return p.array()
	case '{':
		return p.inlineTable()
	case 't', 'f':
		for _, w := range []string{"true", "false"} {
			if strings.HasPrefix(p.src[p.pos:], w) && p.delimitedAt(p.pos+len(w)) {
				p.pos += len(w)
				v := p.newValue(Bool, line)
				v.Bool = w == "true"
				return v
			}
		}
	case '\n', '\r', '#', ',', ']', '}':
		p.fail(line, "a value is missing")
	}
	return p.scalar()
}

// delimitedAt reports whether a value may end at i.
func (p *parser) delimitedAt(i int) bool {
	if i >= len(p.src) {
		return true
	}
	switch p.src[i] {
	case ' ', '\t', '\n', '\r', '#', ',', ']', '}':
		return true
	}
	return false
}

func (p *parser) array() *Value {
	line := p.line
	p.enter()
	p.pos++
	v := p.newValue(Array, line)
	for {
		p.skipBlank()
		if p.eof() {
			p.fail(line, "the list opened here is not closed with ]")
		}
		if p.src[p.pos] == ']' {
			p.pos++
			break
		}
		v.Items = append(v.Items, p.value())
		p.skipBlank()
		if p.eof() {
			p.fail(line, "the list opened here is not closed with ]")
		}
		if c := p.src[p.pos]; c == ',' {
			p.pos++
			continue
		} else if c == ']' {
			p.pos++
			break
		}
		p.fail(p.line, "expected , or ] in the list opened at line %d, found %s", line, p.near())
	}
	p.depth--
	return v
}

func (p *parser) inlineTable() *Value {
	line := p.line
	p.enter()
	p.pos++
	t := &Tab{how: inline}
	for {
		p.skipBlank()
		if p.eof() {
			p.fail(line, "the inline table opened here is not closed with }")
		}
		if p.src[p.pos] == '}' {
			p.pos++
			break
		}
		p.keyValue(t)
		p.skipBlank()
		if p.eof() {
			p.fail(line, "the inline table opened here is not closed with }")
		}
		if c := p.src[p.pos]; c == ',' {
			p.pos++
			continue
		} else if c == '}' {
			p.pos++
			break
		}
		p.fail(p.line, "expected , or } in the inline table opened at line %d, found %s", line, p.near())
	}
	p.depth--
	return p.tableValue(t, line)
}
