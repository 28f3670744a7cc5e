package study

import (
	"bytes"
	"fmt"
	"testing"

	"tripgrade/coord/study/gen"
)

// BenchmarkParse loads and validates generated meshed studies (package
// gen: 33 and 11 kV levels, loops, a relay with two stages at every line
// end) of 1,000, 10,000 and 50,000 buses. Targets (issue 10): 10,000
// buses under 0.5 s and 50,000 under 3 s on the 2-core build machine.
func BenchmarkParse(b *testing.B) {
	for _, n := range []int{1000, 10000, 50000} {
		var buf bytes.Buffer
		if err := gen.Write(&buf, gen.Options{Buses: n, Seed: 1}); err != nil {
			b.Fatal(err)
		}
		src := buf.Bytes()
		b.Run(fmt.Sprintf("buses=%d", n), func(b *testing.B) {
			b.SetBytes(int64(len(src)))
			for b.Loop() {
				if _, err := Parse("big.toml", src, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
