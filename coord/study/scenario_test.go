package study

import (
	"reflect"
	"testing"

	"tripgrade/coord"
)

// TestNMinus1Outages: the sweep of lines and transformers of a small
// meshed study (testdata/scenarios/n1-mesh.toml) gives one scenario per
// ring line, in file order, named after the element out; the transformer
// and the spur, whose outages leave buses with no source, are left out
// and named in a note.
func TestNMinus1Outages(t *testing.T) {
	s, err := Load("../../testdata/scenarios/n1-mesh.toml")
	if err != nil {
		t.Fatal(err)
	}
	var changes []string
	for _, sc := range s.Scenarios {
		changes = append(changes, sc.Changes)
		if !sc.Outage {
			t.Errorf("%s: not marked an outage of the sweep", sc.Name)
		}
	}
	wantOutages(t, s, []string{"TB-AB out", "TB-BC out", "TB-CA out"}, []string{
		"N-1 (line, transformer): 3 single outages",
		"N-1: 2 outages left out because they leave part of the network with no source: TB-DE out, TB-T out",
	})
	if want := []string{"line TB-AB out of service", "line TB-BC out of service", "line TB-CA out of service"}; !reflect.DeepEqual(changes, want) {
		t.Errorf("changes %q, want %q", changes, want)
	}
	// Each outage builds the study without its line and the relay on it
	// (A-AB on TB-AB, A-CA on TB-CA; TB-BC has none), and nothing else.
	for k, sc := range s.Scenarios {
		st, err := sc.Build()
		if err != nil {
			t.Fatalf("%s: %v", sc.Name, err)
		}
		if got, want := len(st.Network.Lines), len(s.Network.Lines)-1; got != want {
			t.Errorf("%s: %d lines, want %d", sc.Name, got, want)
		}
		wantDevices := len(s.Devices) - []int{1, 0, 1}[k]
		if len(st.Devices) != wantDevices || len(st.Scenarios) != 0 {
			t.Errorf("%s: %d devices and %d scenarios, want %d and none", sc.Name, len(st.Devices), len(st.Scenarios), wantDevices)
		}
	}
}

// TestOutageNamesOfSharedNames: an element whose name another kind
// shares is named with its kind in the sweep ("generator MILL out"), so
// that no two outages are called alike; the outage of the grid source,
// which leaves the network to the generator alone, is left out with its
// note (an island the generator's own protection would not let stand).
func TestOutageNamesOfSharedNames(t *testing.T) {
	src := `
[study]
name = "shared names"
n_minus_1 = ["line", "generator", "source"]
[[bus]]
name = "A"
kv = 11
[[bus]]
name = "B"
kv = 11
[[source]]
name = "grid"
bus = "A"
sc_mva_max = 200
sc_mva_min = 100
z0_z1 = 1
[[generator]]
name = "MILL"
bus = "B"
mva = 2
kv = 11
xd_pct = 15
[[line]]
name = "MILL"
from = "A"
to = "B"
type = "cable"
r1_ohm = 0.1
x1_ohm = 0.1
r0_ohm = 0.3
x0_ohm = 0.3
[[line]]
name = "MILL-2"
from = "A"
to = "B"
type = "cable"
r1_ohm = 0.1
x1_ohm = 0.1
r0_ohm = 0.3
x0_ohm = 0.3
`
	s, err := Parse("shared.toml", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	wantOutages(t, s, []string{"line MILL out", "MILL-2 out", "generator MILL out"}, []string{
		"N-1 (line, generator, source): 3 single outages",
		"N-1: 1 outage left out because it leaves part of the network that a grid source feeds as drawn to embedded generators alone (write a [[scenario]] to check such an island): grid out",
	})
}

// wantOutages compares a study's scenarios, by name, and its scenario
// notes with those expected.
func wantOutages(t *testing.T, s *coord.Study, names, notes []string) {
	t.Helper()
	var got []string
	for _, sc := range s.Scenarios {
		got = append(got, sc.Name)
	}
	if !reflect.DeepEqual(got, names) {
		t.Errorf("outages %q, want %q", got, names)
	}
	if !reflect.DeepEqual(s.ScenarioNotes, notes) {
		t.Errorf("notes %q, want %q", s.ScenarioNotes, notes)
	}
}
