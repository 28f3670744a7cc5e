package study

import (
	"fmt"
	"math"
	"reflect"
	"sort"
	"time"
)

// decoder fills the raw schema structs from the generic tree a TOML parser
// returns, collecting every unknown key and wrong type instead of stopping
// at the first. Struct fields name their key with a `key:"…"` tag.
type decoder struct {
	file  string
	lines *lineIndex
	errs  ErrorList
}

func (d *decoder) errorf(line int, element, format string, args ...any) {
	d.errs = append(d.errs, &Error{File: d.file, Line: line, Element: element, Msg: fmt.Sprintf(format, args...)})
}

// table decodes map m at indexed path into the struct pointed to by dst.
// element names the table in messages (e.g. `relay "F3"`), or is empty.
func (d *decoder) table(m map[string]any, path, element string, dst any) {
	rv := reflect.ValueOf(dst).Elem()
	rt := rv.Type()
	fields := map[string]int{}
	for i := 0; i < rt.NumField(); i++ {
		if k := rt.Field(i).Tag.Get("key"); k != "" {
			fields[k] = i
		}
	}
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		i, ok := fields[k]
		line := d.lines.key(path, k)
		if !ok {
			d.errorf(line, element, "unknown key %q%s", k, suggest(k, fields))
			continue
		}
		d.value(m[k], join(path, k), k, element, line, rv.Field(i))
	}
}

// value stores one TOML value v into field f.
func (d *decoder) value(v any, path, key, element string, line int, f reflect.Value) {
	bad := func(want string) {
		d.errorf(line, element, "%s must be %s (got %s)", key, want, describe(v))
	}
	switch f.Kind() {
	case reflect.Pointer:
		nv := reflect.New(f.Type().Elem())
		before := len(d.errs)
		d.value(v, path, key, element, line, nv.Elem())
		if len(d.errs) == before {
			f.Set(nv)
		}
	case reflect.String:
		s, ok := v.(string)
		if !ok {
			bad("text in quotes")
			return
		}
		f.SetString(s)
	case reflect.Bool:
		b, ok := v.(bool)
		if !ok {
			bad("true or false")
			return
		}
		f.SetBool(b)
	case reflect.Float64:
		x, ok := number(v)
		if !ok {
			bad("a number")
			return
		}
		if math.IsNaN(x) || math.IsInf(x, 0) {
			d.errorf(line, element, "%s must be a finite number (got %v)", key, x)
			return
		}
		f.SetFloat(x)
	case reflect.Slice:
		d.slice(v, path, key, element, line, f)
	case reflect.Array: // [N]float64, e.g. a current–time point
		arr, ok := v.([]any)
		if !ok || len(arr) != f.Len() {
			bad(fmt.Sprintf("a list of %d numbers", f.Len()))
			return
		}
		for i := range arr {
			x, ok := number(arr[i])
			if !ok {
				bad(fmt.Sprintf("a list of %d numbers", f.Len()))
				return
			}
			f.Index(i).SetFloat(x)
		}
	case reflect.Struct:
		m, ok := v.(map[string]any)
		if !ok {
			bad("a table")
			return
		}
		if element == "" {
			element = "[" + path + "]"
		}
		d.table(m, path, element, f.Addr().Interface())
	default:
		panic("study: unsupported field kind " + f.Kind().String())
	}
}

// slice stores a TOML array into a slice field: of numbers, of strings, of
// fixed-size number arrays, or of tables (an array of tables).
func (d *decoder) slice(v any, path, key, element string, line int, f reflect.Value) {
	elem := f.Type().Elem()
	var items []any
	switch t := v.(type) {
	case []any:
		items = t
	case []map[string]any:
		for _, m := range t {
			items = append(items, m)
		}
	default:
		d.errorf(line, element, "%s must be a list (got %s)", key, describe(v))
		return
	}
	out := reflect.MakeSlice(f.Type(), len(items), len(items))
	for i, it := range items {
		p := fmt.Sprintf("%s[%d]", path, i)
		ln, el := line, element
		if elem.Kind() == reflect.Struct {
			if l := d.lines.table(p); l > 0 {
				ln = l
			}
			el = elementName(key, element, i, it)
		}
		d.value(it, p, key, el, ln, out.Index(i))
	}
	f.Set(out)
}

// elementName names the i-th table of an array for messages: `relay "F3"`
// when it has a name, `relay "F3" stage 2` for a nameless sub-table,
// `pair 4` otherwise.
func elementName(key, parent string, i int, v any) string {
	if m, ok := v.(map[string]any); ok {
		if n, ok := m["name"].(string); ok && n != "" {
			return fmt.Sprintf("%s %q", key, n)
		}
	}
	if parent != "" {
		return fmt.Sprintf("%s %s %d", parent, key, i+1)
	}
	return fmt.Sprintf("%s %d", key, i+1)
}

func number(v any) (float64, bool) {
	switch x := v.(type) {
	case int64:
		return float64(x), true
	case float64:
		return x, true
	}
	return 0, false
}

func describe(v any) string {
	switch x := v.(type) {
	case string:
		return fmt.Sprintf("text %q", x)
	case bool:
		return fmt.Sprintf("%v", x)
	case int64, float64:
		return fmt.Sprintf("the number %v", x)
	case []any, []map[string]any:
		return "a list"
	case map[string]any:
		return "a table"
	case time.Time:
		return "a bare TOML date or time; put it in quotes"
	}
	return fmt.Sprintf("%T", v)
}
