package study

import (
	"strings"
	"testing"
)

// withKeys returns the tiny study with text replaced.
func withKeys(replace ...string) string {
	s := tiny
	for i := 0; i+1 < len(replace); i += 2 {
		s = strings.Replace(s, replace[i], replace[i+1], 1)
	}
	return s
}

// TestNewKeysReachTheModel: voltage factors, fault reactances, the
// instantaneous operating time, margins of relays and pairs and the
// declaration of earth faults left to other protection.
func TestNewKeysReachTheModel(t *testing.T) {
	src := withKeys(`name = "tiny"`, "name = \"tiny\"\nc_max = 1.0\nc_min = 0.95",
		"[[bus]]", "[criteria]\nfault_resistance_ohm = 10\nfault_reactance_ohm = 5\nphase_fault_reactance_ohm = 0.5\ninstantaneous_time_s = 0.02\n\n[[bus]]",
		"ct_secondary_a = 5\n", "ct_secondary_a = 5\nmargin_s = 0.4\ninstantaneous_time_s = 0.015\nearth_faults_cleared_by = \"standby earth fault\"\n")
	s, err := Parse("tiny.toml", []byte(src), nil)
	if err != nil {
		t.Fatal(err)
	}
	f := s.Faults
	if f.CMax != 1.0 || f.CMin != 0.95 || f.EarthFaultOhm != 10 || f.EarthFaultXOhm != 5 || f.PhaseFaultXOhm != 0.5 {
		t.Errorf("fault settings %+v", f)
	}
	d := s.Devices[0]
	if s.Criteria.InstantaneousTimeS != 0.02 || d.InstantaneousTimeS != 0.015 || d.MarginS != 0.4 || d.EarthFaultsBy != "standby earth fault" {
		t.Errorf("criteria %g s, relay %g s, margin %g s, declaration %q", s.Criteria.InstantaneousTimeS, d.InstantaneousTimeS, d.MarginS, d.EarthFaultsBy)
	}
	// Without keys: the documented defaults.
	s, err = Parse("tiny.toml", []byte(tiny), nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Faults.CMax != 0 || s.Devices[0].InstantaneousTimeS != 0.03 || s.Devices[0].MarginS != 0 {
		t.Errorf("defaults: c_max %g, instantaneous %g s, margin %g s", s.Faults.CMax, s.Devices[0].InstantaneousTimeS, s.Devices[0].MarginS)
	}
}

// TestNewKeysErrors: each bad value gives one error with its line.
func TestNewKeysErrors(t *testing.T) {
	pair := "\n[[pair]]\nupstream = \"R1\"\ndownstream = \"R1\"\n"
	cases := []struct {
		name, src, want string
	}{
		{"c_min above c_max", withKeys(`name = "tiny"`, "name = \"tiny\"\nc_max = 1.0\nc_min = 1.05"), "c_min 1.05 exceeds c_max 1 above 1 kV"},
		{"c_min above Table 1 LV c_max", withKeys(`name = "tiny"`, "name = \"tiny\"\nc_min = 1.08"), "c_min 1.08 exceeds c_max 1.05 up to 1 kV"},
		{"c out of range", withKeys(`name = "tiny"`, "name = \"tiny\"\nc_max = 1.5"), "c_max must be ≥ 0.8 and ≤ 1.2"},
		{"blank declaration", withKeys("ct_secondary_a = 5\n", "ct_secondary_a = 5\nearth_faults_cleared_by = \"  \"\n"), "earth_faults_cleared_by must name the protection"},
		{"relay margin", withKeys("ct_secondary_a = 5\n", "ct_secondary_a = 5\nmargin_s = 0\n"), "margin_s must be > 0"},
		{"excluded pair margin", tiny + strings.Replace(pair, `downstream = "R1"`, "downstream = \"R1\"\nexclude = true\nmargin_s = 0.4", 1), "an excluded pair is not graded"},
		{"negative reactance", withKeys("[[bus]]", "[criteria]\nlv_fault_reactance_ohm = -1\n[[bus]]"), "lv_fault_reactance_ohm must be ≥ 0"},
	}
	for _, c := range cases {
		_, err := Parse("tiny.toml", []byte(c.src), nil)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.name, err, c.want)
			continue
		}
		for _, e := range err.(ErrorList) {
			if strings.Contains(e.Msg, c.want) && e.Line == 0 {
				t.Errorf("%s: %q has no line", c.name, e.Msg)
			}
		}
	}
	fuse := withKeys("[[relay]]", "[[fuse]]\nname = \"FU\"\nbranch = \"L1\"\nat = \"B\"\nrating_a = 40\nmelt = [[80, 10], [800, 0.1]]\nclear = [[80, 12], [800, 0.12]]\n\n[[relay]]") +
		"\n[[pair]]\nupstream = \"FU\"\ndownstream = \"R1\"\nmargin_s = 0.4\n"
	if _, err := Parse("tiny.toml", []byte(fuse), nil); err == nil || !strings.Contains(err.Error(), "is a fuse") {
		t.Errorf("fuse upstream with margin_s: got %v", err)
	}
}
