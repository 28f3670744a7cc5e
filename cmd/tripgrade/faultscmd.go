package main

import (
	"io"

	"tripgrade/coord"
	"tripgrade/coord/report"
)

// runFaults is "tripgrade faults STUDY.toml": the fault study.
func runFaults(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("faults", `usage: tripgrade faults STUDY.toml [--format text|md|csv|json] [--scenario NAME]

Computes the maximum and minimum phase and residual fault currents that every
device sees over its own zone, and the four fault kinds at every bus, in the
maximum and minimum cases of IEC 60909-0; for every bus also the peak,
breaking and steady-state currents of a three-phase fault (maximum case).
With --scenario, the same in one of the study's operating scenarios.`)
	format := c.fs.String("format", "text", "output `format`: text, md, csv or json")
	scenario := c.fs.String("scenario", "", scenarioFlagHelp)
	if code, done := c.parse(args, 1, "exactly one study file", stdout, stderr); done {
		return code
	}
	write, ok := map[string]func(*report.FaultTables, io.Writer) error{
		"text": (*report.FaultTables).WriteText,
		"md":   (*report.FaultTables).WriteMarkdown,
		"csv":  (*report.FaultTables).WriteCSV,
		"json": (*report.FaultTables).WriteJSON,
	}[*format]
	if !ok {
		return c.fail(stderr, exitUsage, "--format %q: want text, md, csv or json", *format)
	}
	l, ok := loadStudy(c.fs.Arg(0), stderr)
	if ok {
		l, ok = inScenario(l, *scenario, stderr)
	}
	if !ok {
		return exitUsage
	}
	levels, err := coord.FaultLevels(l.study, l.engine, l.topo)
	if err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	buses, err := l.engine.AllBuses()
	if err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	duties, err := l.engine.AllDuties()
	if err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	tables := report.NewFaultTables(l.study, levels, buses)
	tables.AddDuties(l.study, duties)
	if err := write(tables, stdout); err != nil {
		return c.fail(stderr, exitFail, "%v", err)
	}
	return exitOK
}
