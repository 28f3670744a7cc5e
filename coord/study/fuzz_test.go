package study

import (
	"os"
	"path/filepath"
	"testing"

	"tripgrade/coord"
)

// FuzzParse feeds the loader mangled study files: whatever the input, it
// returns a study or errors, never panics, and a study it accepts goes
// through the fault engine and every check without panicking either.
func FuzzParse(f *testing.F) {
	seeds, _ := filepath.Glob("../../testdata/*/*.toml")
	examples, _ := filepath.Glob("../../examples/*.toml")
	for _, p := range append(seeds, examples...) {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte(tiny))
	f.Fuzz(func(t *testing.T, src []byte) {
		s, err := Parse("fuzz.toml", src, nil)
		if err != nil {
			if _, ok := err.(ErrorList); !ok {
				t.Fatalf("error of type %T, want ErrorList: %v", err, err)
			}
			return
		}
		eng, topo, err := coord.Prepare(s)
		if err != nil {
			t.Logf("accepted study does not build an engine: %v", err)
			return
		}
		if _, err := coord.Check(s, eng, topo); err != nil {
			t.Logf("check: %v", err)
		}
	})
}
