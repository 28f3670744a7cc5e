package main

import (
	"io"
	"strconv"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/coord/study"
)

// runTestSheet is "tripgrade testsheet STUDY.toml": the secondary
// injection currents and expected times of every relay stage.
func runTestSheet(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("testsheet", `usage: tripgrade testsheet STUDY.toml [--device NAME] [--format text|md|csv]
                           [--multiples 2,5,10] [--instantaneous-multiple 1.2]

For every stage of every relay (or of one relay): test currents in secondary
amperes at multiples of the setting, the expected operating time, and the band
the relay's declared accuracy allows (IEC 60255-151:2009 cl. 5.2). What a
commissioning engineer takes to site for secondary injection.`)
	device := c.fs.String("device", "", "only the relay `NAME`")
	format := c.fs.String("format", "text", "output `format`: text, md or csv")
	multiples := c.fs.String("multiples", "2,5,10", "test currents of inverse and definite-time stages, as `multiples` of the setting")
	inst := c.fs.Float64("instantaneous-multiple", coord.DefaultInstantaneousMultiple, "test current of instantaneous stages, as a `multiple` of the setting")
	if code, done := c.parse(args, 1, "exactly one study file", stdout, stderr); done {
		return code
	}
	write, ok := map[string]func(*report.TestSheet, io.Writer) error{
		"text": (*report.TestSheet).WriteText,
		"md":   (*report.TestSheet).WriteMarkdown,
		"csv":  (*report.TestSheet).WriteCSV,
	}[*format]
	if !ok {
		return c.fail(stderr, exitUsage, "--format %q: want text, md or csv", *format)
	}
	set := coord.InjectionSettings{InstantaneousMultiple: *inst}
	for _, f := range strings.Split(*multiples, ",") {
		m, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil {
			return c.fail(stderr, exitUsage, "--multiples %q: want numbers above 1, comma-separated", *multiples)
		}
		set.Multiples = append(set.Multiples, m)
	}
	if err := set.Validate(); err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	// The sheet needs the settings only, not the fault study.
	s, ok := loadSettings(c.fs.Arg(0), stderr)
	if !ok {
		return exitUsage
	}
	ins, err := coord.Injections(s, *device, set)
	if err != nil {
		return c.fail(stderr, exitUsage, "%v%s", err, suggestDevice(s, *device))
	}
	if err := write(report.NewTestSheet(s, ins), stdout); err != nil {
		return c.fail(stderr, exitFail, "%v", err)
	}
	return exitOK
}

// loadSettings reads and checks a study without preparing its fault
// engine, printing every problem to stderr.
func loadSettings(path string, stderr io.Writer) (*coord.Study, bool) {
	s, err := study.Load(path)
	if err != nil {
		printLoadError(path, err, stderr)
		return nil, false
	}
	printNotes(s, stderr)
	return s, true
}
