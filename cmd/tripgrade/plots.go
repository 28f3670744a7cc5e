package main

import (
	"bytes"
	"fmt"

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

// plotCharts returns the time–current charts of every coordination path
// and every failing pair (see tcc.Atlas.Charts for their names).
func plotCharts(l loaded, res *coord.Result) ([]*tcc.Chart, error) {
	a, err := newAtlas(l, res)
	if err != nil {
		return nil, fmt.Errorf("plots: %w", err)
	}
	return a.Charts(), nil
}

// chartFile is the file name of a chart in the output folder.
func chartFile(c *tcc.Chart) string { return c.Name + "." + tcc.PNG.Ext() }

// writePlots writes each chart as a PNG into the output folder, each file
// atomically.
func writePlots(out *outFolder, charts []*tcc.Chart) error {
	for _, c := range charts {
		if err := out.write(chartFile(c), func(b *bytes.Buffer) error { return c.Render(b, tcc.PNG, tcc.Settings{}) }); err != nil {
			return err
		}
	}
	return nil
}
