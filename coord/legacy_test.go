package coord_test

import (
	"strings"
	"testing"

	"tripgrade/coord"
)

// TestLegacyVerdicts: the issue that added directional stages and the
// fault-by-fault discrimination and fault-clearing checks asks that the
// radial studies without generation or direction, where none of that
// applies, keep the verdicts of every earlier check. legacyVerdicts holds,
// per study, every finding of those checks (grading, primary and backup
// sensitivity, load, instantaneous reach, inrush, damage, settings) with
// its verdict as tripgrade gave them at commit 813bcd2, main as the
// discrimination work began (check --format json, in report order), and
// for the corrected Fenwick Quay settings, which main revised later (FM's
// instantaneous stage removed, the standby earth-fault relay declared), at
// main's commit b0c49bd; the
// test asks the same findings, one for one, with the same verdicts. It is
// a regression record of our own earlier output, not a check against the
// outside world.
func TestLegacyVerdicts(t *testing.T) {
	for _, st := range legacyVerdicts {
		name := strings.TrimPrefix(st.path, "../")
		t.Run(name, func(t *testing.T) {
			r := checkFile(t, st.path)
			type key struct {
				check, device, other, stage string
				n                           int
			}
			seen := map[key]int{}
			got := map[key]string{}
			var order []key
			for _, f := range r.Findings {
				if f.Check == coord.Discrimination || f.Check == coord.Clearing {
					continue
				}
				k := key{f.Check.Slug(), f.Device, f.Other, f.Stage, 0}
				seen[k]++
				k.n = seen[k]
				got[k] = f.Verdict.String()
				order = append(order, k)
			}
			want := map[key]legacyRow{}
			count := map[key]int{}
			for _, row := range st.rows {
				k := key{row.check, row.device, row.other, row.stage, 0}
				count[k]++
				k.n = count[k]
				want[k] = row
			}
			for k, row := range want {
				v, ok := got[k]
				switch {
				case !ok:
					t.Errorf("%s %s %s %s (#%d): %s before, now missing", k.check, k.device, k.other, k.stage, k.n, row.verdict)
				case v != row.verdict:
					t.Errorf("%s %s %s %s (#%d): %s before, now %s", k.check, k.device, k.other, k.stage, k.n, row.verdict, v)
				}
			}
			for _, k := range order {
				if _, ok := want[k]; !ok {
					t.Errorf("%s %s %s %s (#%d): new finding, %s", k.check, k.device, k.other, k.stage, k.n, got[k])
				}
			}
		})
	}
}

// legacyRow is one finding of an earlier check and its verdict.
type legacyRow struct {
	check, device, other, stage, verdict string
}

// legacyVerdicts: see TestLegacyVerdicts.
var legacyVerdicts = []struct {
	path string
	rows []legacyRow
}{
	{"../testdata/checks/backup-delta.toml", []legacyRow{
		{"grading", "LV-FUSE", "HV-FUSE", "", "PASS"},
		{"primary_sensitivity", "HV-FUSE", "", "phase", "PASS"},
		{"primary_sensitivity", "HV-FUSE", "", "every kind", "PASS"},
		{"primary_sensitivity", "LV-FUSE", "", "phase", "PASS"},
		{"primary_sensitivity", "LV-FUSE", "", "every kind", "PASS"},
		{"backup_sensitivity", "LV-FUSE", "HV-FUSE", "phase", "FAIL"},
		{"load", "HV-FUSE", "", "phase", "PASS"},
		{"load", "LV-FUSE", "", "phase", "PASS"},
		{"inrush", "HV-FUSE", "", "phase", "PASS"},
		{"damage", "HV-FUSE", "T", "", "PASS"},
	}},
	{"../testdata/checks/backup-sensitivity.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "FAIL"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/damage-beyond-end.toml", []legacyRow{
		{"primary_sensitivity", "R", "", "phase", "PASS"},
		{"primary_sensitivity", "R", "", "every kind", "PASS"},
		{"load", "R", "", "phase", "PASS"},
		{"inrush", "R", "", "phase", "PASS"},
		{"damage", "R", "T", "", "FAIL"},
		{"settings", "R", "", "CT", "PASS"},
	}},
	{"../testdata/checks/damage-remote.toml", []legacyRow{
		{"primary_sensitivity", "R", "", "phase", "PASS"},
		{"primary_sensitivity", "R", "", "every kind", "PASS"},
		{"load", "R", "", "phase", "PASS"},
		{"inrush", "R", "", "phase", "PASS"},
		{"damage", "R", "T", "", "FAIL"},
		{"settings", "R", "", "CT", "PASS"},
	}},
	{"../testdata/checks/damage-source.toml", []legacyRow{
		{"primary_sensitivity", "R", "", "phase", "PASS"},
		{"primary_sensitivity", "R", "", "every kind", "PASS"},
		{"load", "R", "", "phase", "PASS"},
		{"inrush", "R", "", "phase", "PASS"},
		{"damage", "R", "T", "", "FAIL"},
		{"settings", "R", "", "CT", "PASS"},
	}},
	{"../testdata/checks/damage.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"damage", "R2", "L2", "", "FAIL"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/earth-sensitivity.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "FAIL"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "ground", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/fuse-range.toml", []legacyRow{
		{"grading", "F2", "R1", "", "WARN"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "F2", "", "phase", "PASS"},
		{"primary_sensitivity", "F2", "", "every kind", "PASS"},
		{"backup_sensitivity", "F2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "F2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
	}},
	{"../testdata/checks/grading.toml", []legacyRow{
		{"grading", "R2", "R1", "", "FAIL"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/ground-instantaneous.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"grading", "R3", "R2", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "ground", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "ground", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"primary_sensitivity", "R3", "", "phase", "PASS"},
		{"primary_sensitivity", "R3", "", "ground", "PASS"},
		{"primary_sensitivity", "R3", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"backup_sensitivity", "R2", "R1", "ground", "PASS"},
		{"backup_sensitivity", "R3", "R2", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"load", "R3", "", "phase", "PASS"},
		{"instantaneous_reach", "R1", "", "50N", "PASS"},
		{"instantaneous_reach", "R3", "", "50N", "PASS"},
		{"inrush", "R1", "", "phase", "PASS"},
		{"inrush", "R2", "", "phase", "PASS"},
		{"inrush", "R3", "", "phase", "PASS"},
		{"damage", "R3", "TX", "", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
		{"settings", "R3", "", "CT", "PASS"},
	}},
	{"../testdata/checks/inrush.toml", []legacyRow{
		{"primary_sensitivity", "R", "", "phase", "PASS"},
		{"primary_sensitivity", "R", "", "every kind", "PASS"},
		{"load", "R", "", "phase", "PASS"},
		{"inrush", "R", "", "phase", "FAIL"},
		{"damage", "R", "T", "", "PASS"},
		{"settings", "R", "", "CT", "PASS"},
	}},
	{"../testdata/checks/instantaneous-no-setting.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"instantaneous_reach", "R1", "", "50", "FAIL"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/instantaneous-reach.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"instantaneous_reach", "R1", "", "50", "FAIL"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/instantaneous-time.toml", []legacyRow{
		{"grading", "R2", "R1", "", "FAIL"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"instantaneous_reach", "R2", "", "50", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/load.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "FAIL"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/pair-margin.toml", []legacyRow{
		{"grading", "R2", "R1", "", "FAIL"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/pass.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/primary-sensitivity.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "FAIL"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/settings.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "51", "FAIL"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/sweep-gap.toml", []legacyRow{
		{"grading", "R2", "R1", "", "FAIL"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"instantaneous_reach", "R2", "", "51DT", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/sweep-transformer.toml", []legacyRow{
		{"grading", "F", "UP", "", "PASS"},
		{"primary_sensitivity", "UP", "", "phase", "PASS"},
		{"primary_sensitivity", "UP", "", "ground", "PASS"},
		{"primary_sensitivity", "UP", "", "every kind", "PASS"},
		{"primary_sensitivity", "F", "", "phase", "PASS"},
		{"primary_sensitivity", "F", "", "ground", "PASS"},
		{"primary_sensitivity", "F", "", "every kind", "PASS"},
		{"backup_sensitivity", "F", "UP", "phase", "PASS"},
		{"load", "UP", "", "phase", "PASS"},
		{"load", "F", "", "phase", "PASS"},
		{"inrush", "UP", "", "phase", "PASS"},
		{"inrush", "F", "", "phase", "PASS"},
		{"damage", "F", "TX", "", "PASS"},
		{"settings", "UP", "", "CT", "PASS"},
		{"settings", "F", "", "CT", "PASS"},
	}},
	{"../testdata/checks/sweep.toml", []legacyRow{
		{"grading", "R2", "R1", "", "FAIL"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "PASS"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"instantaneous_reach", "R2", "", "51DT", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../testdata/checks/voltage-factor.toml", []legacyRow{
		{"grading", "R2", "R1", "", "PASS"},
		{"primary_sensitivity", "R1", "", "phase", "PASS"},
		{"primary_sensitivity", "R1", "", "every kind", "PASS"},
		{"primary_sensitivity", "R2", "", "phase", "FAIL"},
		{"primary_sensitivity", "R2", "", "every kind", "PASS"},
		{"backup_sensitivity", "R2", "R1", "phase", "PASS"},
		{"load", "R1", "", "phase", "PASS"},
		{"load", "R2", "", "phase", "PASS"},
		{"settings", "R1", "", "CT", "PASS"},
		{"settings", "R2", "", "CT", "PASS"},
	}},
	{"../examples/fenwick-quay.toml", []legacyRow{
		{"grading", "INC", "T1-HV", "", "FAIL"},
		{"grading", "FM", "INC", "", "PASS"},
		{"grading", "FB", "INC", "", "PASS"},
		{"grading", "FC", "INC", "", "PASS"},
		{"grading", "MA-R", "FM", "", "FAIL"},
		{"grading", "BY-FUSE", "FB", "", "PASS"},
		{"primary_sensitivity", "T1-HV", "", "phase", "PASS"},
		{"primary_sensitivity", "T1-HV", "", "every kind", "WARN"},
		{"primary_sensitivity", "INC", "", "phase", "PASS"},
		{"primary_sensitivity", "INC", "", "ground", "PASS"},
		{"primary_sensitivity", "INC", "", "every kind", "PASS"},
		{"primary_sensitivity", "FM", "", "phase", "PASS"},
		{"primary_sensitivity", "FM", "", "ground", "PASS"},
		{"primary_sensitivity", "FM", "", "every kind", "PASS"},
		{"primary_sensitivity", "MA-R", "", "phase", "PASS"},
		{"primary_sensitivity", "MA-R", "", "ground", "PASS"},
		{"primary_sensitivity", "MA-R", "", "every kind", "PASS"},
		{"primary_sensitivity", "FB", "", "phase", "PASS"},
		{"primary_sensitivity", "FB", "", "ground", "PASS"},
		{"primary_sensitivity", "FB", "", "every kind", "PASS"},
		{"primary_sensitivity", "FC", "", "phase", "PASS"},
		{"primary_sensitivity", "FC", "", "ground", "PASS"},
		{"primary_sensitivity", "FC", "", "every kind", "PASS"},
		{"primary_sensitivity", "BY-FUSE", "", "phase", "PASS"},
		{"primary_sensitivity", "BY-FUSE", "", "every kind", "PASS"},
		{"backup_sensitivity", "INC", "T1-HV", "phase", "PASS"},
		{"backup_sensitivity", "FM", "INC", "phase", "PASS"},
		{"backup_sensitivity", "FM", "INC", "ground", "PASS"},
		{"backup_sensitivity", "FB", "INC", "phase", "PASS"},
		{"backup_sensitivity", "FB", "INC", "ground", "PASS"},
		{"backup_sensitivity", "FC", "INC", "phase", "PASS"},
		{"backup_sensitivity", "FC", "INC", "ground", "PASS"},
		{"backup_sensitivity", "MA-R", "FM", "phase", "PASS"},
		{"backup_sensitivity", "MA-R", "FM", "ground", "PASS"},
		{"backup_sensitivity", "BY-FUSE", "FB", "phase", "PASS"},
		{"load", "T1-HV", "", "phase", "PASS"},
		{"load", "INC", "", "phase", "PASS"},
		{"load", "FM", "", "phase", "PASS"},
		{"load", "MA-R", "", "phase", "PASS"},
		{"load", "FB", "", "phase", "PASS"},
		{"load", "FC", "", "phase", "FAIL"},
		{"load", "BY-FUSE", "", "phase", "PASS"},
		{"instantaneous_reach", "T1-HV", "", "50", "PASS"},
		{"instantaneous_reach", "FM", "", "50", "FAIL"},
		{"inrush", "T1-HV", "", "phase", "PASS"},
		{"inrush", "INC", "", "phase", "PASS"},
		{"inrush", "FB", "", "phase", "PASS"},
		{"inrush", "BY-FUSE", "", "phase", "PASS"},
		{"damage", "FM", "FM-CABLE-1", "", "PASS"},
		{"damage", "MA-R", "FM-CABLE-2", "", "PASS"},
		{"damage", "FB", "FB-CABLE", "", "PASS"},
		{"damage", "T1-HV", "T1", "", "PASS"},
		{"damage", "BY-FUSE", "BY-TX", "", "PASS"},
		{"settings", "T1-HV", "", "CT", "PASS"},
		{"settings", "INC", "", "CT", "PASS"},
		{"settings", "INC", "", "CT saturation", "WARN"},
		{"settings", "FM", "", "51", "PASS"},
		{"settings", "FM", "", "CT", "PASS"},
		{"settings", "MA-R", "", "CT", "PASS"},
		{"settings", "FB", "", "51", "FAIL"},
		{"settings", "FB", "", "CT", "PASS"},
		{"settings", "FC", "", "CT", "PASS"},
	}},
	{"../testdata/fenwick-fixed/fenwick-quay.toml", []legacyRow{
		{"grading", "INC", "T1-HV", "", "PASS"},
		{"grading", "FM", "INC", "", "PASS"},
		{"grading", "FB", "INC", "", "PASS"},
		{"grading", "FC", "INC", "", "PASS"},
		{"grading", "MA-R", "FM", "", "PASS"},
		{"grading", "BY-FUSE", "FB", "", "PASS"},
		{"primary_sensitivity", "T1-HV", "", "phase", "PASS"},
		{"primary_sensitivity", "T1-HV", "", "every kind", "WARN"},
		{"primary_sensitivity", "INC", "", "phase", "PASS"},
		{"primary_sensitivity", "INC", "", "ground", "PASS"},
		{"primary_sensitivity", "INC", "", "every kind", "PASS"},
		{"primary_sensitivity", "FM", "", "phase", "PASS"},
		{"primary_sensitivity", "FM", "", "ground", "PASS"},
		{"primary_sensitivity", "FM", "", "every kind", "PASS"},
		{"primary_sensitivity", "MA-R", "", "phase", "PASS"},
		{"primary_sensitivity", "MA-R", "", "ground", "PASS"},
		{"primary_sensitivity", "MA-R", "", "every kind", "PASS"},
		{"primary_sensitivity", "FB", "", "phase", "PASS"},
		{"primary_sensitivity", "FB", "", "ground", "PASS"},
		{"primary_sensitivity", "FB", "", "every kind", "PASS"},
		{"primary_sensitivity", "FC", "", "phase", "PASS"},
		{"primary_sensitivity", "FC", "", "ground", "PASS"},
		{"primary_sensitivity", "FC", "", "every kind", "PASS"},
		{"primary_sensitivity", "BY-FUSE", "", "phase", "PASS"},
		{"primary_sensitivity", "BY-FUSE", "", "every kind", "PASS"},
		{"backup_sensitivity", "INC", "T1-HV", "phase", "PASS"},
		{"backup_sensitivity", "FM", "INC", "phase", "PASS"},
		{"backup_sensitivity", "FM", "INC", "ground", "PASS"},
		{"backup_sensitivity", "FB", "INC", "phase", "PASS"},
		{"backup_sensitivity", "FB", "INC", "ground", "PASS"},
		{"backup_sensitivity", "FC", "INC", "phase", "PASS"},
		{"backup_sensitivity", "FC", "INC", "ground", "PASS"},
		{"backup_sensitivity", "MA-R", "FM", "phase", "PASS"},
		{"backup_sensitivity", "MA-R", "FM", "ground", "PASS"},
		{"backup_sensitivity", "BY-FUSE", "FB", "phase", "PASS"},
		{"load", "T1-HV", "", "phase", "PASS"},
		{"load", "INC", "", "phase", "PASS"},
		{"load", "FM", "", "phase", "PASS"},
		{"load", "MA-R", "", "phase", "PASS"},
		{"load", "FB", "", "phase", "PASS"},
		{"load", "FC", "", "phase", "PASS"},
		{"load", "BY-FUSE", "", "phase", "PASS"},
		{"instantaneous_reach", "T1-HV", "", "50", "PASS"},
		{"inrush", "T1-HV", "", "phase", "PASS"},
		{"inrush", "INC", "", "phase", "PASS"},
		{"inrush", "FB", "", "phase", "PASS"},
		{"inrush", "BY-FUSE", "", "phase", "PASS"},
		{"damage", "FM", "FM-CABLE-1", "", "PASS"},
		{"damage", "MA-R", "FM-CABLE-2", "", "PASS"},
		{"damage", "FB", "FB-CABLE", "", "PASS"},
		{"damage", "T1-HV", "T1", "", "PASS"},
		{"damage", "BY-FUSE", "BY-TX", "", "PASS"},
		{"settings", "T1-HV", "", "CT", "PASS"},
		{"settings", "INC", "", "CT", "PASS"},
		{"settings", "INC", "", "CT saturation", "PASS"},
		{"settings", "FM", "", "51", "PASS"},
		{"settings", "FM", "", "CT", "PASS"},
		{"settings", "MA-R", "", "CT", "PASS"},
		{"settings", "FB", "", "51", "PASS"},
		{"settings", "FB", "", "CT", "PASS"},
		{"settings", "FC", "", "CT", "PASS"},
	}},
}
