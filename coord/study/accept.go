package study

import (
	"fmt"
	"strings"
	"time"

	"tripgrade/coord"
)

// rawAccept is an [[accept]] entry: a reviewer's acceptance of a failing
// or warning finding.
type rawAccept struct {
	Check  string `key:"check"`
	Device string `key:"device"`
	Other  string `key:"other"`
	Stage  string `key:"stage"`
	Reason string `key:"reason"`
	By     string `key:"by"`
	Date   string `key:"date"`
	// Scenario limits the entry to the findings of one scenario (the
	// study as drawn is "as drawn"); empty: every scenario.
	Scenario string `key:"scenario"`
}

// acceptDate is the form of an acceptance's date (ISO 8601, as TOML and
// every spreadsheet write it).
const acceptDate = "2006-01-02"

// buildAccepts checks the [[accept]] entries. Whether each one matches a
// finding can only be known after the checks run (coord.Accept); here the
// names it uses must exist and its record must be complete.
func (b *builder) buildAccepts() {
	checks := map[string]int{}
	for _, c := range coord.CheckKinds {
		checks[c.Slug()] = 0
	}
	for i, r := range b.raw.Accepts {
		path := fmt.Sprintf("accept[%d]", i)
		w := where{path: path, element: fmt.Sprintf("accept %d", i+1)}
		before := b.failures
		switch {
		case r.Check == "":
			b.fail(w, "check", "check is missing (one of %s)", verbatim(checkList()))
		case !knownCheck(r.Check):
			b.fail(w, "check", "check = %q: no such check (one of %s)%s", r.Check, verbatim(checkList()), suggest(r.Check, checks))
		}
		_, found := b.deviceSeen[r.Device]
		found = found || b.dropped[r.Device] // out of service in the scenario being built
		switch {
		case r.Device == "":
			b.fail(w, "device", "device is missing (the relay or fuse the finding is about; of a pair, the downstream one)")
		case !found && b.unread("relay", "fuse"):
			b.failures++ // the device may be in the table that could not be read
		case !found:
			b.fail(w, "device", "device = %q: no relay or fuse of that name%s", r.Device, b.closest(r.Device, b.deviceSeen))
		}
		if r.Other != "" {
			_, dev := b.deviceSeen[r.Other]
			_, br := b.branch[r.Other]
			_, three := b.unit3[r.Other]
			if !dev && !br && !three && !b.dropped[r.Other] && !b.unread("relay", "fuse", "line", "transformer", "transformer3") {
				b.fail(w, "other", "other = %q: no relay, fuse, line or transformer of that name%s", r.Other, b.closest(r.Other, b.deviceSeen))
			}
		}
		for _, k := range []struct{ key, val, what string }{
			{"reason", r.Reason, "why the finding is acceptable"},
			{"by", r.By, "who accepted it"},
			{"date", r.Date, "when, as YYYY-MM-DD"},
		} {
			// A value of the wrong type was reported already (fail
			// says nothing more of a refused key); a blank one is missing.
			if strings.TrimSpace(k.val) == "" {
				b.fail(w, k.key, "%s is missing (%s): an acceptance must say why, who and when", k.key, k.what)
			}
		}
		for _, k := range []struct{ key, val string }{{"other", r.Other}, {"stage", r.Stage}, {"reason", r.Reason}, {"by", r.By}, {"date", r.Date}, {"scenario", r.Scenario}} {
			b.readable(w, k.key, k.val) // reports print them
		}
		if strings.TrimSpace(r.Date) != "" {
			if _, err := time.Parse(acceptDate, r.Date); err != nil {
				b.fail(w, "date", "date = %q: want a date as YYYY-MM-DD", r.Date)
			}
		}
		if b.failures > before {
			continue
		}
		b.st.Accepts = append(b.st.Accepts, coord.Acceptance{
			Check: r.Check, Device: r.Device, Other: r.Other, Stage: r.Stage,
			Reason: strings.TrimSpace(r.Reason), By: strings.TrimSpace(r.By), Date: r.Date, Scenario: r.Scenario,
			Line: b.lines.table(path), Index: i + 1,
		})
	}
}

func knownCheck(name string) bool {
	for _, c := range coord.CheckKinds {
		if coord.CheckNamed(c, name) {
			return true
		}
	}
	return false
}

func checkList() string {
	var s []string
	for _, c := range coord.CheckKinds {
		s = append(s, c.Slug())
	}
	return strings.Join(s, ", ")
}
