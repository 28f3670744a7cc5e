package tomltext

import (
	"math"
	"strconv"
	"strings"
)

// scalar reads a number, inf, nan or a date-time.
func (p *parser) scalar() *Value {
	line := p.line
	start := p.pos
	p.scanToken()
	tok := p.src[start:p.pos]
	// A date followed by a space and a time is one value.
	if isDate(tok) && p.pos+1 < len(p.src) && p.src[p.pos] == ' ' && isDigit(p.src[p.pos+1]) {
		p.pos++
		p.scanToken()
		tok = p.src[start:p.pos]
	}
	if tok == "" {
		p.fail(line, "expected a value, found %s", p.near())
	}
	if !p.delimitedAt(p.pos) {
		p.pos = start
		p.fail(line, "%s is not a value (text must be in quotes)", p.near())
	}
	switch {
	case len(tok) >= 10 && isDate(tok[:10]):
		if !validDatetime(tok) {
			p.fail(line, "%q is not a valid date or date-time", tok)
		}
		v := p.newValue(Datetime, line)
		v.Str = tok
		return v
	case len(tok) >= 5 && isDigit(tok[0]) && isDigit(tok[1]) && tok[2] == ':':
		if !validTime(tok) {
			p.fail(line, "%q is not a valid time", tok)
		}
		v := p.newValue(Datetime, line)
		v.Str = tok
		return v
	}
	return p.number(tok, line)
}

// scanToken advances over the characters a number or date-time may hold.
func (p *parser) scanToken() {
	for p.pos < len(p.src) {
		c := p.src[p.pos]
		if isBare(c) || c == '+' || c == '.' || c == ':' {
			p.pos++
			continue
		}
		return
	}
}

func isDigit(c byte) bool { return c >= '0' && c <= '9' }

// number reads an integer or a float.
func (p *parser) number(tok string, line int) *Value {
	body, sign := tok, ""
	if body[0] == '+' || body[0] == '-' {
		sign, body = body[:1], body[1:]
	}
	switch body {
	case "inf", "nan":
		v := p.newValue(Float, line)
		v.Float = math.Inf(1)
		if body == "nan" {
			v.Float = math.NaN()
		} else if sign == "-" {
			v.Float = math.Inf(-1)
		}
		return v
	}
	bad := func() {
		if c := tok[0]; c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' {
			p.fail(line, "%q is not a value (text must be in quotes)", clip(tok))
		}
		p.fail(line, "%q is not a number", clip(tok))
	}
	if len(body) > 2 && body[0] == '0' && (body[1] == 'x' || body[1] == 'o' || body[1] == 'b') {
		if sign != "" {
			bad()
		}
		base := map[byte]int{'x': 16, 'o': 8, 'b': 2}[body[1]]
		digits := body[2:]
		if !underscoresBetween(digits, func(c byte) bool { return digitIn(c, base) }) {
			bad()
		}
		n, err := strconv.ParseInt(strings.ReplaceAll(digits, "_", ""), base, 64)
		if err != nil {
			p.fail(line, "%q is out of the range of a 64-bit integer", tok)
		}
		v := p.newValue(Integer, line)
		v.Int = n
		return v
	}
	intPart, frac, exp, isFloat := splitFloat(body)
	if !underscoresBetween(intPart, isDigit) || (len(intPart) > 1 && intPart[0] == '0') {
		bad()
	}
	if isFloat {
		if frac != "" && !underscoresBetween(frac[1:], isDigit) {
			bad()
		}
		if exp != "" {
			e := exp[1:]
			if e != "" && (e[0] == '+' || e[0] == '-') {
				e = e[1:]
			}
			if !underscoresBetween(e, isDigit) {
				bad()
			}
		}
		f, err := strconv.ParseFloat(sign+strings.ReplaceAll(body, "_", ""), 64)
		if err != nil {
			p.fail(line, "%q is out of the range of a number", tok)
		}
		v := p.newValue(Float, line)
		v.Float = f
		return v
	}
	n, err := strconv.ParseInt(sign+strings.ReplaceAll(body, "_", ""), 10, 64)
	if err != nil {
		p.fail(line, "%q is out of the range of a 64-bit integer", tok)
	}
	v := p.newValue(Integer, line)
	v.Int = n
	return v
}

// splitFloat splits a decimal number into its integer digits, its
// fraction (with the dot) and its exponent (with the e).
func splitFloat(s string) (intPart, frac, exp string, isFloat bool) {
	i := strings.IndexAny(s, ".eE")
	if i < 0 {
		return s, "", "", false
	}
	intPart, rest := s[:i], s[i:]
	if rest[0] == '.' {
		j := strings.IndexAny(rest, "eE")
		if j < 0 {
			j = len(rest)
		}
		frac, rest = rest[:j], rest[j:]
	}
	return intPart, frac, rest, true
}

// underscoresBetween reports whether s is digits (by ok) with single
// underscores only between digits.
func underscoresBetween(s string, ok func(byte) bool) bool {
	if s == "" {
		return false
	}
	prevDigit := false
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c == '_':
			if !prevDigit {
				return false
			}
			prevDigit = false
		case ok(c):
			prevDigit = true
		default:
			return false
		}
	}
	return prevDigit
}

func digitIn(c byte, base int) bool {
	switch base {
	case 2:
		return c == '0' || c == '1'
	case 8:
		return c >= '0' && c <= '7'
	}
	return isDigit(c) || c >= 'a' && c <= 'f' || c >= 'A' && c <= 'F'
}

// isDate reports whether s is exactly YYYY-MM-DD in shape.
func isDate(s string) bool {
	if len(s) != 10 || s[4] != '-' || s[7] != '-' {
		return false
	}
	for _, i := range []int{0, 1, 2, 3, 5, 6, 8, 9} {
		if !isDigit(s[i]) {
			return false
		}
	}
	return true
}

func twoDigits(s string) int { return int(s[0]-'0')*10 + int(s[1]-'0') }

// validDatetime checks a date, or a date with a time and an optional
// offset (RFC 3339 with TOML's allowances: a space or t for T, seconds
// optional).
func validDatetime(s string) bool {
	year := int(s[0]-'0')*1000 + int(s[1]-'0')*100 + twoDigits(s[2:4])
	month, day := twoDigits(s[5:7]), twoDigits(s[8:10])
	if month < 1 || month > 12 || day < 1 || day > daysIn(year, month) {
		return false
	}
	if len(s) == 10 {
		return true
	}
	if sep := s[10]; sep != 'T' && sep != 't' && sep != ' ' {
		return false
	}
	t := s[11:]
	// Split off an offset: Z, z or ±HH:MM after the time.
	if n := len(t); n > 0 && (t[n-1] == 'Z' || t[n-1] == 'z') {
		t = t[:n-1]
	} else if i := strings.LastIndexAny(t, "+-"); i >= 0 {
		off := t[i+1:]
		if len(off) != 5 || off[2] != ':' || !isDigit(off[0]) || !isDigit(off[1]) || !isDigit(off[3]) || !isDigit(off[4]) ||
			twoDigits(off) > 23 || twoDigits(off[3:]) > 59 {
			return false
		}
		t = t[:i]
	}
	return validTime(t)
}

// validTime checks HH:MM[:SS[.fraction]].
func validTime(t string) bool {
	if len(t) < 5 || !isDigit(t[0]) || !isDigit(t[1]) || t[2] != ':' || !isDigit(t[3]) || !isDigit(t[4]) {
		return false
	}
	if twoDigits(t) > 23 || twoDigits(t[3:]) > 59 {
		return false
	}
	t = t[5:]
	if t == "" {
		return true
	}
	if len(t) < 3 || t[0] != ':' || !isDigit(t[1]) || !isDigit(t[2]) || twoDigits(t[1:]) > 60 {
		return false
	}
	t = t[3:]
	if t == "" {
		return true
	}
	if t[0] != '.' || len(t) < 2 {
		return false
	}
	for i := 1; i < len(t); i++ {
		if !isDigit(t[i]) {
			return false
		}
	}
	return true
}

func daysIn(year, month int) int {
	switch month {
	case 2:
		if year%4 == 0 && (year%100 != 0 || year%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}
