package main

import (
	"bytes"
	"encoding/json"
	"math"
	"strconv"
	"strings"
	"testing"

	"tripgrade/coord/report"
)

// runCurveArgs runs the subcommand and returns its exit code and output.
func runCurveArgs(args ...string) (int, string, string) {
	var stdout, stderr bytes.Buffer
	code := runCurve(args, &stdout, &stderr)
	return code, stdout.String(), stderr.String()
}

// rows returns the table rows after the header line and the headings and
// before the closing caution, split into fields ("does not operate" kept
// as one field).
func rows(t *testing.T, out string) [][]string {
	t.Helper()
	lines := strings.Split(strings.TrimRight(out, "\n"), "\n")
	if len(lines) < 3 || lines[len(lines)-1] != report.Caution {
		t.Fatalf("output has %d lines and does not end with the caution:\n%s", len(lines), out)
	}
	lines = lines[:len(lines)-1]
	var got [][]string
	for _, l := range lines[2:] {
		f := strings.Fields(strings.Replace(l, "does not operate", "does-not-operate", 1))
		got = append(got, f)
	}
	return got
}

func TestCurveText(t *testing.T) {
	tests := []struct {
		name   string
		args   []string
		header []string
		want   [][3]string // current, multiple, time as printed
		source string
	}{
		{
			name:   "iec-si TMS 1",
			args:   []string{"--shape", "iec-si", "--pickup-a", "100", "--tms", "1", "--current-a", "50,100", "--current-a", "1000"},
			header: []string{"IEC 60255-151 standard inverse (iec-si)", "pickup 100 A", "TMS 1"},
			want:   [][3]string{{"50.00", "0.5000", "does-not-operate"}, {"100.0", "1.000", "does-not-operate"}, {"1000", "10.00", "2.971"}},
			source: "IEC 60255-151:2009 Table 1: standard inverse at 10×, TMS 1 = 2.971 s",
		},
		{
			name:   "ieee-vi TD 1 via --td",
			args:   []string{"--shape", "ieee-vi", "--pickup-a", "200", "--td", "1", "--current-a", "400,2000"},
			header: []string{"ieee-vi", "TD 1"},
			want:   [][3]string{{"400.0", "2.000", "7.028"}, {"2000", "10.00", "0.6891"}},
			source: "IEEE C37.112-2018: very inverse at 2× and 10×, TD 1 = 7.028 s and 0.689 s",
		},
		{
			name:   "iec-user with the very inverse constants",
			args:   []string{"--shape", "iec-user", "--pickup-a", "100", "--tms", "0.5", "--k", "13.5", "--alpha", "1", "--current-a", "1000"},
			header: []string{"iec-user", "k 13.5 s, alpha 1, c 0 s"},
			want:   [][3]string{{"1000", "10.00", "0.7500"}},
			source: "IEC 60255-151:2009 equation: 0.5·13.5/(10 − 1) = 0.75 s",
		},
		{
			name:   "definite",
			args:   []string{"--shape", "definite", "--pickup-a", "400", "--delay-s", "0.3", "--current-a", "400,500"},
			header: []string{"definite time (definite)", "delay 0.3 s"},
			want:   [][3]string{{"400.0", "1.000", "does-not-operate"}, {"500.0", "1.250", "0.3000"}},
			source: "definition: operates above pickup after the delay",
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errOut := runCurveArgs(tc.args...)
			if code != exitOK || errOut != "" {
				t.Fatalf("exit %d, stderr %q", code, errOut)
			}
			first := strings.SplitN(out, "\n", 2)[0]
			for _, h := range tc.header {
				if !strings.Contains(first, h) {
					t.Errorf("header %q lacks %q", first, h)
				}
			}
			for _, heading := range []string{"current (A)", "multiple of pickup", "time (s)"} {
				if !strings.Contains(out, heading) {
					t.Errorf("no heading %q in\n%s", heading, out)
				}
			}
			got := rows(t, out)
			if len(got) != len(tc.want) {
				t.Fatalf("got %d rows, want %d:\n%s", len(got), len(tc.want), out)
			}
			for i, w := range tc.want {
				if len(got[i]) != 3 || got[i][0] != w[0] || got[i][1] != w[1] || got[i][2] != w[2] {
					t.Errorf("row %d: got %v, want %v (%s)", i, got[i], w, tc.source)
				}
			}
		})
	}
}

func TestCurveTableSweep(t *testing.T) {
	code, out, _ := runCurveArgs("--shape", "iec-ei", "--pickup-a", "100", "--tms", "1", "--table")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	got := rows(t, out)
	if len(got) != tableRows {
		t.Fatalf("got %d rows, want %d", len(got), tableRows)
	}
	if got[0][1] != "1.050" || got[len(got)-1][1] != "30.00" {
		t.Errorf("sweep from %s× to %s×, want 1.050× to 30.00×", got[0][1], got[len(got)-1][1])
	}
	// Time falls down the sweep (IEC 60255-151 curves decrease with current).
	prev := math.Inf(1)
	for _, r := range got {
		v, err := strconv.ParseFloat(r[2], 64)
		if err != nil || !(v < prev) {
			t.Errorf("row %v: time not below the previous %v", r, prev)
		}
		prev = v
	}
}

func TestCurveJSON(t *testing.T) {
	code, out, _ := runCurveArgs("--shape", "iec-si", "--pickup-a", "100", "--tms", "1",
		"--current-a", "80,1000", "--format", "json")
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	var doc struct {
		Shape          string   `json:"shape"`
		PickupA        float64  `json:"pickup_a"`
		MultiplierName string   `json:"multiplier_name"`
		Multiplier     *float64 `json:"multiplier"`
		Law            *struct {
			AS float64 `json:"a_s"`
			P  float64 `json:"p"`
		} `json:"law"`
		Points []struct {
			CurrentA         float64  `json:"current_a"`
			MultipleOfPickup float64  `json:"multiple_of_pickup"`
			Status           string   `json:"status"`
			TimeS            *float64 `json:"time_s"`
		} `json:"points"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("%v in\n%s", err, out)
	}
	if doc.Shape != "iec-si" || doc.PickupA != 100 || doc.MultiplierName != "TMS" || doc.Multiplier == nil || *doc.Multiplier != 1 {
		t.Errorf("settings %+v", doc)
	}
	if doc.Law == nil || doc.Law.AS != 0.14 || doc.Law.P != 0.02 {
		t.Errorf("law %+v, want k 0.14 s, alpha 0.02 (IEC 60255-151:2009 Table 1)", doc.Law)
	}
	if len(doc.Points) != 2 {
		t.Fatalf("got %d points", len(doc.Points))
	}
	below, at10 := doc.Points[0], doc.Points[1]
	if below.Status != "does not operate" || below.TimeS != nil {
		t.Errorf("below pickup: %+v", below)
	}
	// IEC 60255-151:2009 Table 1: 2.971 s, printed to 3 decimals.
	if at10.TimeS == nil || math.Abs(*at10.TimeS-2.971) > 0.0005 || at10.MultipleOfPickup != 10 || at10.Status != "operates" {
		t.Errorf("at 10×: %+v", at10)
	}
}

func TestCurveErrors(t *testing.T) {
	base := []string{"--pickup-a", "100", "--current-a", "1000"}
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"unknown shape", append([]string{"--shape", "iec-normal", "--tms", "1"}, base...), `unknown shape "iec-normal" (accepted: iec-si`},
		{"no shape", []string{"--pickup-a", "100", "--current-a", "1"}, "--shape is required"},
		{"no pickup", []string{"--shape", "iec-si", "--tms", "1", "--current-a", "1"}, "--pickup-a is required"},
		{"negative pickup", []string{"--shape", "iec-si", "--tms", "1", "--pickup-a", "-5", "--current-a", "1"}, "pickup must be > 0 A (got -5)"},
		{"zero pickup", []string{"--shape", "definite", "--delay-s", "1", "--pickup-a", "0", "--current-a", "1"}, "pickup must be > 0 A (got 0)"},
		{"negative TMS", append([]string{"--shape", "iec-si", "--tms", "-0.1"}, base...), "TMS must be > 0 (got -0.1)"},
		{"NaN TD", append([]string{"--shape", "ieee-mi", "--td", "NaN"}, base...), "TD must be a finite number (got NaN)"},
		{"missing TMS", append([]string{"--shape", "iec-vi"}, base...), "--tms (or --td) is required"},
		{"both TMS and TD", append([]string{"--shape", "iec-vi", "--tms", "1", "--td", "1"}, base...), "not both"},
		{"NaN current", []string{"--shape", "iec-si", "--tms", "1", "--pickup-a", "100", "--current-a", "NaN"}, "current must be a finite number >= 0 A (got NaN)"},
		{"negative current", []string{"--shape", "iec-si", "--tms", "1", "--pickup-a", "100", "--current-a", "5,-3"}, "(got -3)"},
		{"no currents", []string{"--shape", "iec-si", "--tms", "1", "--pickup-a", "100"}, "give --current-a or --table"},
		{"bad format", append([]string{"--shape", "iec-si", "--tms", "1", "--format", "xml"}, base...), "--format must be text or json"},
		{"unknown flag", append([]string{"--shape", "iec-si", "--tms", "1", "--speed", "3"}, base...), "unknown flag: --speed"},
		{"not a number", append([]string{"--shape", "iec-si", "--tms", "one"}, base...), `invalid argument "one"`},
		{"definite without delay", append([]string{"--shape", "definite"}, base...), "--delay-s is required"},
		{"delay on inverse", append([]string{"--shape", "iec-si", "--tms", "1", "--delay-s", "0.2"}, base...), "delay does not apply to the iec-si shape"},
		{"iec constant on a standard shape", append([]string{"--shape", "iec-si", "--tms", "1", "--k", "2"}, base...), "--k belongs to the iec-user shape"},
		{"ieee constant on iec-user", append([]string{"--shape", "iec-user", "--tms", "1", "--k", "2", "--alpha", "1", "--p", "2"}, base...), "--p belongs to the ieee-user shape"},
		{"iec-user without alpha", append([]string{"--shape", "iec-user", "--tms", "1", "--k", "2"}, base...), "--alpha is required"},
		{"ieee-user bad constant", append([]string{"--shape", "ieee-user", "--td", "1", "--a", "-2", "--p", "2"}, base...), "A must be > 0 s (got -2)"},
		{"stray argument", append([]string{"--shape", "iec-si", "--tms", "1", "extra"}, base...), `unexpected argument "extra"`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errOut := runCurveArgs(tc.args...)
			if code != exitUsage {
				t.Errorf("exit %d, want %d", code, exitUsage)
			}
			if out != "" {
				t.Errorf("stdout %q, want nothing", out)
			}
			if strings.Count(errOut, "\n") != 1 || !strings.HasSuffix(errOut, "\n") {
				t.Errorf("stderr is not one line: %q", errOut)
			}
			if !strings.Contains(errOut, tc.want) {
				t.Errorf("stderr %q does not contain %q", errOut, tc.want)
			}
		})
	}
}

func TestCurveHelp(t *testing.T) {
	code, out, errOut := runCurveArgs("--help")
	if code != exitOK || errOut != "" {
		t.Fatalf("exit %d, stderr %q", code, errOut)
	}
	for _, w := range []string{"--shape", "--pickup-a", "--tms", "--current-a", "--table", "--format", "iec-lti", "ieee-user", "--alpha"} {
		if !strings.Contains(out, w) {
			t.Errorf("help lacks %q", w)
		}
	}
}

func TestRunDispatchesCurve(t *testing.T) {
	var stdout, stderr bytes.Buffer
	code := run([]string{"curve", "--shape", "iec-vi", "--pickup-a", "100", "--tms", "1", "--current-a", "1000"}, &stdout, &stderr)
	// IEC 60255-151:2009 Table 1: very inverse at 10×, TMS 1 = 1.500 s.
	if code != exitOK || !strings.Contains(stdout.String(), "1.500") {
		t.Errorf("exit %d, output %q, stderr %q", code, stdout.String(), stderr.String())
	}
}

func TestSig(t *testing.T) {
	tests := []struct {
		v    float64
		want string
	}{
		{2.9706, "2.971"}, {10.029, "10.03"}, {0.20050, "0.2005"}, {12345.6, "12346"}, {0, "0"}, {0.000012345, "0.000012"},
		{1e300, "1e+300"}, {12345678, "1.235e+07"}, {6.3e-9, "6.3e-09"}, {-2.5e7, "-2.5e+07"},
	}
	for _, tc := range tests {
		if got := sig(tc.v); got != tc.want {
			t.Errorf("sig(%v) = %q, want %q", tc.v, got, tc.want)
		}
	}
}
