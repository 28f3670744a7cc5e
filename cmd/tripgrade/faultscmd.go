package main

import (
	"fmt"
	"io"

	"github.com/spf13/pflag"

	"tripgrade/coord"
	"tripgrade/coord/report"
)

// runFaults is "tripgrade faults STUDY.toml": the fault study.
func runFaults(args []string, stdout, stderr io.Writer) int {
	fs := pflag.NewFlagSet("faults", pflag.ContinueOnError)
	fs.SetOutput(io.Discard)
	format := fs.String("format", "text", "output `format`: text, csv or json")
	help := fs.BoolP("help", "h", false, "show this help")
	usage := func(w io.Writer) {
		fmt.Fprintln(w, "usage: tripgrade faults STUDY.toml [--format text|csv|json]")
		fmt.Fprintln(w, "")
		fmt.Fprintln(w, "Computes the maximum and minimum phase and residual fault currents that every")
		fmt.Fprintln(w, "device sees over its own zone, and the four fault kinds at every bus, in the")
		fmt.Fprintln(w, "maximum and minimum cases of IEC 60909-0.")
		fmt.Fprintln(w, "")
		fmt.Fprint(w, fs.FlagUsages())
	}
	if err := fs.Parse(args); err != nil {
		fmt.Fprintf(stderr, "tripgrade faults: %v\n", err)
		usage(stderr)
		return exitUsage
	}
	if *help {
		usage(stdout)
		return exitOK
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "tripgrade faults: give exactly one study file")
		usage(stderr)
		return exitUsage
	}
	write, ok := map[string]func(*report.FaultTables, io.Writer) error{
		"text": (*report.FaultTables).WriteText,
		"csv":  (*report.FaultTables).WriteCSV,
		"json": (*report.FaultTables).WriteJSON,
	}[*format]
	if !ok {
		fmt.Fprintf(stderr, "tripgrade faults: --format %q: want text, csv or json\n", *format)
		return exitUsage
	}
	l, ok := loadStudy(fs.Arg(0), stderr)
	if !ok {
		return exitUsage
	}
	levels, err := coord.FaultLevels(l.study, l.engine, l.topo)
	if err != nil {
		fmt.Fprintf(stderr, "tripgrade faults: %v\n", err)
		return exitUsage
	}
	buses, err := l.engine.AllBuses()
	if err != nil {
		fmt.Fprintf(stderr, "tripgrade faults: %v\n", err)
		return exitUsage
	}
	if err := write(report.NewFaultTables(l.study, levels, buses), stdout); err != nil {
		fmt.Fprintf(stderr, "tripgrade faults: %v\n", err)
		return exitFail
	}
	return exitOK
}
