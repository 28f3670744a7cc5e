package tomltext

import (
	"math"
	"strings"
	"testing"
	"time"

	"github.com/BurntSushi/toml"
)

// TestLines: every table, key and value keeps its line, including keys
// after values that span lines and tables of arrays of tables.
func TestLines(t *testing.T) {
	src := "a = 1\n\n[study]\nname = \"x\" # a comment = 2\nlist = [\n  1,\n  2,\n]\nafter = true\n[[relay]]\nname = \"R1\"\n  [[relay.stage]]\n  tms = 0.1\n[[relay]]\n"
	root, err := Parse([]byte(src), Limits{})
	if err != nil {
		t.Fatal(err)
	}
	study := root.Get("study")
	relays := root.Get("relay")
	stage := relays.Value.Items[0].Table.Get("stage").Value.Items[0]
	cases := []struct {
		what      string
		got, want int
	}{
		{"a", root.Get("a").Line, 1},
		{"[study]", study.Value.Line, 3},
		{"name", study.Value.Table.Get("name").Line, 4},
		{"list", study.Value.Table.Get("list").Line, 5},
		{"list[1]", study.Value.Table.Get("list").Value.Items[1].Line, 7},
		{"after", study.Value.Table.Get("after").Line, 9},
		{"relay[0]", relays.Value.Items[0].Line, 10},
		{"relay[0].stage[0]", stage.Line, 12},
		{"tms", stage.Table.Get("tms").Line, 13},
		{"relay[1]", relays.Value.Items[1].Line, 14},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("%s: line %d, want %d", c.what, c.got, c.want)
		}
	}
}

// TestErrorLines: the first problem is reported with its line, the first
// line included.
func TestErrorLines(t *testing.T) {
	cases := []struct {
		name, src string
		line      int
		msg       string
	}{
		{"first line", "kv = 11 kV\n", 1, `found "kV"`},
		{"bare text", "[study]\nname = Kestrel\n", 2, "text must be in quotes"},
		{"unclosed list", "a = [1,\n2\nb = 3\n", 3, "list opened at line 1"},
		{"unclosed list at the end", "a = [1,\n2\n", 1, "not closed"},
		{"duplicate key", "a = 1\nb = 2\na = 3\n", 3, "first at line 1"},
		{"duplicate table", "[x]\n[y]\n[x]\n", 3, "defined twice"},
		{"table over a list", "[[bus]]\nname = \"A\"\n[bus]\n", 3, "use [[bus]]"},
		{"crlf", "a = 1\r\nb = 2\rc = 3\n", 2, "carriage return"},
		{"not UTF-8", "a = 1\nb = \"\xff\"\n", 2, "not UTF-8"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Parse([]byte(c.src), Limits{})
			e, ok := err.(*Error)
			if !ok {
				t.Fatalf("got %v (%T), want *Error", err, err)
			}
			if e.Line != c.line || !strings.Contains(e.Msg, c.msg) {
				t.Errorf("got line %d %q, want line %d containing %q", e.Line, e.Msg, c.line, c.msg)
			}
		})
	}
}

// TestLimits: input beyond the size or depth limit is refused with a
// message, quickly, whatever its shape.
func TestLimits(t *testing.T) {
	if _, err := Parse([]byte(strings.Repeat("#", 2000)), Limits{MaxBytes: 1000}); err == nil || !strings.Contains(err.Error(), "more than") {
		t.Errorf("oversized input: got %v", err)
	}
	cases := map[string]string{
		"nested lists":          "a = " + strings.Repeat("[", 1<<20),
		"nested inline tables":  "a = " + strings.Repeat("{b = ", 100000),
		"deep dotted key":       strings.Repeat("a.", 1000) + "b = 1",
		"deep table header":     "[" + strings.Repeat("a.", 1000) + "b]",
		"closed nesting at 33":  "a = " + strings.Repeat("[", 33) + strings.Repeat("]", 33),
		"inline tables at 33":   "a = " + strings.Repeat("{b = ", 33) + "1" + strings.Repeat("}", 33),
		"unclosed deep strings": "a = [" + strings.Repeat("\"x\", [", 40),
	}
	for name, src := range cases {
		start := time.Now()
		_, err := Parse([]byte(src), Limits{})
		if err == nil || !strings.Contains(err.Error(), "32") {
			t.Errorf("%s: got %v, want the depth limit", name, err)
		}
		if d := time.Since(start); d > 2*time.Second {
			t.Errorf("%s: took %v", name, d)
		}
	}
	if _, err := Parse([]byte("a = "+strings.Repeat("[", 32)+strings.Repeat("]", 32)), Limits{}); err != nil {
		t.Errorf("32 levels: %v", err)
	}
}

// TestWideTable: a table with very many keys is read in linear time (a
// lookup map replaces the scan) and duplicates are still found.
func TestWideTable(t *testing.T) {
	var b strings.Builder
	for i := range 200000 {
		b.WriteString("k")
		b.WriteString(strings.Repeat("x", i%7))
		b.WriteString(itoa(i))
		b.WriteString(" = 1\n")
	}
	root, err := Parse([]byte(b.String()), Limits{})
	if err != nil || len(root.Entries) != 200000 {
		t.Fatalf("got %v", err)
	}
	b.WriteString("k0 = 2\n")
	if _, err := Parse([]byte(b.String()), Limits{}); err == nil || !strings.Contains(err.Error(), "twice") {
		t.Errorf("duplicate in a wide table: %v", err)
	}
}

func itoa(i int) string {
	if i == 0 {
		return "0"
	}
	var d []byte
	for ; i > 0; i /= 10 {
		d = append([]byte{byte('0' + i%10)}, d...)
	}
	return string(d)
}

// TestCompareCanFail: the suite comparison reports a difference.
func TestCompareCanFail(t *testing.T) {
	want := map[string]any{"a": map[string]any{"type": "integer", "value": "1"}}
	for _, have := range []any{
		map[string]any{"a": map[string]any{"type": "integer", "value": "2"}},
		map[string]any{"a": map[string]any{"type": "float", "value": 1.0}},
		map[string]any{},
		map[string]any{"a": []any{}},
	} {
		if compare("", want, have) == "" {
			t.Errorf("compare(%v, %v) found no difference", want, have)
		}
	}
}

// FuzzParse compares the parser with github.com/BurntSushi/toml on mangled
// documents: it never panics, it accepts nothing the other refuses (the
// other is more lenient in a few places, where the TOML specification
// sides with this parser), and where both accept, both read the same
// values.
func FuzzParse(f *testing.F) {
	for _, s := range []string{
		"a = 1\n[b]\nc = [1, 2.5, \"x\", {d = true}]\n[[e]]\nf = 1979-05-27T07:32:00Z\n",
		"x.y.z = 'lit'\n[x.w]\n\"q k\" = \"\"\"multi\nline\"\"\"\n",
		"n = [-inf, nan, +1_000, 0xff, 0o7, 0b1, 1e-3]\nt = 07:32\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		root, err := Parse(src, Limits{MaxDepth: 16})
		var ref map[string]any
		_, refErr := toml.Decode(string(src), &ref)
		if err != nil {
			if _, ok := err.(*Error); !ok {
				t.Fatalf("error of type %T", err)
			}
			return
		}
		if refErr != nil {
			t.Fatalf("accepted what the reference refuses (%v)", refErr)
		}
		if d := sameAsReference("", tableJSON(root), ref); d != "" {
			t.Fatalf("differs from the reference: %s", d)
		}
	})
}

// sameAsReference compares a tree in the suite's JSON shape with the
// reference decoder's map.
func sameAsReference(at string, have any, ref any) string {
	switch h := have.(type) {
	case map[string]any:
		if typ, ok := h["type"].(string); ok && len(h) == 2 {
			switch typ {
			case "integer":
				r, ok := ref.(int64)
				if !ok || itoa64(r) != h["value"] {
					return at + ": integer"
				}
			case "float":
				r, ok := ref.(float64)
				hv := h["value"].(float64)
				if !ok || (r != hv && !(math.IsNaN(r) && math.IsNaN(hv))) {
					return at + ": float"
				}
			case "string":
				if r, ok := ref.(string); !ok || r != h["value"] {
					return at + ": string"
				}
			case "bool":
				if r, ok := ref.(bool); !ok || (r && h["value"] != "true") || (!r && h["value"] != "false") {
					return at + ": bool"
				}
			}
			return ""
		}
		var r map[string]any
		switch x := ref.(type) {
		case map[string]any:
			r = x
		default:
			return at + ": want a table"
		}
		if len(r) != len(h) {
			return at + ": number of keys"
		}
		for k, v := range h {
			if d := sameAsReference(at+"."+k, v, r[k]); d != "" {
				return d
			}
		}
	case []any:
		var r []any
		switch x := ref.(type) {
		case []any:
			r = x
		case []map[string]any:
			for _, m := range x {
				r = append(r, m)
			}
		default:
			return at + ": want a list"
		}
		if len(r) != len(h) {
			return at + ": list length"
		}
		for i := range h {
			if d := sameAsReference(at, h[i], r[i]); d != "" {
				return d
			}
		}
	}
	return ""
}

func itoa64(i int64) string {
	if i < 0 {
		if i == math.MinInt64 {
			return "-9223372036854775808"
		}
		return "-" + itoa(int(-i))
	}
	return itoa(int(i))
}
