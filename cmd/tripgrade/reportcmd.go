package main

import (
	"bytes"
	"fmt"
	"os"
	"strconv"
	"strings"
	"time"

	"tripgrade/coord"
	"tripgrade/coord/report"
	"tripgrade/coord/tcc"
)

// writeReport writes the self-contained HTML audit report of a checked
// study to path, atomically: the findings, the digests of the input
// files, the tool version, the date and every chart, each failing finding
// linked to the chart its figure is drawn on.
func writeReport(l loaded, run *scenarioRun, tab *report.Findings, path string, gate string) error {
	a, err := auditReport(l, run, tab, gate)
	if err != nil {
		return err
	}
	return writeTo(path, func(b *bytes.Buffer) error { return a.WriteHTML(b) })
}

// auditReport gathers the audit report of a checked study (writeReport):
// the charts of the study as drawn, and those of the pairs that fail only
// in a scenario, drawn in it.
func auditReport(l loaded, run *scenarioRun, tab *report.Findings, gate string) (*report.Audit, error) {
	date, err := reportDate()
	if err != nil {
		return nil, err
	}
	a := &report.Audit{Findings: tab, Version: toolVersion(), Date: date, Inputs: l.study.Inputs, Gate: gate}
	var atlas *tcc.Atlas
	var charts []*tcc.Chart
	if run.asDrawn != nil {
		if atlas, err = newAtlas(l, run.asDrawn); err != nil {
			return nil, fmt.Errorf("charts: %w", err)
		}
		charts = atlas.Charts()
	}
	extra := run.pairCharts(run.res)
	linked := chartOf(atlas, charts, extra, tab.Rows)
	chosen := chooseCharts(charts, extra, linked, tab.Rows, maxReportCharts)
	for _, c := range extra {
		if !chosen[c.name] {
			a.ChartsLeftOut++
			continue
		}
		a.Charts = append(a.Charts, report.Chart{Name: c.name, Subtitle: c.subtitle, PNG: c.report})
	}
	for _, c := range charts {
		if !chosen[c.Name] {
			a.ChartsLeftOut++
			continue
		}
		var b bytes.Buffer
		if err := c.Render(&b, tcc.PNG, reportChartSize); err != nil {
			return nil, fmt.Errorf("chart %s: %w", c.Name, err)
		}
		a.Charts = append(a.Charts, report.Chart{Name: c.Name, Subtitle: c.Subtitle, PNG: b.Bytes()})
	}
	a.ChartOf = make([]string, len(linked))
	for k, name := range linked {
		if chosen[name] {
			a.ChartOf[k] = name
		}
	}
	return a, nil
}

// maxReportCharts bounds the charts embedded in a report, so that the
// report of a large study stays a file one can open and mail (a chart is
// about 0.4 MB); check --out DIR writes all of them.
const maxReportCharts = 40

// chooseCharts picks the charts to embed: first those the failing and
// accepted findings link to, in the order of the rows, then the others
// (the coordination paths), up to limit.
func chooseCharts(charts []*tcc.Chart, extra []*scenarioChart, linked []string, rows []report.Row, limit int) map[string]bool {
	chosen := map[string]bool{}
	for k, name := range linked {
		v := rows[k].Finding.Verdict
		if name != "" && len(chosen) < limit && (v == coord.Fail || v == coord.Accepted) {
			chosen[name] = true
		}
	}
	for _, c := range extra {
		if len(chosen) < limit {
			chosen[c.name] = true
		}
	}
	for _, c := range charts {
		if len(chosen) < limit {
			chosen[c.Name] = true
		}
	}
	return chosen
}

// chartOf names, per findings row, the chart to look at: a failing
// pair's own chart for its grading finding (drawn in its scenario when it
// fails only there), otherwise the first chart of a path through the
// finding's device.
func chartOf(atlas *tcc.Atlas, charts []*tcc.Chart, extra []*scenarioChart, rows []report.Row) []string {
	// The first path chart through each device, and each failing pair's
	// chart, from one pass over the charts (asking the atlas per row
	// would rebuild every chart for every row).
	path := map[int]string{}
	pair := map[[2]int]string{}
	for _, c := range charts {
		if strings.HasPrefix(c.Name, "pair-") && len(c.Pairs) == 1 {
			k := [2]int{c.Pairs[0].Downstream, c.Pairs[0].Upstream}
			if _, ok := pair[k]; !ok {
				pair[k] = c.Name
			}
			continue
		}
		for _, i := range c.Devices {
			if _, ok := path[i]; !ok {
				path[i] = c.Name
			}
		}
	}
	inScenario := map[[3]string]string{}
	for _, c := range extra {
		inScenario[[3]string{c.device, c.other, c.scenario}] = c.name
	}
	out := make([]string, len(rows))
	for k, r := range rows {
		x := r.Finding
		if name, ok := inScenario[[3]string{x.Device, x.Other, x.Scenario}]; ok && x.Check == coord.Grading {
			out[k] = name
			continue
		}
		if atlas == nil {
			continue
		}
		i := atlas.Device(x.Device)
		if i < 0 {
			continue
		}
		if x.Check == coord.Grading {
			if name, ok := pair[[2]int{i, atlas.Device(x.Other)}]; ok {
				out[k] = name
				continue
			}
		}
		out[k] = path[i]
	}
	return out
}

// reportDate is the report's date: now, or the time SOURCE_DATE_EPOCH
// gives (seconds since 1970, the reproducible-builds convention), so that
// a report can be made byte for byte again.
func reportDate() (string, error) {
	t := time.Now()
	if v, ok := os.LookupEnv("SOURCE_DATE_EPOCH"); ok {
		sec, err := strconv.ParseInt(v, 10, 64)
		if err != nil {
			return "", fmt.Errorf("SOURCE_DATE_EPOCH=%q: want whole seconds since 1970", v)
		}
		t = time.Unix(sec, 0)
	}
	return t.UTC().Format("2006-01-02 15:04 UTC"), nil
}

// reportChartSize draws the report's charts at the default layout (10 ×
// 7.5 in) with fewer dots per inch than the PNG files: sharp on a screen
// and on paper, and the report stays a file one can mail.
var reportChartSize = tcc.Settings{WidthPx: 1200, HeightPx: 900, DPI: 120}
