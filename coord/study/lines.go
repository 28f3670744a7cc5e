package study

import (
	"fmt"
	"regexp"
	"strings"
)

// lineIndex remembers on which line each table and key of a TOML file
// stands, so that errors found after decoding can name the line. TOML
// decoders keep no positions for decoded values, so the file is scanned
// once more, line by line. It understands headers ([t], [[t]], dotted
// names) and key = value lines, including values that continue over
// several lines; keys inside inline tables are attributed to the line of
// the key that holds the inline table.
type lineIndex struct {
	tables map[string]int   // "relay[2]", "relay[2].stage[0]", "study" → header line
	keys   map[string]int   // "relay[2].stage[0].pickup_a" → line
	plain  map[string][]int // "relay.stage.pickup_a" → every line with that key
}

var bareKey = regexp.MustCompile(`^\s*("[^"]*"|'[^']*'|[A-Za-z0-9_.\-" ]+?)\s*=`)

func indexLines(src string) *lineIndex {
	ix := &lineIndex{tables: map[string]int{}, keys: map[string]int{}, plain: map[string][]int{}}
	counts := map[string]int{} // array-of-tables path (indexed parent + name) → elements so far
	current, currentPlain := "", ""
	depth := 0 // open brackets of a value continued from earlier lines
	for n, line := range strings.Split(src, "\n") {
		num := n + 1
		text := stripComment(line)
		if depth > 0 {
			depth += bracketBalance(text)
			continue
		}
		t := strings.TrimSpace(text)
		switch {
		case t == "":
		case strings.HasPrefix(t, "[["):
			name := strings.TrimSpace(strings.TrimSuffix(strings.TrimPrefix(t, "[["), "]]"))
			current, currentPlain = ix.resolve(name, counts, true)
			ix.tables[current] = num
		case strings.HasPrefix(t, "["):
			name := strings.TrimSpace(strings.TrimSuffix(strings.TrimPrefix(t, "["), "]"))
			current, currentPlain = ix.resolve(name, counts, false)
			ix.tables[current] = num
		default:
			m := bareKey.FindStringSubmatch(text)
			if m == nil {
				continue
			}
			key := strings.Trim(strings.TrimSpace(m[1]), `"'`)
			full, plain := join(current, key), join(currentPlain, key)
			if _, dup := ix.keys[full]; !dup {
				ix.keys[full] = num
			}
			ix.plain[plain] = append(ix.plain[plain], num)
			depth = bracketBalance(text[len(m[0]):])
		}
	}
	return ix
}

// resolve turns a header name into its indexed and plain paths, counting
// one more element when the header opens an array of tables.
func (ix *lineIndex) resolve(name string, counts map[string]int, array bool) (indexed, plain string) {
	parts := strings.Split(name, ".")
	for i, p := range parts {
		p = strings.Trim(strings.TrimSpace(p), `"'`)
		plain = join(plain, p)
		base := join(indexed, p)
		last := i == len(parts)-1
		switch {
		case last && array:
			k := counts[base]
			counts[base] = k + 1
			indexed = fmt.Sprintf("%s[%d]", base, k)
		case counts[base] > 0:
			indexed = fmt.Sprintf("%s[%d]", base, counts[base]-1)
		default:
			indexed = base
		}
	}
	return indexed, plain
}

func join(a, b string) string {
	if a == "" {
		return b
	}
	return a + "." + b
}

// scan walks s outside quoted strings, calling at for each byte there
// with its index; at returns false to stop.
func scan(s string, at func(i int, c byte) bool) {
	var quote byte
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case quote != 0:
			if c == '\\' && quote == '"' {
				i++
			} else if c == quote {
				quote = 0
			}
		case c == '"' || c == '\'':
			quote = c
		default:
			if !at(i, c) {
				return
			}
		}
	}
}

// stripComment removes a # comment that is not inside a string.
func stripComment(s string) string {
	end := len(s)
	scan(s, func(i int, c byte) bool {
		if c == '#' {
			end = i
			return false
		}
		return true
	})
	return s[:end]
}

// bracketBalance counts [ and { minus ] and } outside strings.
func bracketBalance(s string) int {
	d := 0
	scan(s, func(_ int, c byte) bool {
		switch c {
		case '[', '{':
			d++
		case ']', '}':
			d--
		}
		return true
	})
	return d
}

// table returns the line of the header of an indexed table, or 0.
func (ix *lineIndex) table(path string) int { return ix.tables[path] }

// key returns the line of key in the indexed table path, falling back to
// the table's header line.
func (ix *lineIndex) key(path, key string) int {
	if n, ok := ix.keys[join(path, key)]; ok {
		return n
	}
	return ix.tables[path]
}
