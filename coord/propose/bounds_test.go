package propose

import (
	"math"
	"strings"
	"testing"

	"tripgrade/coord"
	"tripgrade/coord/study/gen"
)

// TestDamageBoundsTheMultiplier: the damage check's through-faults bound
// the multiplier of the device that protects the equipment. The hand-
// derived chain (chain.toml) with cable AB given as 50 mm² copper, XLPE:
// its adiabatic withstand is t = (k·S)²/I² with k = 143 (IEC 60364-5-54
// Table A.54.4, copper, XLPE), and its largest through-fault is the
// three-phase fault in the maximum case at its A end, the source alone,
// I = c·Un/(√3·|Z_Q|), |Z_Q| = c·Un²/S"k (IEC 60909-0, c_max = 1.10), so
// R1, with its 0.06 s breaker, clears it in time when
//
//	TMS·g(I/400) + 0.06 ≤ (k·S)²/I²,  g(M) = 0.14/(M^0.02 − 1)
//
// (IEC 60255-151:2009 Table 1, standard inverse). Grading over R2 asks
// more than that: the proposal keeps the bound, on the step below it
// (0.01 steps from 0.05), names the conflict, and the checker passes the
// damage finding.
func TestDamageBoundsTheMultiplier(t *testing.T) {
	s, pr := proposeFileWith(t, "../../testdata/propose/chain.toml", func(text string) string {
		text = strings.Replace(text, "x0_ohm = 0.7\n", "x0_ohm = 0.7\nconductor = \"cu\"\ninsulation = \"xlpe\"\nsize_mm2 = 50\n", 1)
		return strings.Replace(text, "  tms = 0.5\n  multiplier_range = [0.05, 1.0]", "  tms = 0.5\n  multiplier_range = [0.05, 1.0, 0.01]", 1)
	}, Settings{})
	const c, un = 1.1, 11000.0
	ia := c * un / math.Sqrt(3) / (c * (un / 1000) * (un / 1000) / 250)
	withstand := math.Pow(143*50, 2) / (ia * ia)
	g := 0.14 / (math.Pow(ia/400, 0.02) - 1)
	limit := (withstand - 0.06) / g // about 0.1224
	want := 0.05 + math.Floor((limit-0.05)/0.01)*0.01

	var r1 = -1
	for i, v := range pr.Vars {
		if s.Devices[v.Device].Name == "R1" {
			r1 = i
		}
	}
	if r1 < 0 {
		t.Fatal("R1 is not searched")
	}
	if math.Abs(pr.X[r1]-want) > 1e-12 {
		t.Errorf("R1: proposed TMS %.6f, want %.2f, the step below the damage bound %.6f", pr.X[r1], want, limit)
	}
	var bound *Conflict
	for i, cf := range pr.Conflicts {
		if cf.Var == r1 && cf.Rounding && len(cf.Chain) > 0 && cf.Chain[0].Check == coord.Damage {
			bound = &pr.Conflicts[i]
		}
	}
	if bound == nil {
		t.Fatalf("no conflict names R1's damage bound: %v", pr.Conflicts)
	}
	if math.Abs(bound.LimitX-limit) > 1e-6*limit || bound.Chain[0].Equipment != "AB" {
		t.Errorf("damage bound %.8f of %q, hand-derived %.8f of AB", bound.LimitX, bound.Chain[0].Equipment, limit)
	}
	if got := Describe(s, bound.Chain[0]); !strings.HasPrefix(got, "damage: R1 clears within AB's withstand time") {
		t.Errorf("the bound reads %q", got)
	}
	if got := BindingText(s, pr.Binding[r1]); !strings.HasPrefix(got, "damage: R1 clears within AB's withstand time") || !strings.Contains(got, "an upper bound below what its margins ask") {
		t.Errorf("R1's multiplier reads as bound by %q", got)
	}
	if !pr.Verified() {
		t.Errorf("not verified: %d unresolved findings", len(pr.Unresolved))
	}
	checked := false
	for _, f := range pr.After.Findings {
		if f.Check == coord.Damage && f.Device == "R1" && f.Other == "AB" {
			checked = true
			if f.Verdict != coord.Pass {
				t.Errorf("the proposal's damage finding for AB: %s, margin %.4f s", f.Verdict, f.Margin)
			}
		}
	}
	if !checked {
		t.Error("no damage finding for AB")
	}
}

// TestProposalOnSteps: on a generated study laid out as in practice (ring
// mains, transformer relays whose damage bounds and clearing times hold
// multipliers below what grading asks; seed 5, where the rounds once left
// three multipliers between steps), every proposed multiplier
// lies on a step of its range, also where the rounds push one to an
// upper bound between two steps, and the checker's settings audit finds
// none off its steps.
func TestProposalOnSteps(t *testing.T) {
	s, eng, topo := generated(t, gen.Options{Buses: 40, Seed: 5, Practice: true, Ranges: true})
	pr, err := Propose(s, eng, topo, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	held := 0
	for i, v := range pr.Vars {
		if x := pr.X[i]; onStep(x, v.Range) != x {
			t.Errorf("%s: proposed multiplier %v is not on a step of its range", s.Devices[v.Device].Name, x)
		}
	}
	for _, c := range pr.Conflicts {
		if c.Var >= 0 && !c.Below && !c.Rounding && c.LimitX < pr.Vars[c.Var].Range.Max {
			held++ // held at an upper bound below the top of its range
		}
	}
	if held == 0 {
		t.Error("no multiplier is held at an upper bound: the study does not exercise the rounding")
	}
	for _, f := range pr.After.Findings {
		if f.Check == coord.SettingsAudit && f.Verdict == coord.Fail {
			t.Errorf("settings audit: %s %s: %s", f.Device, f.Stage, f.Note)
		}
	}
	if !pr.Verified() {
		t.Errorf("not verified: %d unresolved findings", len(pr.Unresolved))
	}
}
