package faults

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// TestThreeWindingTransformerInMessages: a three-winding transformer is
// held to finite figures like every element built in code, and a badly
// conditioned network names it as the study file does (transformer3), once
// for its three windings.
func TestThreeWindingTransformerInMessages(t *testing.T) {
	n := unit3("YNyn0d5")
	n.Transformers3[0].Pairs[HVMV].MVA = math.Inf(1)
	if _, err := New(n, Settings{}); err == nil || !strings.Contains(err.Error(), `transformer "T": a figure is not finite`) {
		t.Errorf("infinite rating: got %v", err)
	}

	n = unit3("YNyn0d5")
	weak := Strength{Z1Ohm: 142744, Z0Ohm: 275000i}
	n.Sources[0].Max, n.Sources[0].Min = weak, weak
	for p := range n.Transformers3[0].Pairs {
		n.Transformers3[0].Pairs[p] = WindingPair{MVA: 5000, ZPct: 0.25, RPct: 0.0004}
	}
	_, err := New(n, Settings{})
	var ce *ConditionError
	if !errors.As(err, &ce) {
		t.Fatalf("got %v, want a *ConditionError", err)
	}
	count := 0
	for _, r := range ce.Elements {
		if r == (ElementRef{"transformer3", "T"}) {
			count++
		}
	}
	if count != 1 {
		t.Errorf("elements %v: want transformer3 \"T\" once", ce.Elements)
	}
}
