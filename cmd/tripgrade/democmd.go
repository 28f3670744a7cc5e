package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path"
	"sort"
	"strings"

	"tripgrade/coord/study"
	"tripgrade/examples"
)

// runDemo is "tripgrade demo": the whole check on an example study
// embedded in the binary.
func runDemo(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("demo", fmt.Sprintf(`usage: tripgrade demo [--example NAME] [--format ...] [--out DIR] [--strict]

Runs "tripgrade check" on an invented example study built into the program. The
default, %s, has deliberate setting mistakes, so it exits 1.`, examples.Demo))
	o := addCheckFlags(c)
	name := c.fs.String("example", strings.TrimSuffix(examples.Demo, ".toml"), "which embedded example `study` to check")
	list := c.fs.Bool("list", false, "list the embedded examples and exit")
	if code, done := c.parse(args, 0, "no study file (use tripgrade check STUDY.toml for a file)", stdout, stderr); done {
		return code
	}
	names, err := exampleNames()
	if err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	if *list {
		for _, n := range names {
			fmt.Fprintln(stdout, n)
		}
		return exitOK
	}
	if err := o.parseFormats(); err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	file := strings.TrimSuffix(*name, ".toml") + ".toml"
	src, err := fs.ReadFile(examples.FS, file)
	if err != nil {
		return c.fail(stderr, exitUsage, "no example %q (the examples are: %s)", *name, strings.Join(names, ", "))
	}
	shown := path.Join("examples", file)
	s, err := study.Parse(shown, src, examples.FS)
	if err != nil {
		var el study.ErrorList
		if errors.As(err, &el) {
			for _, e := range el {
				fmt.Fprintln(stderr, e)
			}
			return exitUsage
		}
		return c.fail(stderr, exitUsage, "%v", err)
	}
	l, ok := prepare(shown, s, stderr)
	if !ok {
		return exitUsage
	}
	return checkLoaded(l, o, stdout, stderr)
}

// exampleNames lists the embedded studies without their extension.
func exampleNames() ([]string, error) {
	files, err := fs.Glob(examples.FS, "*.toml")
	if err != nil {
		return nil, err
	}
	for i, f := range files {
		files[i] = strings.TrimSuffix(f, ".toml")
	}
	sort.Strings(files)
	return files, nil
}
