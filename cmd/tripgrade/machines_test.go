package main

import (
	"encoding/json"
	"path/filepath"
	"strings"
	"testing"
)

// threeWinding is a study with a three-winding transformer, relays on its
// HV and MV terminals, a feeder and a motor group on the tertiary busbar.
const threeWinding = "../../testdata/machines/three-winding.toml"

// TestThreeWindingStudyRunsEveryCommand: check, faults (every format) and
// plot run on a study with a three-winding transformer; the HV relay backs
// up the MV incomer across it; the transformer's internal star point never
// shows as a bus or a fault place; its windings are named after it; and
// the damage check says it could not check the transformer rather than
// staying silent.
func TestThreeWindingStudyRunsEveryCommand(t *testing.T) {
	code, out, errOut := runArgs("check", threeWinding)
	if code == exitUsage || errOut != "" {
		t.Fatalf("check: exit %d, stderr %q", code, errOut)
	}
	for _, want := range []string{"SGT1-HV → SGT1-MV", "SGT1-MV → WD", "not checked: no through-fault withstand curve for a three-winding transformer"} {
		if !strings.Contains(out, want) {
			t.Errorf("check output lacks %q:\n%s", want, out)
		}
	}
	if strings.Contains(out, "star point") {
		t.Errorf("check output names the internal star point:\n%s", out)
	}
	for _, format := range []string{"text", "csv", "json"} {
		code, out, errOut := runArgs("faults", threeWinding, "--format", format)
		if code != exitOK || errOut != "" {
			t.Fatalf("faults --format %s: exit %d, stderr %q", format, code, errOut)
		}
		if strings.Contains(out, "star point") {
			t.Errorf("faults --format %s names the internal star point:\n%s", format, out)
		}
		if !strings.Contains(out, "SGT1 (HV)") || !strings.Contains(out, "SGT1 (MV)") {
			t.Errorf("faults --format %s lacks the winding names SGT1 (HV) and SGT1 (MV)", format)
		}
	}
	dir := t.TempDir()
	code, _, errOut = runArgs("plot", threeWinding, "--device", "SGT1-MV", "--out", filepath.Join(dir, "mv.png"))
	if code != exitOK || errOut != "" {
		t.Fatalf("plot: exit %d, stderr %q", code, errOut)
	}
	// Phase and earth charts are drawn apart: mv-phase.png, mv-earth.png.
	written, _ := filepath.Glob(filepath.Join(dir, "mv*.png"))
	if len(written) == 0 {
		t.Fatalf("plot wrote no chart named after mv.png in %s", dir)
	}
	for _, f := range written {
		checkPNG(t, f)
	}
}

// TestFaultsDutyColumns: the bus table carries i_p, I_b and I_k in every
// format, and they order as the standard has it for a bus fed by motors:
// I_k ≤ I_b ≤ I"k < i_p.
func TestFaultsDutyColumns(t *testing.T) {
	_, out, _ := runArgs("faults", threeWinding, "--format", "json")
	var doc struct {
		Notes []string `json:"notes"`
		Buses []struct {
			Bus string `json:"bus"`
			Max struct {
				LLLA float64 `json:"lll_a"`
			} `json:"max"`
			Duty *struct {
				Kappa     float64 `json:"kappa"`
				PeakA     float64 `json:"peak_a"`
				BreakingA float64 `json:"breaking_a"`
				SteadyA   float64 `json:"steady_a"`
			} `json:"duty"`
		} `json:"buses"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Buses) != 4 || len(doc.Notes) == 0 {
		t.Fatalf("got %d buses and notes %q; want the 4 declared buses and a note on the method", len(doc.Buses), doc.Notes)
	}
	for _, b := range doc.Buses {
		d := b.Duty
		if d == nil {
			t.Fatalf("bus %s has no duty", b.Bus)
		}
		if b.Bus == "HM-11" && !(d.SteadyA < d.BreakingA && d.BreakingA < b.Max.LLLA && b.Max.LLLA < d.PeakA) {
			t.Errorf("bus %s: I_k %g, I_b %g, I\"k %g, i_p %g A; want I_k < I_b < I\"k < i_p (motors decay and drop out)",
				b.Bus, d.SteadyA, d.BreakingA, b.Max.LLLA, d.PeakA)
		}
		if d.Kappa < 1.02 || d.Kappa > 2 {
			t.Errorf("bus %s: κ = %g outside [1.02, 2]", b.Bus, d.Kappa)
		}
	}
	_, text, _ := runArgs("faults", threeWinding)
	_, csv, _ := runArgs("faults", threeWinding, "--format", "csv")
	if !strings.Contains(text, "ip max  Ib max  Ik max") || !strings.Contains(csv, ",lll_peak,max,") ||
		!strings.Contains(csv, ",lll_breaking,max,") || !strings.Contains(csv, ",lll_steady,max,") {
		t.Errorf("text or CSV lacks the duty columns:\n%s\n%s", text, csv)
	}
}
