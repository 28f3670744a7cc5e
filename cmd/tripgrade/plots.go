package main

import (
	"bytes"
	"fmt"
	"path/filepath"

	"tripgrade/coord"
	"tripgrade/coord/tcc"
)

// newAtlas gathers what the charts of a checked study are drawn from.
func newAtlas(l loaded, res *coord.Result) (*tcc.Atlas, error) {
	levels, err := coord.FaultLevels(l.study, l.engine, l.topo)
	if err != nil {
		return nil, err
	}
	return tcc.NewAtlas(tcc.Input{Study: l.study, Topology: l.topo, Result: res, Levels: levels})
}

// writePlots writes a PNG time–current chart for every coordination path
// and every failing pair to outDir, as DIR/<chart name>.png (see
// tcc.Atlas.Charts for the names), each file atomically, and returns the
// paths written.
func writePlots(l loaded, res *coord.Result, outDir string) ([]string, error) {
	a, err := newAtlas(l, res)
	if err != nil {
		return nil, fmt.Errorf("plots: %w", err)
	}
	var wrote []string
	for _, c := range a.Charts() {
		path := filepath.Join(outDir, c.Name+"."+tcc.PNG.Ext())
		if err := writeTo(path, func(b *bytes.Buffer) error { return c.Render(b, tcc.PNG, tcc.Settings{}) }); err != nil {
			return wrote, err
		}
		wrote = append(wrote, path)
	}
	return wrote, nil
}
