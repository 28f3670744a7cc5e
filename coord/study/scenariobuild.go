package study

import (
	"fmt"
	"io/fs"
	"sort"
	"strings"

	"tripgrade/coord"
)

// scenarios makes the study's scenarios from their definitions, and
// builds each of the study's own [[scenario]] tables once, so that a
// configuration the engine cannot take (a bus left with no source, a line
// shorted out by a closed switch) is reported with the scenario's line
// now rather than half-way through a check. The N-1 sweep's outages were
// screened for sources already (cutsOff); they are built when checked.
func (b *builder) scenarios(defs []scenarioDef, dir fs.FS) ErrorList {
	var errs ErrorList
	for _, d := range defs {
		sc := coord.Scenario{Name: d.name, Changes: strings.Join(d.changes, "; "), Outage: d.outage, Build: b.scenarioBuild(d, dir)}
		if d.outage && len(d.switches) == 0 && len(d.running) == 0 && len(d.sources) == 0 {
			for e := range d.out {
				sc.Out = append(sc.Out, e.name)
			}
			sort.Strings(sc.Out)
		}
		if !d.outage {
			if _, err := sc.Build(); err != nil {
				if list, ok := err.(ErrorList); ok {
					errs = append(errs, list...)
				} else {
					errs = append(errs, &Error{File: b.file, Line: b.lines.table(d.path), Element: fmt.Sprintf("scenario %q", d.name), Msg: err.Error()})
				}
				continue
			}
		}
		b.st.Scenarios = append(b.st.Scenarios, sc)
	}
	return errs
}

// scenarioBuild returns the function that builds the study in scenario
// d: the file's tables with d's changes made (applyScenario), read by a
// builder of their own. Its messages name the scenario and its line.
func (b *builder) scenarioBuild(d scenarioDef, dir fs.FS) func() (*coord.Study, error) {
	return func() (*coord.Study, error) {
		raw, origins, dropped := applyScenario(b.raw, &d)
		sb := newBuilder(&decoder{file: b.file, lines: b.lines, blamed: map[string]bool{}}, &raw)
		sb.cfg, sb.origins, sb.dropped, sb.csvCache = &d, origins, dropped, b.csvCache
		sb.st.Inputs = b.st.Inputs
		sb.build(dir)
		if len(sb.errs) == 0 {
			return sb.st, nil
		}
		line := 0
		if d.path != "" {
			line = b.lines.table(d.path)
		}
		var out ErrorList
		for _, e := range sb.errs.sorted(b.file) {
			msg := e.Msg
			if e.Element != "" {
				msg = e.Element + ": " + msg
			}
			switch {
			case e.File != b.file:
				msg += fmt.Sprintf(" (%s:%d)", e.File, e.Line)
			case e.Line > 0 && e.Line != line:
				msg += fmt.Sprintf(" (line %d)", e.Line)
			}
			out = append(out, &Error{File: b.file, Line: line, Element: fmt.Sprintf("scenario %q", d.name), Msg: clipText(msg, maxEchoMessage)})
		}
		return nil, out
	}
}

// applyScenario returns the study file's tables with scenario d's changes
// made: its elements out of service removed, with the relays and fuses on
// them (or measuring a neutral current of a transformer out of service,
// or polarised by one) and the [[pair]] entries naming those; a power
// station unit's generator goes with its unit transformer. Its sources'
// strengths and its generators' minimum-case running replace the file's.
// It also returns, per kind of table, the file's index of each table kept,
// and the names it removed.
func applyScenario(src *rawFile, d *scenarioDef) (rawFile, map[string][]int, map[string]bool) {
	raw := *src
	raw.Scenarios = nil
	raw.Study.NMinus1 = nil
	origins := map[string][]int{}
	dropped := map[string]bool{}
	out := func(kind, name string) bool {
		if d.out[element{kind, name}] {
			dropped[name] = true
			return true
		}
		return false
	}
	raw.Lines = keep(src.Lines, "line", origins, func(r rawLine) bool { return !out("line", r.Name) })
	raw.Transformer = keep(src.Transformer, "transformer", origins, func(r rawTransformer) bool { return !out("transformer", r.Name) })
	raw.Transf3 = keep(src.Transf3, "transformer3", origins, func(r rawTransf3) bool { return !out("transformer3", r.Name) })
	raw.Generators = keep(src.Generators, "generator", origins, func(r rawGenerator) bool {
		if r.UnitTransformer != "" && dropped[r.UnitTransformer] {
			dropped[r.Name] = true
			return false
		}
		return !out("generator", r.Name)
	})
	raw.Sources = keep(src.Sources, "source", origins, func(r rawSource) bool { return !out("source", r.Name) })
	for i := range raw.Generators {
		if d.running[raw.Generators[i].Name] {
			yes := true
			raw.Generators[i].AlwaysRunning = &yes
		}
	}
	for i := range raw.Sources {
		if s, ok := d.sources[raw.Sources[i].Name]; ok {
			raw.Sources[i] = withStrength(raw.Sources[i], s)
		}
	}
	raw.Relays = keep(src.Relays, "relay", origins, func(r rawRelay) bool {
		gone := dropped[r.Branch] || (r.NeutralCT != "" && dropped[r.NeutralCT]) || (r.PolarisingBranch != "" && dropped[r.PolarisingBranch])
		if gone {
			dropped[r.Name] = true
		}
		return !gone
	})
	raw.Fuses = keep(src.Fuses, "fuse", origins, func(r rawFuse) bool {
		if dropped[r.Branch] {
			dropped[r.Name] = true
			return false
		}
		return true
	})
	raw.Pairs = keep(src.Pairs, "pair", origins, func(r rawPair) bool { return !dropped[r.Upstream] && !dropped[r.Downstream] })
	return raw, origins, dropped
}

// keep returns the tables of list for which ok holds, and records the
// index of each in origins[key].
func keep[T any](list []T, key string, origins map[string][]int, ok func(T) bool) []T {
	var out []T
	var idx []int
	for i, r := range list {
		if ok(r) {
			out = append(out, r)
			idx = append(idx, i)
		}
	}
	origins[key] = idx
	return out
}

// withStrength returns a source with a scenario's strength: the
// short-circuit powers given replace the source's own strength of that
// case (whether it gave MVA or ohms), and X/R ratios given replace its
// own.
func withStrength(r rawSource, s rawScenarioSource) rawSource {
	if s.SCMVAMax != nil {
		r.SCMVAMax, r.R1OhmMax, r.X1OhmMax = s.SCMVAMax, nil, nil
	}
	if s.SCMVAMin != nil {
		r.SCMVAMin, r.R1OhmMin, r.X1OhmMin = s.SCMVAMin, nil, nil
	}
	if s.XR != nil {
		r.XR = s.XR
	}
	if s.XRMin != nil {
		r.XRMin = s.XRMin
	}
	return r
}
