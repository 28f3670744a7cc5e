package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"tripgrade/coord"
	"tripgrade/coord/study"
	"tripgrade/coord/tcc"
)

// runPlot is "tripgrade plot STUDY.toml --device NAME": the time–current
// charts of the coordination paths through one device.
func runPlot(args []string, stdout, stderr io.Writer) int {
	c := newCmdLine("plot", `usage: tripgrade plot STUDY.toml --device NAME [--out FILE] [--format png|svg] [--scenario NAME]

Draws the time-current charts of the coordination paths through a device: the
curves of the devices from the most downstream one back to the source, the
fault levels, damage curves, inrush and load of the path's own equipment, and
each pair's grading margin at its worst fault. Phase faults and earth faults
have charts of their own; a path whose currents would span more than about
four decades on one axis is split at a transformer, each part referred to its
own voltage by the transformers' winding ratios. One chart is written to
FILE; several to FILE-phase and FILE-earth (FILE-phase-1, FILE-phase-2, ...
when a device lies on several paths or parts), before the extension; a FILE
without an extension takes the format's. The
files written are listed on standard output. Without --out the file is the
device's name, made safe, with the format's extension, in the current folder.
SVG text is drawn as outlines, so it shows the same on any machine. With
--scenario, the charts of one of the study's operating scenarios. Exit 0
when written; 2 when the study, the device or the command line is wrong.`)
	device := c.fs.String("device", "", "draw the paths through the device `NAME` (required)")
	out := c.fs.String("out", "", "write to `FILE` (default: the device name and the format's extension)")
	format := c.fs.String("format", "", "image format, png or svg (default: from the extension of --out, else png)")
	scenario := c.fs.String("scenario", "", scenarioFlagHelp)
	if code, done := c.parse(args, 1, "exactly one study file", stdout, stderr); done {
		return code
	}
	if *device == "" {
		return c.usageError(stderr, "--device NAME is required")
	}
	f, err := plotFormat(*format, *out)
	if err != nil {
		return c.usageError(stderr, "%v", err)
	}
	path := c.fs.Arg(0)
	l, ok := loadStudy(path, stderr)
	if ok {
		l, ok = inScenario(l, *scenario, stderr)
	}
	if !ok {
		return exitUsage
	}
	res, err := coord.Check(l.study, l.engine, l.topo)
	if err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	a, err := newAtlas(l, res)
	if err != nil {
		return c.fail(stderr, exitUsage, "%v", err)
	}
	i := a.Device(*device)
	if i < 0 {
		msg := fmt.Sprintf("study %q (%s) has no device %q", l.study.Name, path, *device)
		if near := study.Closest(*device, deviceNames(l.study)); near != "" {
			msg += fmt.Sprintf("; did you mean %q?", near)
		}
		return c.fail(stderr, exitUsage, "%s", msg)
	}
	charts := a.PathCharts(i)
	if len(charts) == 0 {
		return c.fail(stderr, exitUsage, "device %q is on no chart: it has no phase stage, and no fault of its zone drives residual current through its ground stages", *device)
	}
	kinds := make([]coord.Quantity, len(charts))
	for k, ch := range charts {
		kinds[k] = ch.Kind
	}
	files := plotFiles(*out, *device, f, kinds)
	if dir := filepath.Dir(files[0]); dir != "." {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			return c.fail(stderr, exitUsage, "cannot create the folder %s: %v", dir, unwrapPathError(err))
		}
	}
	for k, ch := range charts {
		if err := writeTo(files[k], func(b *bytes.Buffer) error { return ch.Render(b, f, tcc.Settings{}) }); err != nil {
			return c.fail(stderr, exitUsage, "%v", err)
		}
		fmt.Fprintln(stdout, files[k])
	}
	return exitOK
}

// plotFormat takes --format, or else the extension of --out, or else PNG.
func plotFormat(format, out string) (tcc.Format, error) {
	if format != "" {
		return tcc.ParseFormat(format)
	}
	switch strings.ToLower(filepath.Ext(out)) {
	case ".svg":
		return tcc.SVG, nil
	}
	return tcc.PNG, nil
}

// plotFiles names the files of charts of the given kinds: out (or the
// sanitised device name; either with the format's extension when it has
// none) for one chart; for
// several, "-phase" or "-earth" before the extension, with "-1", "-2", ...
// after it when a kind has several charts.
func plotFiles(out, device string, f tcc.Format, kinds []coord.Quantity) []string {
	switch {
	case out == "":
		out = tcc.Sanitise(device) + "." + f.Ext()
	case filepath.Ext(out) == "":
		out += "." + f.Ext() // a chart file a viewer knows by its name
	}
	if len(kinds) == 1 {
		return []string{out}
	}
	ext := filepath.Ext(out)
	stem := strings.TrimSuffix(out, ext)
	count := map[coord.Quantity]int{}
	for _, q := range kinds {
		count[q]++
	}
	seen := map[coord.Quantity]int{}
	files := make([]string, len(kinds))
	for k, q := range kinds {
		name := stem + "-phase"
		if q == coord.Residual {
			name = stem + "-earth"
		}
		seen[q]++
		if count[q] > 1 {
			name += fmt.Sprintf("-%d", seen[q])
		}
		files[k] = name + ext
	}
	return files
}

func deviceNames(s *coord.Study) []string {
	out := make([]string, len(s.Devices))
	for i, d := range s.Devices {
		out[i] = d.Name
	}
	return out
}
