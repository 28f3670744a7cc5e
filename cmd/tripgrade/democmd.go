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
	fs0, o, format, help := checkFlags("demo")
	name := fs0.String("example", examples.Demo, "which embedded example `study` to check")
	list := fs0.Bool("list", false, "list the embedded examples and exit")
	usage := func(w io.Writer) {
		fmt.Fprintln(w, "usage: tripgrade demo [--example NAME] [--format ...] [--out DIR] [--strict]")
		fmt.Fprintln(w, "")
		fmt.Fprintln(w, "Runs \"tripgrade check\" on an invented example study built into the program. The")
		fmt.Fprintf(w, "default, %s, has deliberate setting mistakes, so it exits 1.\n", examples.Demo)
		fmt.Fprintln(w, "")
		fmt.Fprint(w, fs0.FlagUsages())
	}
	if err := fs0.Parse(args); err != nil {
		fmt.Fprintf(stderr, "tripgrade demo: %v\n", err)
		usage(stderr)
		return exitUsage
	}
	if *help {
		usage(stdout)
		return exitOK
	}
	names, err := exampleNames()
	if err != nil {
		fmt.Fprintf(stderr, "tripgrade demo: %v\n", err)
		return exitUsage
	}
	if *list {
		for _, n := range names {
			fmt.Fprintln(stdout, n)
		}
		return exitOK
	}
	if fs0.NArg() != 0 {
		fmt.Fprintln(stderr, "tripgrade demo: takes no study file (use tripgrade check STUDY.toml)")
		return exitUsage
	}
	if o.formats, err = parseFormats(*format); err != nil {
		fmt.Fprintf(stderr, "tripgrade demo: %v\n", err)
		return exitUsage
	}
	file := *name
	if !strings.HasSuffix(file, ".toml") {
		file += ".toml"
	}
	src, err := fs.ReadFile(examples.FS, file)
	if err != nil {
		fmt.Fprintf(stderr, "tripgrade demo: no example %q (the examples are: %s)\n", *name, strings.Join(names, ", "))
		return exitUsage
	}
	s, err := study.Parse(path.Join("examples", file), src, examples.FS)
	if err != nil {
		var el study.ErrorList
		if errors.As(err, &el) {
			for _, e := range el {
				fmt.Fprintln(stderr, e)
			}
		} else {
			fmt.Fprintln(stderr, err)
		}
		return exitUsage
	}
	l, ok := prepare(path.Join("examples", file), s, stderr)
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
