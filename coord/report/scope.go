package report

import (
	"fmt"
	"sort"
	"strings"

	"tripgrade/coord"
)

// ScopeInfo says what a scoped check covered and what it left out.
type ScopeInfo struct {
	Names            []string // the names given to --scope
	Devices, Backups []string
	// LeftOut counts the findings left out, and LeftDevices names their
	// devices.
	LeftOut     int
	LeftDevices []string
}

// NewScopeInfo describes a scope and the findings it left out.
func NewScopeInfo(s *coord.Study, sc *coord.Scope, left []coord.Finding) *ScopeInfo {
	names := func(ix []int) []string {
		out := []string{}
		for _, i := range ix {
			out = append(out, s.Devices[i].Name)
		}
		return out
	}
	in := &ScopeInfo{Names: sc.Names, Devices: names(sc.Devices), Backups: names(sc.Backups), LeftOut: len(left), LeftDevices: []string{}}
	seen := map[string]bool{}
	for _, f := range left {
		if !seen[f.Device] {
			seen[f.Device] = true
			in.LeftDevices = append(in.LeftDevices, f.Device)
		}
	}
	sort.Strings(in.LeftDevices)
	return in
}

// lines describes the scope for a report's header.
func (sc *ScopeInfo) lines() []string {
	if sc == nil {
		return nil
	}
	backups := "none"
	if len(sc.Backups) > 0 {
		backups = strings.Join(sc.Backups, ", ")
	}
	out := []string{
		fmt.Sprintf("scope %s: the findings of %s, and of the pairs with their backups (%s)",
			strings.Join(sc.Names, ", "), strings.Join(sc.Devices, ", "), backups),
	}
	if sc.LeftOut == 0 {
		return append(out, "left out: nothing")
	}
	return append(out, fmt.Sprintf("left out: %d findings of %s", sc.LeftOut, listSome(sc.LeftDevices, maxListed)))
}

// maxListed is how many left-out devices a header names before "and N
// more" (the JSON lists all of them).
const maxListed = 12

func listSome(names []string, n int) string {
	if len(names) <= n {
		return strings.Join(names, ", ")
	}
	return fmt.Sprintf("%s and %d more", strings.Join(names[:n], ", "), len(names)-n)
}

type jsonScope struct {
	Names       []string `json:"names"`
	Devices     []string `json:"devices"`
	Backups     []string `json:"backups"`
	LeftOut     int      `json:"left_out"`
	LeftDevices []string `json:"left_out_devices"`
}

func (sc *ScopeInfo) json() *jsonScope {
	if sc == nil {
		return nil
	}
	return &jsonScope{sc.Names, sc.Devices, sc.Backups, sc.LeftOut, sc.LeftDevices}
}
