package main

import (
	"bytes"
	"fmt"
	"path/filepath"
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

// writePlots writes a PNG time–current chart for every chart of the atlas
// (see tcc.Atlas.Charts for the names) to outDir, as DIR/<chart name>.png,
// each file atomically, and returns the paths written, in chart order.
// Charts are drawn on every processor at once; the error reported is that
// of the first chart, in chart order, that failed.
func writePlots(l loaded, res *coord.Result, outDir string) ([]string, error) {
	a, err := newAtlas(l, res)
	if err != nil {
		return nil, fmt.Errorf("plots: %w", err)
	}
	charts := a.Charts()
	errs := make([]error, len(charts))
	paths := make([]string, len(charts))
	sem := make(chan struct{}, runtime.GOMAXPROCS(0))
	var wg sync.WaitGroup
	for k, c := range charts {
		wg.Add(1)
		sem <- struct{}{}
		go func() {
			defer func() { <-sem; wg.Done() }()
			path := filepath.Join(outDir, c.Name+"."+tcc.PNG.Ext())
			if errs[k] = writeTo(path, func(b *bytes.Buffer) error { return c.Render(b, tcc.PNG, tcc.Settings{}) }); errs[k] == nil {
				paths[k] = path
			}
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
