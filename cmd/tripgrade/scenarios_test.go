package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"
)

const sameAsEdited = "../../testdata/scenarios/same-as-edited.toml"

// studyTables is a study file cut into its top-level tables: each block
// starts at a header in the first column ("[[line]]", "[study]") and runs
// to the next, with its indented sub-tables ("  [[relay.stage]]") and the
// comments and blank lines after it. The first block is what comes before
// any header.
type studyTables []string

func cutTables(text string) studyTables {
	var out studyTables
	var cur strings.Builder
	for _, line := range strings.SplitAfter(text, "\n") {
		if strings.HasPrefix(line, "[") {
			out = append(out, cur.String())
			cur.Reset()
		}
		cur.WriteString(line)
	}
	return append(out, cur.String())
}

func (s studyTables) String() string { return strings.Join(s, "") }

// is reports whether block b is a table of header whose key = value.
func is(b, header, key, value string) bool {
	return strings.HasPrefix(b, header+"\n") && strings.Contains(b, "\n"+key+" = \""+value+"\"\n")
}

// drop removes the tables of header whose key = value, failing the test
// when there is none.
func (s studyTables) drop(t *testing.T, header, key, value string) studyTables {
	t.Helper()
	var out studyTables
	for _, b := range s {
		if !is(b, header, key, value) {
			out = append(out, b)
		}
	}
	if len(out) == len(s) {
		t.Fatalf("no %s with %s = %q", header, key, value)
	}
	return out
}

// set replaces the line "key = old" of the table of header named name by
// "key = new" (old "" appends the line to the table's own keys).
func (s studyTables) set(t *testing.T, header, name, key, old, new string) studyTables {
	t.Helper()
	out := append(studyTables(nil), s...)
	for i, b := range out {
		if !is(b, header, "name", name) {
			continue
		}
		if old == "" {
			out[i] = strings.Replace(b, "\nname = \""+name+"\"\n", "\nname = \""+name+"\"\n"+key+" = "+new+"\n", 1)
			return out
		}
		from, to := "\n"+key+" = "+old+"\n", "\n"+key+" = "+new+"\n"
		if !strings.Contains(b, from) {
			t.Fatalf("%s %q has no line %q", header, name, strings.TrimSpace(from))
		}
		out[i] = strings.Replace(b, from, to, 1)
		return out
	}
	t.Fatalf("no %s named %q", header, name)
	return nil
}

// asDrawnOnly removes the study's scenarios and its N-1 setting: the file
// a user has before editing it to a configuration by hand.
func (s studyTables) asDrawnOnly() studyTables {
	var out studyTables
	for _, b := range s {
		if strings.HasPrefix(b, "[[scenario]]\n") {
			continue
		}
		out = append(out, regexp.MustCompile(`(?m)^n_minus_1 = .*\n`).ReplaceAllString(b, ""))
	}
	return out
}

// scenarioSection returns one scenario's part of check --scenarios
// NAME's text output, between its heading and its verdict line, with the
// verdict line's "scenario NAME: " taken off.
func scenarioSection(t *testing.T, out, name string) string {
	t.Helper()
	head := regexp.MustCompile(`(?m)^=== scenario ` + regexp.QuoteMeta(name) + `: .* ===\n`)
	loc := head.FindStringIndex(out)
	if loc == nil {
		t.Fatalf("no section of scenario %q in:\n%s", name, out)
	}
	rest := out[loc[1]:]
	end := strings.Index(rest, "\nscenario "+name+": ")
	if end < 0 {
		t.Fatalf("scenario %q: no verdict line", name)
	}
	verdict, _, _ := strings.Cut(rest[end+len("\nscenario "+name+": "):], "\n")
	return rest[:end] + "\n" + verdict + "\n"
}

// splitHeader cuts a check's text output (or a scenario's section) at
// its list of backup pairs: the header, with the notes the check added
// to the criteria at its end, and the rest.
func splitHeader(t *testing.T, out string) (header, rest string) {
	t.Helper()
	i := strings.Index(out, "\nBackup pairs")
	if i < 0 {
		t.Fatalf("no backup pairs in:\n%s", out)
	}
	return out[:i], out[i:]
}

// studyBody returns a plain check's text output from its list of backup
// pairs to its verdict line, without the caution.
func studyBody(t *testing.T, rest string) string {
	t.Helper()
	body, _, ok := strings.Cut(rest, "\nCaution:")
	if !ok {
		t.Fatalf("no caution in:\n%s", rest)
	}
	return body + "\n"
}

// jsonScenario returns check --scenarios NAME --format json's entry of
// that scenario, with the scenario's name and changes and the scenario
// field of each finding taken off, re-encoded.
func jsonScenario(t *testing.T, out, name string) []byte {
	t.Helper()
	var doc struct {
		Scenarios []map[string]json.RawMessage `json:"scenario_findings"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	for _, s := range doc.Scenarios {
		var n string
		if err := json.Unmarshal(s["name"], &n); err != nil || n != name {
			continue
		}
		delete(s, "name")
		delete(s, "changes")
		var fs []map[string]json.RawMessage
		if err := json.Unmarshal(s["findings"], &fs); err != nil {
			t.Fatal(err)
		}
		for _, f := range fs {
			if string(f["scenario"]) != `"`+name+`"` {
				t.Fatalf("scenario %q: a finding names scenario %s", name, f["scenario"])
			}
			delete(f, "scenario")
		}
		return reencode(t, s, fs)
	}
	t.Fatalf("no scenario %q in scenario_findings", name)
	return nil
}

// jsonStudy returns a plain check's findings JSON with the fields a
// scenario's entry has, re-encoded the same way.
func jsonStudy(t *testing.T, out string, keys []string) []byte {
	t.Helper()
	var doc map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	s := map[string]json.RawMessage{}
	for _, k := range keys {
		s[k] = doc[k]
	}
	var fs []map[string]json.RawMessage
	if err := json.Unmarshal(doc["findings"], &fs); err != nil {
		t.Fatal(err)
	}
	return reencode(t, s, fs)
}

func reencode(t *testing.T, s map[string]json.RawMessage, findings []map[string]json.RawMessage) []byte {
	t.Helper()
	fb, err := json.Marshal(findings)
	if err != nil {
		t.Fatal(err)
	}
	s["findings"] = fb
	b, err := json.MarshalIndent(s, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestScenarioSameAsEditedFile: each kind of change a scenario can make
// gives the findings of the study edited by hand to that configuration,
// byte for byte, in the text table and in JSON. The edits are written
// out below as a user would make them (remove the line and the relay on
// it; set the switch's closed; write always_running = true; ...), on the
// study with its [[scenario]] tables and n_minus_1 removed, and checked
// without scenarios. The comparison takes off only what names the
// scenario: in the text, the scenario's heading and the "scenario NAME: "
// of its verdict line against the plain check's header and caution (the
// notes the check adds to the criteria, which the scenario's section
// gives under its heading, must end that header); in JSON, the entry's
// name and changes and each finding's "scenario" field (which must name
// the scenario). The study's every scenario has such notes, so the
// comparison of notes is never empty.
func TestScenarioSameAsEditedFile(t *testing.T) {
	src, err := os.ReadFile(sameAsEdited)
	if err != nil {
		t.Fatal(err)
	}
	base := cutTables(string(src)).asDrawnOnly()
	cases := []struct {
		scenario string
		edit     func(studyTables) studyTables
	}{
		{"westdown line out", func(s studyTables) studyTables { // a line out, with its relay
			return s.drop(t, "[[line]]", "name", "WD-LINE").drop(t, "[[relay]]", "branch", "WD-LINE")
		}},
		{"TA out", func(s studyTables) studyTables { // a transformer out, with its relay
			return s.drop(t, "[[transformer]]", "name", "TA").drop(t, "[[relay]]", "branch", "TA")
		}},
		{"generator out", func(s studyTables) studyTables {
			return s.drop(t, "[[generator]]", "name", "FX-GEN")
		}},
		{"weak grid", func(s studyTables) studyTables { // a source's strength
			s = s.set(t, "[[source]]", "grid", "sc_mva_max", "750", "400")
			s = s.set(t, "[[source]]", "grid", "sc_mva_min", "350", "200")
			return s.set(t, "[[source]]", "grid", "x_r", "12", "9")
		}},
		{"section open", func(s studyTables) studyTables {
			return s.set(t, "[[switch]]", "BS", "closed", "true", "false")
		}},
		{"tie closed", func(s studyTables) studyTables {
			return s.set(t, "[[switch]]", "NOP", "closed", "false", "true")
		}},
		{"generator always running", func(s studyTables) studyTables {
			return s.set(t, "[[generator]]", "FX-GEN", "always_running", "", "true")
		}},
		{"westdown out", func(s studyTables) studyTables { // an outage of the N-1 sweep of sources
			return s.drop(t, "[[source]]", "name", "westdown")
		}},
	}
	dir := t.TempDir()
	for _, c := range cases {
		t.Run(c.scenario, func(t *testing.T) {
			edited := filepath.Join(dir, strings.ReplaceAll(c.scenario, " ", "-")+".toml")
			if err := os.WriteFile(edited, []byte(c.edit(base).String()), 0o644); err != nil {
				t.Fatal(err)
			}
			codeS, outS, errS := runArgs("check", sameAsEdited, "--scenarios", c.scenario)
			codeE, outE, errE := runArgs("check", edited)
			if errS != "" || errE != "" {
				t.Fatalf("stderr: scenario %q, edited %q", errS, errE)
			}
			if codeS != codeE {
				t.Errorf("exit %d in the scenario, %d edited", codeS, codeE)
			}
			notes, got := splitHeader(t, scenarioSection(t, outS, c.scenario))
			header, rest := splitHeader(t, outE)
			if want := studyBody(t, rest); got != want {
				t.Errorf("text differs from the edited study's:\n%s", firstDiff(got, want))
			}
			if notes == "" || !strings.HasSuffix(header, notes) {
				t.Errorf("the scenario's notes\n%s\nare not those that end the edited study's header\n%s", notes, header)
			}
			_, jsonS, _ := runArgs("check", sameAsEdited, "--scenarios", c.scenario, "--format", "json")
			_, jsonE, _ := runArgs("check", edited, "--format", "json")
			gotJSON := jsonScenario(t, jsonS, c.scenario)
			var keys map[string]json.RawMessage
			if err := json.Unmarshal(gotJSON, &keys); err != nil {
				t.Fatal(err)
			}
			var names []string
			for k := range keys {
				names = append(names, k)
			}
			if want := jsonStudy(t, jsonE, names); !bytes.Equal(gotJSON, want) {
				t.Errorf("JSON differs from the edited study's:\n%s", firstDiff(string(gotJSON), string(want)))
			}
		})
	}
}

const n1Mesh = "../../testdata/scenarios/n1-mesh.toml"

// TestNMinus1ExitCodeFollowsTheWorst: Tolbury passes every check as
// drawn, and fails with either end of its ring out: the check of every
// scenario exits 1, the check of the study as drawn alone 0, and the
// header names the sweep and the outages it left out.
func TestNMinus1ExitCodeFollowsTheWorst(t *testing.T) {
	code, out, errOut := runArgs("check", n1Mesh)
	if code != exitFail || errOut != "" {
		t.Fatalf("every scenario: exit %d (want %d), stderr %q", code, exitFail, errOut)
	}
	for _, want := range []string{
		"N-1 (line, transformer): 3 single outages",
		"N-1: 2 outages left out because they leave part of the network with no source: TB-DE out, TB-T out",
		"TB-AB out",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("the table does not say %q", want)
		}
	}
	for _, c := range []struct {
		scenarios string
		code      int
	}{
		{"as drawn", exitOK},
		{"TB-AB out", exitFail},
		{"as drawn,TB-CA out", exitFail},
	} {
		if code, _, errOut := runArgs("check", n1Mesh, "--scenarios", c.scenarios); code != c.code || errOut != "" {
			t.Errorf("--scenarios %q: exit %d (want %d), stderr %q", c.scenarios, code, c.code, errOut)
		}
	}
}

// TestScenariosAllListsEveryScenario: --scenarios all gives each
// scenario's findings in turn, the study as drawn first, then the worst
// of each check over them all; in JSON, one entry per scenario in
// scenario_findings and the worst findings, each naming its scenario.
func TestScenariosAllListsEveryScenario(t *testing.T) {
	scenarios := []string{"as drawn", "TB-AB out", "TB-BC out", "TB-CA out"}
	_, out, _ := runArgs("check", n1Mesh, "--scenarios", "all")
	at := 0
	for _, name := range scenarios {
		i := strings.Index(out[at:], "\n=== scenario "+name+": ")
		if i < 0 {
			t.Fatalf("no section of scenario %q after byte %d", name, at)
		}
		at += i + 1
		if !strings.Contains(out[at:], "\nscenario "+name+": ") {
			t.Errorf("scenario %q: no verdict line", name)
		}
	}
	if !strings.Contains(out[at:], "\n=== all scenarios: the worst finding of each check, device and stage ===\n") {
		t.Errorf("no table of the worst findings after the scenarios")
	}
	_, js, _ := runArgs("check", n1Mesh, "--scenarios", "all", "--format", "json")
	var doc struct {
		Scenarios []struct {
			Name     string `json:"name"`
			Findings []struct {
				Scenario string `json:"scenario"`
			} `json:"findings"`
			Summary struct{ Fail int } `json:"summary"`
		} `json:"scenario_findings"`
		Findings []struct {
			Verdict, Scenario string
		} `json:"findings"`
		Summary struct{ Fail int } `json:"summary"`
	}
	if err := json.Unmarshal([]byte(js), &doc); err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, s := range doc.Scenarios {
		names = append(names, s.Name)
		for _, f := range s.Findings {
			if f.Scenario != s.Name {
				t.Errorf("%s: a finding names scenario %q", s.Name, f.Scenario)
			}
		}
	}
	if strings.Join(names, "|") != strings.Join(scenarios, "|") {
		t.Errorf("scenario_findings %q, want %q", names, scenarios)
	}
	if doc.Scenarios[0].Summary.Fail != 0 || doc.Summary.Fail == 0 {
		t.Errorf("failures: %d as drawn (want 0), %d over all (want some)", doc.Scenarios[0].Summary.Fail, doc.Summary.Fail)
	}
	for _, f := range doc.Findings {
		if f.Verdict == "FAIL" && f.Scenario != "TB-AB out" && f.Scenario != "TB-CA out" {
			t.Errorf("a worst failure in scenario %q, want one of the ring ends out", f.Scenario)
		}
	}
}

// TestScenarioInputErrorsExit2: every bad scenario or switch input stops
// check with exit status 2 and the loader's messages, each naming the
// file and line (the messages themselves are pinned by coord/study's
// golden files).
func TestScenarioInputErrorsExit2(t *testing.T) {
	for _, name := range []string{"scenario-references", "scenario-changes", "scenario-configurations", "switches", "sweep-kinds", "sweep-names"} {
		path := "../../testdata/errors/" + name + ".toml"
		code, out, errOut := runArgs("check", path)
		if code != exitUsage || out != "" {
			t.Errorf("%s: exit %d (want %d), stdout %q", name, code, exitUsage, out)
		}
		want, err := os.ReadFile("../../testdata/errors/" + name + ".golden")
		if err != nil {
			t.Fatal(err)
		}
		for _, line := range strings.Split(strings.TrimSpace(string(want)), "\n") {
			if !strings.Contains(errOut, "../../testdata/errors/"+line+"\n") {
				t.Errorf("%s: stderr lacks %q:\n%s", name, line, errOut)
			}
		}
	}
	for _, name := range []string{"TB-AB ot", "TB-AB"} {
		code, _, errOut := runArgs("check", n1Mesh, "--scenarios", name)
		if code != exitUsage || !strings.Contains(errOut, `did you mean "TB-AB out"?`) {
			t.Errorf("--scenarios %q: exit %d, stderr %q", name, code, errOut)
		}
		code, _, errOut = runArgs("faults", n1Mesh, "--scenario", name)
		if code != exitUsage || !strings.Contains(errOut, `did you mean "TB-AB out"?`) {
			t.Errorf("faults --scenario %q: exit %d, stderr %q", name, code, errOut)
		}
	}
}

// TestScenarioReportNamesScenarios: the audit report of a study with
// scenarios lists them with the sweep's notes, and each finding's table
// row names the scenario it comes from.
func TestScenarioReportNamesScenarios(t *testing.T) {
	path := filepath.Join(t.TempDir(), "audit.html")
	if code, _, errOut := runArgs("check", n1Mesh, "--report", path); code != exitFail {
		t.Fatalf("exit %d, stderr %q", code, errOut)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	doc := string(b)
	for _, want := range []string{
		"<h3>Scenarios</h3>",
		"<li>as drawn: every element in service, every switch as normally operated</li>",
		"N-1: 2 outages left out because they leave part of the network with no source: TB-DE out, TB-T out",
		"<th>scenario</th>",
		"<td>TB-AB out</td>",
	} {
		if !strings.Contains(doc, want) {
			t.Errorf("the report lacks %q", want)
		}
	}
}

// TestScenariosNamedHeaderNamesOnlyThose: with --scenarios NAMES the
// table of the worst findings says it is over the scenarios checked and
// lists only those.
func TestScenariosNamedHeaderNamesOnlyThose(t *testing.T) {
	_, out, _ := runArgs("check", n1Mesh, "--scenarios", "TB-AB out")
	_, worst, ok := strings.Cut(out, "\n=== the scenarios above: the worst finding of each check, device and stage ===\n")
	if !ok {
		t.Fatalf("no table of the worst findings over the scenarios checked:\n%s", out)
	}
	if !strings.Contains(worst, "scenarios checked, as --scenarios asked") || strings.Contains(worst, "as drawn: every element") {
		t.Errorf("the header does not list only the scenario checked:\n%s", worst)
	}
}

// TestFaultsAndPlotInAScenario: faults and plot take --scenario NAME:
// the fault study and the charts of the study in that configuration,
// the scenario named in their titles; an unknown name exits 2 with a
// "did you mean".
func TestFaultsAndPlotInAScenario(t *testing.T) {
	code, out, errOut := runArgs("faults", n1Mesh, "--scenario", "TB-AB out")
	if code != exitOK || errOut != "" {
		t.Fatalf("faults --scenario: exit %d, stderr %q", code, errOut)
	}
	if !strings.HasPrefix(out, "tripgrade fault study: Tolbury 33/11 kV (N-1 sweep), scenario TB-AB out (line TB-AB out of service)\n") {
		t.Errorf("the title does not name the scenario:\n%.200s", out)
	}
	if strings.Contains(out, "\nA-AB ") {
		t.Errorf("A-AB, on the line out of service, is still in the fault study")
	}
	_, drawn, _ := runArgs("faults", n1Mesh, "--scenario", "as drawn")
	if _, plain, _ := runArgs("faults", n1Mesh); drawn != plain || !strings.Contains(plain, "\nA-AB ") {
		t.Errorf("--scenario \"as drawn\" differs from the plain fault study")
	}
	code, _, errOut = runArgs("faults", n1Mesh, "--scenario", "TB-AB ot")
	if code != exitUsage || !strings.Contains(errOut, `did you mean "TB-AB out"?`) {
		t.Errorf("unknown scenario: exit %d, stderr %q", code, errOut)
	}
	file := filepath.Join(t.TempDir(), "t-hv.png")
	code, out, errOut = runArgs("plot", n1Mesh, "--scenario", "TB-CA out", "--device", "T-HV", "--out", file)
	if code != exitOK || errOut != "" || out == "" {
		t.Fatalf("plot --scenario: exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	for _, f := range strings.Fields(out) {
		checkPNG(t, f)
	}
}

// TestAshcombeRingExample: the README's scenario example passes as drawn
// and fails in the scenarios its text names, each failure naming its
// scenario.
func TestAshcombeRingExample(t *testing.T) {
	const ring = "../../testdata/scenarios/ashcombe-ring.toml"
	if code, _, errOut := runArgs("check", ring, "--scenarios", "as drawn"); code != exitOK || errOut != "" {
		t.Fatalf("as drawn: exit %d (want %d), stderr %q", code, exitOK, errOut)
	}
	code, out, _ := runArgs("check", ring, "--format", "json")
	if code != exitFail {
		t.Fatalf("every scenario: exit %d, want %d", code, exitFail)
	}
	var doc struct {
		Findings []struct {
			Check, Verdict, Device, Other, Scenario string
		} `json:"findings"`
		Notes []string `json:"scenario_notes"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, f := range doc.Findings {
		if f.Verdict == "FAIL" {
			other := f.Other
			if f.Check == "clearing" {
				other = "" // the element alone
			}
			got[f.Check+" "+f.Device+" "+other] = f.Scenario
		}
	}
	for key, scenario := range map[string]string{
		"grading BB-F1 BB-T1-LV": "BB-T2 out",                // the remaining incomer's earth-fault stage
		"grading CW-T1-HV BB-BC": "CA-OHL out",               // the ring open: BB-BC feeds Corrow alone
		"clearing BB-33 ":        "Corrow load on Bellbrook", // the 11 kV tie feeds 33 kV faults
		"grading CW-F1 BB-F1":    "Corrow load on Bellbrook",
	} {
		if got[key] != scenario {
			t.Errorf("%s: worst failure in %q, want %q", key, got[key], scenario)
		}
	}
	if len(doc.Notes) != 3 || !strings.Contains(doc.Notes[2], "BF2-CABLE out, BF2-OHL out") {
		t.Errorf("sweep notes %q", doc.Notes)
	}
}

// TestTimeLeft: the progress line's estimate is the remaining share of the
// time so far, in seconds, minutes or hours, and is left out until three
// configurations are done and once all are.
func TestTimeLeft(t *testing.T) {
	for _, c := range []struct {
		elapsed     time.Duration
		done, total int
		want        string
	}{
		{10 * time.Second, 2, 100, ""},
		{10 * time.Second, 100, 100, ""},
		{10 * time.Second, 5, 20, ", about 30 s left"},
		{30 * time.Second, 10, 700, ", about 35 min left"},
		{60 * time.Second, 10, 700, ", about 1.1 h left"},
		{600 * time.Second, 10, 700, ", about 11.5 h left"},
	} {
		if got := timeLeft(c.elapsed, c.done, c.total); got != c.want {
			t.Errorf("timeLeft(%v, %d, %d) = %q, want %q", c.elapsed, c.done, c.total, got, c.want)
		}
	}
}
