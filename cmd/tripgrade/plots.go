package main

import (
	"bytes"
	"fmt"
	"runtime"
	"sync"

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
// atomically, and returns the paths written, in chart order. Charts are
// drawn on every processor at once; the error reported is that of the
// first chart, in chart order, that failed.
func writePlots(out *outFolder, charts []*tcc.Chart) ([]string, error) {
	errs := make([]error, len(charts))
	paths := make([]string, len(charts))
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for k, c := range charts {
		wg.Add(1)
		sem <- struct{}{}
		go func() {
			defer func() { <-sem; wg.Done() }()
			paths[k], errs[k] = out.write(chartFile(c), func(b *bytes.Buffer) error { return c.Render(b, tcc.PNG, tcc.Settings{}) })
		}()
	}
	wg.Wait()
	var wrote []string
	for _, p := range paths {
		if p != "" {
			wrote = append(wrote, p)
		}
	}
	return wrote, firstError(errs)
}

// firstError returns the first non-nil error, or nil.
func firstError(errs []error) error {
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
