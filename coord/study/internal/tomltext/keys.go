package tomltext

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// Keys, key/value lines and table headers, with TOML's rules on defining
// each table once: a table named by a header is defined there (its
// parents only implied), dotted keys define the tables they pass through
// within the current section, an inline table is closed, and [[name]]
// appends to an array of tables only.

// key reads a bare, quoted or dotted key onto the key stack from base.
func (p *parser) key(base int) {
	for {
		p.keys = append(p.keys, p.simpleKey())
		if len(p.keys)-base > p.lim.MaxDepth {
			p.fail(p.line, "a key of more than %d dotted parts", p.lim.MaxDepth)
		}
		p.skipSpace()
		if p.eof() || p.src[p.pos] != '.' {
			return
		}
		p.pos++
		p.skipSpace()
	}
}

func isBare(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-'
}

func (p *parser) simpleKey() string {
	if p.eof() {
		p.fail(p.line, "expected a key, found the end of the file")
	}
	switch p.src[p.pos] {
	case '"':
		if strings.HasPrefix(p.src[p.pos:], `"""`) {
			p.fail(p.line, "a key cannot be a multi-line string")
		}
		return p.basicString()
	case '\'':
		if strings.HasPrefix(p.src[p.pos:], `'''`) {
			p.fail(p.line, "a key cannot be a multi-line string")
		}
		return p.literalString()
	}
	start := p.pos
	for p.pos < len(p.src) && isBare(p.src[p.pos]) {
		p.pos++
	}
	if p.pos == start {
		p.fail(p.line, "expected a key (letters, digits, _ and -, or text in quotes), found %s", p.near())
	}
	return p.src[start:p.pos]
}

// keyValue reads key = value into t, creating the tables of a dotted key.
func (p *parser) keyValue(t *Tab) {
	line := p.line
	base := len(p.keys)
	defer func() { p.keys = p.keys[:base] }()
	p.key(base)
	if p.eof() || p.src[p.pos] != '=' {
		p.fail(line, "expected = after the key %s, found %s", quoteKey(p.keys[base:]), p.near())
	}
	p.pos++
	p.skipSpace()
	v := p.value()
	parts := p.keys[base:] // after the value, whose inline tables grow the stack
	for i, k := range parts[:len(parts)-1] {
		e := t.Get(k)
		if e == nil {
			nt := &Tab{how: byDotted}
			t.add(k, line, p.tableValue(nt, line))
			t = nt
			continue
		}
		if e.Value.Kind != Table {
			p.fail(line, "%s is already %s (line %d), not a table", quoteKey(parts[:i+1]), e.Value.Kind, e.Line)
		}
		switch e.Value.Table.how {
		case byDotted:
		case implicit:
			e.Value.Table.how = byDotted
		case inline:
			p.fail(line, "%s is an inline table (line %d), closed to additions", quoteKey(parts[:i+1]), e.Line)
		default:
			p.fail(line, "dotted keys cannot add to the table %s defined at line %d", quoteKey(parts[:i+1]), e.Line)
		}
		t = e.Value.Table
	}
	last := parts[len(parts)-1]
	if e := t.Get(last); e != nil {
		p.fail(line, "%s is defined twice (first at line %d)", quoteKey(parts), e.Line)
	}
	t.add(last, line, v)
}

// header reads [name] or [[name]] and makes it the current table.
func (p *parser) header() {
	line := p.line
	p.pos++
	array := !p.eof() && p.src[p.pos] == '['
	if array {
		p.pos++
	}
	p.skipSpace()
	p.keys = p.keys[:0]
	p.key(0)
	parts := p.keys
	closing := "]"
	if array {
		closing = "]]"
	}
	if !strings.HasPrefix(p.src[p.pos:], closing) {
		p.fail(line, "expected %s to close the table header, found %s", closing, p.near())
	}
	p.pos += len(closing)
	t := p.root
	for i, k := range parts[:len(parts)-1] {
		e := t.Get(k)
		if e == nil {
			nt := &Tab{how: implicit}
			t.add(k, line, p.tableValue(nt, line))
			t = nt
			continue
		}
		switch v := e.Value; {
		case v.Kind == Table && v.Table.how == inline:
			p.fail(line, "%s is an inline table (line %d), closed to additions", quoteKey(parts[:i+1]), e.Line)
		case v.Kind == Table:
			t = v.Table
		case v.ArrayOfTables:
			t = v.Items[len(v.Items)-1].Table
		default:
			p.fail(line, "%s is already %s (line %d), not a table", quoteKey(parts[:i+1]), v.Kind, e.Line)
		}
	}
	last := parts[len(parts)-1]
	e := t.Get(last)
	nt := &Tab{how: byHeader}
	switch {
	case array && e == nil:
		v := p.newValue(Array, line)
		v.ArrayOfTables = true
		v.Items = []*Value{p.tableValue(nt, line)}
		t.add(last, line, v)
	case array && e.Value.ArrayOfTables:
		e.Value.Items = append(e.Value.Items, p.tableValue(nt, line))
	case array:
		p.fail(line, "[[%s]] cannot add to %s, which is %s (line %d)", quoteKey(parts), quoteKey(parts), e.Value.Kind, e.Line)
	case e == nil:
		t.add(last, line, p.tableValue(nt, line))
	case e.Value.Kind == Table && e.Value.Table.how == implicit:
		nt = e.Value.Table
		nt.how = byHeader
		e.Value.Line, e.Line = line, line
	case e.Value.ArrayOfTables:
		p.fail(line, "[%s] names a list of tables (line %d); use [[%s]] for another element", quoteKey(parts), e.Line, quoteKey(parts))
	default:
		p.fail(line, "[%s] is defined twice (first at line %d)", quoteKey(parts), e.Line)
	}
	p.cur = nt
}

// quoteKey writes a dotted key for a message, quoting parts that are not
// bare.
func quoteKey(parts []string) string {
	var b strings.Builder
	for i, k := range parts {
		if i > 0 {
			b.WriteByte('.')
		}
		bare := k != ""
		for j := 0; j < len(k); j++ {
			bare = bare && isBare(k[j])
		}
		if len(k) > 40 {
			k = clip(k)
			bare = false
		}
		if bare {
			b.WriteString(k)
		} else {
			fmt.Fprintf(&b, "%q", k)
		}
	}
	return b.String()
}

// clip shortens long user text echoed in a message.
func clip(s string) string {
	const keep = 40
	if len(s) <= keep {
		return s
	}
	end := keep
	for end > 0 && !utf8.RuneStart(s[end]) {
		end--
	}
	return s[:end] + "…"
}
