package study

import (
	"errors"
	"fmt"
	"strings"

	"tripgrade/coord/study/internal/tomltext"
	"tripgrade/faults"
)

// Locate turns an error of the fault engine that names elements of the
// study at path (a *faults.ConditionError) into an ErrorList with the
// line of those elements; any other error comes back unchanged. It reads
// the file again, a cost only this rare error pays.
func Locate(path string, err error) error {
	var ce *faults.ConditionError
	if !errors.As(err, &ce) || len(ce.Elements) == 0 {
		return err
	}
	src, rerr := readLimited(path, MaxStudyBytes)
	if rerr != nil {
		return err
	}
	root, perr := tomltext.Parse(src, tomltext.Limits{MaxBytes: MaxStudyBytes, MaxDepth: maxNesting})
	if perr != nil {
		return err
	}
	first := ce.Elements[0]
	msg := ce.Error()
	var others []string
	for _, r := range ce.Elements[1:] {
		if l := elementLine(root, r); l > 0 {
			others = append(others, fmt.Sprintf("%s is on line %d", r, l))
		}
	}
	if len(others) > 0 {
		msg += " (" + strings.Join(others, ", ") + ")"
	}
	return ErrorList{{File: path, Line: elementLine(root, first), Element: first.String(), Msg: msg}}
}

// elementLine finds the line of the table of element r, or 0.
func elementLine(root *tomltext.Tab, r faults.ElementRef) int {
	e := root.Get(r.Kind)
	if e == nil || e.Value.Kind != tomltext.Array {
		return 0
	}
	for _, it := range e.Value.Items {
		if it.Kind != tomltext.Table {
			continue
		}
		if n := it.Table.Get("name"); n != nil && n.Value.Kind == tomltext.String && n.Value.Str == r.Name {
			return it.Line
		}
	}
	return 0
}
