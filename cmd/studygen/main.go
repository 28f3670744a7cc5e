// Command studygen writes a large synthetic study file for benchmarks and
// timing runs (a developer tool, not part of tripgrade):
//
//	go run ./cmd/studygen -buses 10000 -seed 1 > big.toml
//	/usr/bin/time -v tripgrade check big.toml
//
// The study is invented and the same flags give the same file; see
// package tripgrade/coord/study/gen for what it contains.
package main

import (
	"flag"
	"fmt"
	"io"
	"os"

	"tripgrade/coord/study/gen"
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	// The standard flag package, unlike pflag, takes both -buses and
	// --buses, as the developer's guide writes them.
	fs := flag.NewFlagSet("studygen", flag.ContinueOnError)
	fs.SetOutput(stderr)
	var o gen.Options
	fs.IntVar(&o.Buses, "buses", 1000, "number of `buses`")
	fs.Uint64Var(&o.Seed, "seed", 1, "random `seed`")
	fs.BoolVar(&o.Fuses, "fuses", false, "fuses instead of relays on the 11 kV spurs")
	fs.BoolVar(&o.Ranges, "ranges", false, "pickup and multiplier ranges on the relays' inverse-time stages (for propose --pickups)")
	fs.IntVar(&o.Reach, "reach", 0, "keep 33 kV chords and second transformers within `n` places along the ring (0: anywhere; at least 2 otherwise)")
	fs.BoolVar(&o.Practice, "practice", false, "lay the network and its protection out as in practice: 33 kV rings of five with a source each and directional relays, transformer relays, radial 11 kV feeders with open interconnectors, inverse ground stages")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "studygen: unexpected argument %q (the study goes to standard output)\n", fs.Arg(0))
		return 2
	}
	if err := gen.Write(stdout, o); err != nil {
		fmt.Fprintf(stderr, "studygen: %v\n", err)
		return 2
	}
	return 0
}
