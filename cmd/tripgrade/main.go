// Command tripgrade checks the coordination of protective relays and fuses
// described in a TOML study file.
//
// Usage:
//
//	tripgrade <command> [arguments]
//
// Run "tripgrade help" for the list of commands.
package main

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"sort"
)

// Exit codes shared by every subcommand.
const (
	exitOK    = 0 // the command ran and nothing failed
	exitFail  = 1 // a check failed (check, demo; diff: a failure new or worse)
	exitUsage = 2 // bad input: the study file or the command line is wrong
	exitBug   = 3 // tripgrade itself failed: a bug to report
)

// command is one subcommand: a short summary for the help text and the
// function that runs it with the arguments after its name.
type command struct {
	summary string
	run     func(args []string, stdout, stderr io.Writer) int
}

func commands() map[string]command {
	return map[string]command{
		"check":     {"the coordination check of a study: every pair, every criterion", runCheck},
		"curve":     {"operating time of one characteristic at given currents", runCurve},
		"demo":      {"the check on an example study built into the program", runDemo},
		"diff":      {"setting changes between two studies and what they do to every finding", runDiff},
		"faults":    {"fault currents at every device and bus of a study", runFaults},
		"plot":      {"time-current charts of the coordination paths through one device", runPlot},
		"propose":   {"the least time multipliers that meet every margin, verified by the check", runPropose},
		"testsheet": {"secondary injection currents and expected times of every relay stage", runTestSheet},
	}
}

func main() {
	os.Exit(runBuffered(os.Args[1:], os.Stdout, os.Stderr))
}

// runBuffered runs a command with its standard output buffered (a large
// study's table has hundreds of thousands of lines, each otherwise a write
// of its own). Output that cannot be written in full is an error: the
// exit status is then 2, whatever the verdict, so that a pipeline gating
// on it never takes a cut-off table for a pass.
func runBuffered(args []string, stdout *os.File, stderr io.Writer) int {
	out := bufio.NewWriterSize(stdout, 64<<10)
	code := runGuarded(args, out, stderr)
	if err := out.Flush(); err != nil {
		fmt.Fprintf(stderr, "tripgrade: writing the output: %v\n", err)
		return exitUsage
	}
	return code
}

// runGuarded is run with a last guard: a panic, which is a bug of
// tripgrade and never a verdict on the input, becomes one line and exit
// status 3 instead of a stack trace (TRIPGRADE_TRACE=1 shows the trace).
func runGuarded(args []string, stdout, stderr io.Writer) int {
	return runGuardedWith(func() int { return run(args, stdout, stderr) }, stderr)
}

func runGuardedWith(f func() int, stderr io.Writer) (code int) {
	if os.Getenv("TRIPGRADE_TRACE") == "" {
		defer func() {
			if r := recover(); r != nil {
				fmt.Fprintf(stderr, "tripgrade: internal error (a bug, please report it with the input): %v\n", r)
				code = exitBug
			}
		}()
	}
	return f()
}

// run dispatches to a subcommand and returns the process exit code.
func run(args []string, stdout, stderr io.Writer) int {
	cmds := commands()
	if len(args) == 0 {
		usage(stderr, cmds)
		return exitUsage
	}
	name := args[0]
	switch name {
	case "help", "-h", "--help":
		usage(stdout, cmds)
		return exitOK
	case "version", "--version":
		return printVersion(stdout)
	}
	c, ok := cmds[name]
	if !ok {
		fmt.Fprintf(stderr, "tripgrade: unknown command %q\n", name)
		usage(stderr, cmds)
		return exitUsage
	}
	return c.run(args[1:], stdout, stderr)
}

func usage(w io.Writer, cmds map[string]command) {
	fmt.Fprintln(w, "usage: tripgrade <command> [arguments]")
	fmt.Fprintln(w, "")
	fmt.Fprintln(w, "commands:")
	names := make([]string, 0, len(cmds))
	for n := range cmds {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-9s %s\n", n, cmds[n].summary)
	}
	fmt.Fprintln(w, "")
	fmt.Fprintln(w, "Run \"tripgrade <command> --help\" for the arguments of one command,")
	fmt.Fprintln(w, "\"tripgrade --version\" for the version of this build.")
}
