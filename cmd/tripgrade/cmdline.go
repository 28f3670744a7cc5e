package main

import (
	"fmt"
	"io"

	"github.com/spf13/pflag"
)

// cmdLine is one subcommand's flag set with its help text; every
// subcommand parses its arguments the same way through it.
type cmdLine struct {
	name  string
	about string // usage line and description, printed before the flags
	fs    *pflag.FlagSet
	help  *bool
}

func newCmdLine(name, about string) *cmdLine {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SetOutput(io.Discard)
	c := &cmdLine{name: name, about: about, fs: fs}
	c.help = fs.BoolP("help", "h", false, "show this help")
	return c
}

func (c *cmdLine) usage(w io.Writer) {
	fmt.Fprintln(w, c.about)
	fmt.Fprintln(w, "")
	fmt.Fprint(w, c.fs.FlagUsages())
}

// parse reads the arguments, wanting exactly nargs positional ones (any
// number when nargs < 0). When done is true the command stops with code:
// after printing the help, or after a usage error.
func (c *cmdLine) parse(args []string, nargs int, what string, stdout, stderr io.Writer) (code int, done bool) {
	if err := c.fs.Parse(args); err != nil {
		return c.usageError(stderr, "%v", err), true
	}
	if *c.help {
		c.usage(stdout)
		return exitOK, true
	}
	if nargs >= 0 && c.fs.NArg() != nargs {
		return c.usageError(stderr, "give %s", what), true
	}
	return 0, false
}

// usageError reports a command-line mistake with the help and returns
// the usage exit code.
func (c *cmdLine) usageError(stderr io.Writer, format string, args ...any) int {
	fmt.Fprintf(stderr, "tripgrade %s: %s\n", c.name, fmt.Sprintf(format, args...))
	c.usage(stderr)
	return exitUsage
}

// fail reports a problem found after parsing and returns code.
func (c *cmdLine) fail(stderr io.Writer, code int, format string, args ...any) int {
	fmt.Fprintf(stderr, "tripgrade %s: %s\n", c.name, fmt.Sprintf(format, args...))
	return code
}
