package report

import (
	"crypto/sha256"
	"encoding/base64"
	"html/template"
	"io"
	"sort"
	"strings"

	"tripgrade/coord"
)

// Audit is everything the HTML audit report holds: the findings, where
// they came from, and the charts they are drawn on.
type Audit struct {
	Findings *Findings
	// Version is the tool's version, Date when the report was made (as
	// text, so that the caller decides the clock).
	Version, Date string
	// Inputs are the files the study was read from, with their digests.
	Inputs []coord.InputFile
	// Charts are the time–current charts as PNG images, in order, and
	// ChartsLeftOut counts the study's charts not embedded.
	Charts        []Chart
	ChartsLeftOut int
	// ChartOf names, for each of Findings.Rows, the chart its figure is
	// drawn on ("" for none).
	ChartOf []string
	// Gate says what decides the exit status when it is not simply "any
	// FAIL" (check --fail-on new); empty otherwise.
	Gate string
}

// Chart is one time–current chart embedded in the report.
type Chart struct {
	Name, Subtitle string // Name is safe in a file name and an HTML id
	PNG            []byte
}

// reportCSS is the report's only style sheet. The Content-Security-Policy
// admits exactly this text by its SHA-256, so it must stay a constant.
const reportCSS = `
body{font-family:"DejaVu Sans","Liberation Sans",Arial,Helvetica,sans-serif;color:#111;margin:1.5em auto;max-width:1100px;padding:0 1em;font-size:14px;line-height:1.35}
h1{font-size:1.5em;margin:.2em 0}h2{font-size:1.2em;margin:1.4em 0 .4em;border-bottom:1px solid #999}h3{font-size:1.05em;margin:1em 0 .3em}
table{border-collapse:collapse;width:100%;margin:.3em 0 .8em}th,td{border:1px solid #bbb;padding:2px 5px;text-align:left;vertical-align:top}
th{background:#eee}td.num{text-align:right;white-space:nowrap}code,.hash{font-family:"DejaVu Sans Mono","Liberation Mono",monospace;font-size:.85em;word-break:break-all}
.caution{border:2px solid #b00;background:#fff4f4;padding:.5em .8em;font-weight:bold}
.verdict{font-weight:bold;white-space:nowrap}.fail .verdict{color:#b00}.accepted .verdict{color:#8a5a00}.warn .verdict{color:#8a5a00}.pass .verdict{color:#0a6}
tr.fail{background:#fde8e8}tr.accepted{background:#fdf5e0}tr.warn{background:#fffbe8}
.summary{font-size:1.15em;font-weight:bold}figure{margin:1em 0;break-inside:avoid;page-break-inside:avoid}figure img{width:100%;height:auto;border:1px solid #ccc}
figcaption{font-size:.9em;color:#333}.small{font-size:.85em;color:#333}
@page{margin:12mm}
@media print{body{max-width:none;margin:0;padding:0;font-size:8.5pt}a{color:inherit;text-decoration:none}tr,figure{break-inside:avoid;page-break-inside:avoid}h2{break-after:avoid;page-break-after:avoid}.charts figure{break-before:page;page-break-before:always}}
`

// contentSecurityPolicy forbids every external load, every script (and so
// every inline event handler) and every style but reportCSS; images come
// only from data: URIs inside the file.
func contentSecurityPolicy() string {
	sum := sha256.Sum256([]byte(reportCSS))
	return "default-src 'none'; img-src data:; style-src 'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) +
		"'; script-src 'none'; base-uri 'none'; form-action 'none'"
}

var auditTemplate = template.Must(template.New("audit").Funcs(template.FuncMap{
	"lower": strings.ToLower,
}).Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="{{.CSP}}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Coordination audit: {{.F.Study}}</title>
<style>` + reportCSS + `</style>
</head>
<body>
<h1>Coordination audit: {{.F.Study}}</h1>
<p class="caution">{{.Caution}}</p>
<p class="summary" id="verdict">{{.F.Verdict}}</p>
{{- with .Gate}}<p class="summary">{{.}}</p>{{end}}

<h2>What was checked</h2>
<table>
<tr><th>study</th><td>{{.F.Study}}</td></tr>
<tr><th>tool</th><td>tripgrade {{.Version}}</td></tr>
<tr><th>date</th><td>{{.Date}}</td></tr>
</table>
<table>
<tr><th>input file</th><th>SHA-256</th></tr>
{{- range .Inputs}}
<tr><td>{{.Name}}</td><td class="hash">{{.SHA256}}</td></tr>
{{- end}}
</table>
{{- with .Scope}}
<h3>Scope</h3>
<ul>{{range .}}<li>{{.}}</li>{{end}}</ul>
{{- end}}
<h3>Cases</h3>
<ul>{{range .F.Cases}}<li>{{.}}</li>{{end}}</ul>
<h3>Criteria</h3>
<ul>{{range .F.Criteria}}<li>{{.}}</li>{{end}}</ul>
{{- with .Scenarios}}
<h3>Scenarios</h3>
<p>Each finding is the worst of its check, device and stage over these operating configurations, and names the one it comes from.</p>
<ul>{{range .}}<li>{{.}}</li>{{end}}</ul>
{{- end}}
{{- with .F.Notes}}
<h3>Assumed in reading the input</h3>
<ul>{{range .}}<li>{{.}}</li>{{end}}</ul>
{{- end}}
<h3>Backup pairs (upstream → downstream)</h3>
<ul>
{{- range .F.Pairs}}<li>{{.Upstream}} → {{.Downstream}}{{if .Manual}} (added by [[pair]]){{end}}{{with .Scenario}} (in scenario {{.}}){{end}}</li>{{else}}<li>none</li>{{end}}
{{- range .F.Excluded}}<li>excluded by [[pair]]: {{.Upstream}} → {{.Downstream}}</li>{{end}}
</ul>

<h2>Acceptances</h2>
{{- if .F.Acceptances}}
<table>
<tr><th>check</th><th>device</th><th>other</th><th>stage</th><th>reason</th><th>accepted by</th><th>date</th></tr>
{{- range .F.Acceptances}}
<tr><td>{{.Check}}</td><td>{{.Device}}</td><td>{{.Other}}</td><td>{{.Stage}}</td><td>{{.Reason}}</td><td>{{.By}}</td><td>{{.Date}}</td></tr>
{{- end}}
</table>
{{- else}}
<p>The study accepts no finding.</p>
{{- end}}
{{- with .Baseline}}

<h2>Compared with baseline {{.File}}</h2>
<p>{{.Summary}}</p>
{{- if .Rows}}
<table>
<tr><th>change</th><th>check</th><th>device</th><th>other</th><th>stage</th><th>verdict</th><th>margin</th></tr>
{{- range .Rows}}
<tr><td>{{.Kind}}</td><td>{{.Check}}</td><td>{{.Device}}</td><td>{{.Other}}</td><td>{{.Stage}}</td><td>{{.Verdict}}</td><td class="num">{{.Margin}}</td></tr>
{{- end}}
</table>
{{- end}}
{{- end}}

<h2>Findings</h2>
<p class="small">Failing rows first in each table. Figures are in the unit of the check; the fault is the one behind the figure.</p>
{{- range .Groups}}
<h3>{{.Title}}</h3>
<table>
<tr><th>verdict</th><th>{{.Subject}}</th>{{if .With}}<th>{{.With}}</th>{{end}}<th>stage</th><th>measured</th><th>required</th><th>margin</th>{{if $.ByScenario}}<th>scenario</th>{{end}}<th>fault</th><th>detail</th><th>note</th><th>chart</th></tr>
{{- range .Rows}}
<tr class="{{.Class}}"><td class="verdict">{{.Verdict}}</td><td>{{.Device}}</td>{{if .HasOther}}<td>{{.Other}}</td>{{end}}<td>{{.Stage}}</td><td class="num">{{.Measured}}</td><td class="num">{{.Required}}</td><td class="num">{{.Margin}}</td>{{if $.ByScenario}}<td>{{.Scenario}}</td>{{end}}<td>{{.Fault}}</td><td>{{.Detail}}</td><td>{{.Note}}{{with .Accepted}}<br><strong>{{.}}</strong>{{end}}</td><td>{{if .Chart}}<a href="#chart-{{.Chart}}">chart</a>{{end}}</td></tr>
{{- end}}
</table>
{{- end}}

<h2>Time–current charts</h2>
<div class="charts">
{{- range .Charts}}
<figure id="chart-{{.Name}}">
<img src="{{.Src}}" alt="time–current chart {{.Subtitle}}">
<figcaption>{{.Name}}: {{.Subtitle}}</figcaption>
</figure>
{{- else}}
<p>No chart: the study has no coordination path.</p>
{{- end}}
</div>
{{- with .LeftOut}}
<p>{{.}} more chart(s) of this study are not embedded, to keep the report a file one can open and mail; <code>tripgrade check STUDY --out DIR</code> writes every chart.</p>
{{- end}}

<p class="caution">{{.Caution}}</p>
</body>
</html>
`))

// htmlRow is one finding as the report's template reads it.
type htmlRow struct {
	Class, Verdict, Device, Other, Stage      string
	Measured, Required, Margin, Fault, Detail string
	Note, Accepted, Chart, Scenario           string
	HasOther                                  bool
}

type htmlGroup struct {
	Title, With, Subject string
	Rows                 []htmlRow
}

type htmlChange struct {
	Kind, Check, Device, Other, Stage, Verdict, Margin string
}

type htmlChart struct {
	Name, Subtitle string
	Src            template.URL
}

// verdictOrder puts failing rows first, then accepted, warning and
// passing ones.
func verdictOrder(v coord.Verdict) int {
	return [...]int{coord.Pass: 3, coord.Warn: 2, coord.Fail: 0, coord.Accepted: 1}[v]
}

// WriteHTML writes the audit report as one self-contained HTML file: no
// external request, no script, every piece of user text escaped by
// html/template, charts embedded as PNG data.
func (a *Audit) WriteHTML(w io.Writer) error {
	f := a.Findings
	data := struct {
		CSP, Caution, Version, Date, Gate string
		F                                 *Findings
		Inputs                            []coord.InputFile
		Scope                             []string
		Baseline                          any
		Groups                            []htmlGroup
		Charts                            []htmlChart
		LeftOut                           int
		Scenarios                         []string
		ByScenario                        bool
	}{LeftOut: a.ChartsLeftOut, CSP: contentSecurityPolicy(), Caution: Caution, Version: a.Version, Date: a.Date, Gate: a.Gate, F: f, Inputs: a.Inputs, Scope: f.Scope.lines(),
		ByScenario: f.Scenarios != nil}
	for _, l := range f.scenarioLines()[min(1, len(f.Scenarios)):] {
		data.Scenarios = append(data.Scenarios, strings.TrimSpace(l))
	}
	if b := f.Baseline; b != nil {
		var rows []htmlChange
		for _, x := range b.changed() {
			s := either(x)
			rows = append(rows, htmlChange{x.Kind.String(), s.Check, s.Device, s.Other, s.Stage, verdictText(x), marginText(x)})
		}
		data.Baseline = struct {
			File, Summary string
			Rows          []htmlChange
		}{b.File, b.Summary(), rows}
	}
	for _, g := range f.groupRefs() {
		c := f.Rows[g[0]].Finding.Check
		hg := htmlGroup{Title: strings.ToUpper(c.String()[:1]) + c.String()[1:], With: withHeading(c), Subject: subjectHeading(c)}
		sort.SliceStable(g, func(i, j int) bool {
			return verdictOrder(f.Rows[g[i]].Finding.Verdict) < verdictOrder(f.Rows[g[j]].Finding.Verdict)
		})
		for _, k := range g {
			r := f.Rows[k]
			x := r.Finding
			hr := htmlRow{Class: strings.ToLower(x.Verdict.String()), Verdict: x.Verdict.String(), Device: x.Device, Other: x.Other,
				Stage: x.Stage, Measured: r.Measured, Required: r.Required, Margin: r.Margin, Fault: r.Fault, Detail: r.Detail,
				Note: x.Note, HasOther: hg.With != "", Scenario: dash(x.Scenario)}
			if x.Acceptance != nil {
				hr.Accepted = acceptanceText(x.Acceptance)
			}
			if k < len(a.ChartOf) && (x.Verdict == coord.Fail || x.Verdict == coord.Accepted) {
				hr.Chart = a.ChartOf[k]
			}
			hg.Rows = append(hg.Rows, hr)
		}
		data.Groups = append(data.Groups, hg)
	}
	for _, c := range a.Charts {
		data.Charts = append(data.Charts, htmlChart{c.Name, c.Subtitle,
			template.URL("data:image/png;base64," + base64.StdEncoding.EncodeToString(c.PNG))})
	}
	return auditTemplate.Execute(w, data)
}

// groupRefs returns the indices of the rows of each check in report
// order.
func (f *Findings) groupRefs() [][]int {
	var out [][]int
	for _, c := range coord.CheckKinds {
		var g []int
		for i, r := range f.Rows {
			if r.Finding.Check == c {
				g = append(g, i)
			}
		}
		if len(g) > 0 {
			out = append(out, g)
		}
	}
	return out
}
