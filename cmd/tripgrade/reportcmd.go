package main

import (
	"tripgrade/coord"
	"tripgrade/coord/report"
)

// writeReport writes the HTML audit report (filled in below).
func writeReport(l loaded, res *coord.Result, tab *report.Findings, path string) error {
	return nil
}
