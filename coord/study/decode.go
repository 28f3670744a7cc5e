package study

import (
	"fmt"
	"math"
	"reflect"
	"strconv"
	"sync"

	"tripgrade/coord/study/internal/tomltext"
)

// decoder fills the raw schema structs from the parsed TOML tree,
// collecting every unknown key and wrong type instead of stopping at the
// first, and recording the line of every table and key. Struct fields
// name their key with a `key:"…"` tag.
type decoder struct {
	file  string
	lines *lineIndex
	errs  ErrorList
	// blamed holds the indexed paths of keys whose value was refused, and
	// of known keys an unknown one was probably meant to be: any later
	// problem with them ("kv is missing") follows from the one reported.
	blamed map[string]bool
	// failures counts every problem found, those left unsaid as
	// consequences included, so a step can tell whether its input was
	// sound.
	failures int
	floats   []float64 // slab for optional numbers
}

func newDecoder(file string, root *tomltext.Tab) *decoder {
	return &decoder{file: file, lines: &lineIndex{root: root}, blamed: map[string]bool{}}
}

func (d *decoder) errorf(line int, element, format string, args ...any) {
	d.failures++
	d.errs = append(d.errs, &Error{File: d.file, Line: line, Element: clipText(element, maxEchoElement), Msg: message(format, args...)})
}

// schemaFields maps each raw struct type to its key → field index table,
// built once per type.
var schemaFields sync.Map // reflect.Type → map[string]int

func fieldsOf(rt reflect.Type) map[string]int {
	if f, ok := schemaFields.Load(rt); ok {
		return f.(map[string]int)
	}
	fields := map[string]int{}
	for i := 0; i < rt.NumField(); i++ {
		if k := rt.Field(i).Tag.Get("key"); k != "" {
			fields[k] = i
		}
	}
	schemaFields.Store(rt, fields)
	return fields
}

// table decodes t at indexed path into the struct pointed to by dst.
// element names the table in messages (e.g. `relay "F3"`), or is empty.
func (d *decoder) table(t *tomltext.Tab, path, element string, dst any) {
	rv := reflect.ValueOf(dst).Elem()
	fields := fieldsOf(rv.Type())
	for _, e := range t.Entries {
		fi, ok := fields[e.Key]
		if !ok {
			hint := suggest(e.Key, fields)
			if near := Closest(e.Key, keysOf(fields)); near != "" && t.Get(near) == nil {
				d.blamed[join(path, near)] = true
			}
			d.errorf(e.Line, element, "unknown key %q%s", e.Key, hint)
			continue
		}
		d.value(e.Value, path, e.Key, element, e.Line, rv.Field(fi))
	}
}

func keysOf(m map[string]int) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sortStrings(out)
	return out
}

// value stores one TOML value v, of key in the table at parent, into
// field f.
func (d *decoder) value(v *tomltext.Value, parent, key, element string, line int, f reflect.Value) {
	bad := func(want string) {
		d.blamed[join(parent, key)] = true
		d.errorf(line, element, "%s must be %s (got %s)", key, want, describe(v))
	}
	switch f.Kind() {
	case reflect.Pointer:
		if f.Type() == floatPointer { // most keys: take the number from a slab
			if x, ok := d.number(v, parent, key, element, line); ok {
				f.Set(reflect.ValueOf(d.float(x)))
			}
			return
		}
		nv := reflect.New(f.Type().Elem())
		before := d.failures
		d.value(v, parent, key, element, line, nv.Elem())
		if d.failures == before {
			f.Set(nv)
		}
	case reflect.String:
		if v.Kind != tomltext.String {
			bad("text in quotes")
			return
		}
		f.SetString(v.Str)
	case reflect.Bool:
		if v.Kind != tomltext.Bool {
			bad("true or false")
			return
		}
		f.SetBool(v.Bool)
	case reflect.Float64:
		x, ok := d.number(v, parent, key, element, line)
		if ok {
			f.SetFloat(x)
		}
	case reflect.Slice:
		d.slice(v, parent, key, element, line, f)
	case reflect.Array: // [N]float64, e.g. a current–time point
		if v.Kind != tomltext.Array || len(v.Items) != f.Len() {
			bad(fmt.Sprintf("a list of %d numbers", f.Len()))
			return
		}
		for i, it := range v.Items {
			x, ok := d.number(it, parent, key, element, line)
			if !ok {
				return
			}
			f.Index(i).SetFloat(x)
		}
	case reflect.Struct:
		if v.Kind != tomltext.Table {
			bad("a table")
			return
		}
		path := join(parent, key)
		if element == "" {
			element = "[" + path + "]"
		}
		d.table(v.Table, path, element, f.Addr().Interface())
	default:
		panic("study: unsupported field kind " + f.Kind().String())
	}
}

var floatPointer = reflect.TypeFor[*float64]()

// float returns a pointer to x from a slab, sparing the garbage collector
// a million tiny allocations in a large study.
func (d *decoder) float(x float64) *float64 {
	if len(d.floats) == 0 {
		d.floats = make([]float64, 4096)
	}
	p := &d.floats[0]
	d.floats = d.floats[1:]
	*p = x
	return p
}

// number reads a finite number.
func (d *decoder) number(v *tomltext.Value, parent, key, element string, line int) (float64, bool) {
	var x float64
	switch v.Kind {
	case tomltext.Integer:
		x = float64(v.Int)
	case tomltext.Float:
		x = v.Float
	default:
		d.blamed[join(parent, key)] = true
		d.errorf(line, element, "%s must be a number (got %s)", key, describe(v))
		return 0, false
	}
	if math.IsNaN(x) || math.IsInf(x, 0) {
		d.blamed[join(parent, key)] = true
		d.errorf(line, element, "%s must be a finite number (got %v)", key, x)
		return 0, false
	}
	return x, true
}

// slice stores a TOML array into a slice field: of numbers, of strings, of
// fixed-size number arrays, or of tables (an array of tables).
func (d *decoder) slice(v *tomltext.Value, parent, key, element string, line int, f reflect.Value) {
	elem := f.Type().Elem()
	path := join(parent, key)
	if v.Kind != tomltext.Array {
		d.blamed[path] = true
		if elem.Kind() == reflect.Struct && v.Kind == tomltext.Table {
			d.errorf(line, element, "[%s] must be [[%s]]: each %s is its own [[%s]] table", key, key, key, key)
			return
		}
		d.errorf(line, element, "%s must be a list (got %s)", key, describe(v))
		return
	}
	out := reflect.MakeSlice(f.Type(), len(v.Items), len(v.Items))
	for i, it := range v.Items {
		if elem.Kind() == reflect.Struct {
			if it.Kind != tomltext.Table {
				d.blamed[path] = true
				d.errorf(line, element, "%s must be a list of tables (got %s in it)", key, describe(it))
				return
			}
			d.table(it.Table, path+"["+strconv.Itoa(i)+"]", elementName(key, element, i, it), out.Index(i).Addr().Interface())
			continue
		}
		d.value(it, parent, key, element, line, out.Index(i))
	}
	f.Set(out)
}

// elementName names the i-th table of an array for messages: `relay "F3"`
// when it has a name, `relay "F3" stage 2` for a nameless sub-table,
// `pair 4` otherwise.
func elementName(key, parent string, i int, v *tomltext.Value) string {
	if v.Kind == tomltext.Table {
		if e := v.Table.Get("name"); e != nil && e.Value.Kind == tomltext.String && e.Value.Str != "" {
			return key + " " + strconv.Quote(clipText(e.Value.Str, maxEchoName))
		}
	}
	if parent != "" {
		return parent + " " + key + " " + strconv.Itoa(i+1)
	}
	return key + " " + strconv.Itoa(i+1)
}

func describe(v *tomltext.Value) string {
	switch v.Kind {
	case tomltext.String:
		return "text " + strconv.Quote(clipText(v.Str, maxEchoName))
	case tomltext.Bool:
		return strconv.FormatBool(v.Bool)
	case tomltext.Integer:
		return "the number " + strconv.FormatInt(v.Int, 10)
	case tomltext.Float:
		return "the number " + strconv.FormatFloat(v.Float, 'g', -1, 64)
	case tomltext.Datetime:
		return "the unquoted date or time " + clipText(v.Str, maxEchoName)
	case tomltext.Array:
		return "a list"
	case tomltext.Table:
		return "a table"
	}
	return "nothing"
}
