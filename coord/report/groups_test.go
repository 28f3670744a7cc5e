package report

import (
	"reflect"
	"testing"

	"tripgrade/coord"
)

// Rows that come check by check are grouped without copying; rows in any
// other order are grouped the same way by copying.
func TestGroupsInCheckOrder(t *testing.T) {
	k := coord.CheckKinds
	row := func(c coord.CheckKind, dev string) Row { return Row{Finding: &coord.Finding{Check: c, Device: dev}} }
	ordered := &Findings{Rows: []Row{row(k[0], "a"), row(k[0], "b"), row(k[2], "c"), row(k[3], "d"), row(k[3], "e")}}
	mixed := &Findings{Rows: []Row{row(k[3], "d"), row(k[0], "a"), row(k[2], "c"), row(k[0], "b"), row(k[3], "e")}}
	want := [][]Row{{row(k[0], "a"), row(k[0], "b")}, {row(k[2], "c")}, {row(k[3], "d"), row(k[3], "e")}}
	if _, ok := ordered.runs(); !ok {
		t.Fatal("rows in check order were not taken as runs")
	}
	if _, ok := mixed.runs(); ok {
		t.Fatal("rows out of check order were taken as runs")
	}
	for _, f := range []*Findings{ordered, mixed} {
		if got := f.groups(); !reflect.DeepEqual(got, want) {
			t.Errorf("groups = %v, want %v", got, want)
		}
	}
	if g := ordered.groups(); &g[0][0] != &ordered.Rows[0] {
		t.Error("ordered rows were copied")
	}
}
