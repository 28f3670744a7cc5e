package report

import (
	"bytes"
	"encoding/json"
	"regexp"
	"testing"

	"tripgrade/coord"
	"tripgrade/faults"
)

// backupRow is a backup-sensitivity finding: the figure is the upstream
// device's current (1544 A at HVR), the downstream device's current for
// the same fault is 2674 A at LVI, and a second row has a device that
// carries no residual current at all.
func backupRows() *Findings {
	x := coord.Finding{Check: coord.BackupSensitivity, Device: "LVI", Other: "HVR", Stage: "phase", Verdict: coord.Pass,
		Measured: 1544, Required: 360, Margin: 1184, Unit: "A", Relation: "≥", Valid: true,
		Fault: &coord.FaultRef{Kind: faults.LL, Case: faults.Min, Place: "LV", DeviceA: 2674, DeviceQty: coord.Phase, OtherA: 1544, OtherQty: coord.Phase}}
	y := coord.Finding{Check: coord.Grading, Device: "F1", Other: "INC", Verdict: coord.Pass,
		Measured: 0.4, Required: 0.3, Margin: 0.1, Unit: "s", Relation: "≥", Valid: true,
		Fault: &coord.FaultRef{Kind: faults.LG, Case: faults.Max, Place: "F1 50 %", Interpolated: true, Scale: 0.625,
			DeviceA: 380, DeviceQty: coord.Residual, OtherA: 0, OtherQty: coord.Residual, DeviceS: 0.2, OtherS: 0.6}}
	return &Findings{Study: "q", Rows: []Row{newRow(&x), newRow(&y)}, Pass: 2}
}

// TestEveryCurrentNamesItsDevice: the detail of a backup-sensitivity row
// puts the measured current with the upstream device it belongs to, and a
// current of 0 reads "none", never "0 A".
func TestEveryCurrentNamesItsDevice(t *testing.T) {
	f := backupRows()
	if got, want := f.Rows[0].Detail, "1544 A at HVR (upstream); 2674 A at LVI"; got != want {
		t.Errorf("backup detail %q, want %q", got, want)
	}
	if got, want := f.Rows[1].Detail, "F1: 380 A 3I0, 0.200 s; INC: none, 0.600 s"; got != want {
		t.Errorf("grading detail %q, want %q", got, want)
	}
	if got, want := f.Rows[1].Fault, "LG max @ F1 50 % (sweep, 62 %)"; got != want {
		t.Errorf("fault %q, want %q", got, want)
	}
}

// TestQuantitiesInCSVAndJSON: CSV and JSON say whose each current is and
// whether it is a phase or the residual current; a current of 0 is left
// out (no current), never written as a number.
func TestQuantitiesInCSVAndJSON(t *testing.T) {
	f := backupRows()
	rows, col := findingsCSV(t, f)
	get := func(r int, name string) string {
		i, ok := col[name]
		if !ok {
			t.Fatalf("CSV has no column %q: %q", name, rows[0])
		}
		return rows[r][i]
	}
	for _, w := range []struct {
		row        int
		name, want string
	}{
		{1, "device_current_a", "2674"}, {1, "device_quantity", "phase"},
		{1, "other_current_a", "1544"}, {1, "other_quantity", "phase"},
		{2, "device_current_a", "380"}, {2, "device_quantity", "residual"},
		{2, "other_current_a", ""}, {2, "other_quantity", ""}, {2, "sweep_scale", "0.625"},
	} {
		if got := get(w.row, w.name); got != w.want {
			t.Errorf("CSV row %d %s = %q, want %q", w.row, w.name, got, w.want)
		}
	}
	var j bytes.Buffer
	if err := f.WriteJSON(&j); err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Findings []struct {
			Fault map[string]any `json:"fault"`
		} `json:"findings"`
	}
	if err := json.Unmarshal(j.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	b, g := doc.Findings[0].Fault, doc.Findings[1].Fault
	if b["other_current_a"] != 1544.0 || b["other_quantity"] != "phase" || b["device_current_a"] != 2674.0 {
		t.Errorf("backup fault in JSON %v", b)
	}
	if _, has := g["other_current_a"]; has || g["device_quantity"] != "residual" || g["sweep_scale"] != 0.625 {
		t.Errorf("grading fault in JSON %v", g)
	}
	if regexp.MustCompile(`[0-9]e-[0-9]`).MatchString(j.String()) {
		t.Errorf("JSON holds a tiny number: %s", j.String())
	}
}

// TestHealthyPhasesAreNone: for a line-to-earth fault I0 = I1 = I2, so the
// healthy phases Ib = I0 + a²I1 + aI2 and Ic cancel exactly (symmetrical
// components, Fortescue); floating point leaves some 1e-13 A with an
// arbitrary angle, which the JSON must give as 0 A at 0°.
func TestHealthyPhasesAreNone(t *testing.T) {
	i := complex(123.4, -456.7)
	f := Figure{A: 3 * 473.1, Found: true, At: faults.Currents{Seq: [3]complex128{i, i, i}}}
	p := f.json().Phases
	if p.IbA != 0 || p.IbDeg != 0 || p.IcA != 0 || p.IcDeg != 0 {
		t.Errorf("healthy phases %g A at %g°, %g A at %g°; want none", p.IbA, p.IbDeg, p.IcA, p.IcDeg)
	}
	if !(p.IaA > 1400) || !(p.ResidualA > 1400) {
		t.Errorf("faulted phase %g A, residual %g A", p.IaA, p.ResidualA)
	}
}
