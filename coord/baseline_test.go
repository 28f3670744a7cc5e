package coord

import (
	"fmt"
	"testing"
)

func TestCompare(t *testing.T) {
	snap := func(check, dev, verdict string, margin float64) Snapshot {
		return Snapshot{Check: check, Device: dev, Verdict: verdict, Margin: margin, HasMargin: true, Unit: "s"}
	}
	before := []Snapshot{
		snap("grading", "A", "PASS", 0.2),
		snap("grading", "B", "FAIL", -0.1),
		snap("grading", "C", "PASS", 0.2),
		snap("grading", "D", "FAIL", -0.1),
		snap("grading", "E", "FAIL", -0.3),
		snap("load", "F", "PASS", 10),
		snap("load", "G", "FAIL", -5),
	}
	after := []Snapshot{
		snap("grading", "A", "PASS", 0.2),           // same
		snap("grading", "B", "PASS", 0.05),          // fixed
		snap("grading", "C", "FAIL", -0.05),         // worse: PASS → FAIL
		snap("grading", "D", "FAIL", -0.2),          // worse: a smaller margin
		snap("grading", "E", "FAIL", -0.1),          // better: a larger margin, still failing
		snap("load", "H", "FAIL", -1),               // new
		snap("load", "G", "ACCEPTED", -5),           // better: accepted
		snap("grading", "A", "PASS", 0.2+0.2*1e-12), // new: a second finding of the same key
	}
	want := []struct {
		kind  ChangeKind
		gates bool
	}{{Same, false}, {Fixed, false}, {Worse, true}, {Worse, true}, {Better, false}, {New, true}, {Better, false}, {New, false}, {Removed, false}}
	got := Compare(before, after)
	if len(got) != len(want) {
		t.Fatalf("got %d changes, want %d", len(got), len(want))
	}
	for i, w := range want {
		if got[i].Kind != w.kind || got[i].Gates() != w.gates {
			t.Errorf("change %d (%+v → %+v): got %s gates %v, want %s gates %v", i, got[i].Before, got[i].After, got[i].Kind, got[i].Gates(), w.kind, w.gates)
		}
	}
	if got[8].Before.Device != "F" {
		t.Errorf("removed %+v, want F", got[8].Before)
	}
	// A run compared with itself changes nothing.
	for _, c := range Compare(before, before) {
		if c.Kind != Same {
			t.Errorf("self-comparison: %s for %+v", c.Kind, c.After)
		}
	}
}

// BenchmarkCompare compares a 10,000-finding run with a baseline in which
// every tenth margin moved: about the size of a 1000-relay study.
func BenchmarkCompare(b *testing.B) {
	const n = 10000
	before := make([]Snapshot, n)
	after := make([]Snapshot, n)
	for i := range before {
		before[i] = Snapshot{Check: "grading", Device: fmt.Sprintf("R%d", i), Other: fmt.Sprintf("U%d", i/20), Verdict: "PASS", Margin: 0.1, HasMargin: true, Unit: "s"}
		after[i] = before[i]
		if i%10 == 0 {
			after[i].Margin = 0.05
		}
	}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if len(Compare(before, after)) != n {
			b.Fatal("lost changes")
		}
	}
}
