package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/spf13/pflag"

	"tripgrade/coord/report"
	"tripgrade/coord/study"
	"tripgrade/curves"
)

// The range and length of the --table sweep, in multiples of pickup: from
// just above pickup, where the curve is steepest, to beyond the 20× where
// IEC 60255-151 dependent-time ranges commonly end.
const (
	tableFromMultiple = 1.05
	tableToMultiple   = 30.0
	tableRows         = 20
)

// curveFlags holds the parsed command line of "tripgrade curve".
type curveFlags struct {
	fs                  *pflag.FlagSet
	shape, format       string
	pickupA, tms, td    float64
	delayS, maxMultiple float64
	minTimeS            float64
	k, alpha, c         float64
	a, b, p, tr         float64
	currentsA           []float64
	table               bool
}

func newCurveFlags() *curveFlags {
	f := &curveFlags{fs: pflag.NewFlagSet("curve", pflag.ContinueOnError)}
	fs := f.fs
	fs.SortFlags = false
	fs.StringVar(&f.shape, "shape", "", "characteristic `NAME` (see the list below)")
	fs.Float64Var(&f.pickupA, "pickup-a", 0, "pickup in primary `amperes`")
	fs.Float64Var(&f.tms, "tms", 0, "`multiplier` of an inverse shape (TMS; the TD of IEEE shapes)")
	fs.Float64Var(&f.td, "td", 0, "alias of --tms, the IEEE name (time `dial`)")
	fs.Float64Var(&f.delayS, "delay-s", 0, "delay of a definite stage, or intentional delay of an instantaneous one, in `seconds`")
	fs.Float64Var(&f.maxMultiple, "max-multiple", 0, "inverse shapes: `multiple` of pickup above which the time stays constant (0 = off; commonly 20)")
	fs.Float64Var(&f.minTimeS, "min-time-s", 0, "inverse shapes: floor on the operating time in `seconds` (0 = off)")
	fs.Float64Var(&f.k, "k", 0, "iec-user: k in `seconds`")
	fs.Float64Var(&f.alpha, "alpha", 0, "iec-user: `exponent` alpha")
	fs.Float64Var(&f.c, "c", 0, "iec-user: constant c in `seconds` (default 0)")
	fs.Float64Var(&f.a, "a", 0, "ieee-user: A in `seconds`")
	fs.Float64Var(&f.b, "b", 0, "ieee-user: B in `seconds` (default 0)")
	fs.Float64Var(&f.p, "p", 0, "ieee-user: `exponent` p")
	fs.Float64Var(&f.tr, "tr", 0, "ieee-user: reset constant tr in `seconds` (default 0, no reset)")
	fs.Float64SliceVar(&f.currentsA, "current-a", nil, "current(s) in primary `amperes`; repeat the flag or give a comma list")
	fs.BoolVar(&f.table, "table", false, fmt.Sprintf("also print %d currents log-spaced from %g× to %g× pickup", tableRows, tableFromMultiple, tableToMultiple))
	fs.StringVar(&f.format, "format", "text", "output `format`: text or json")
	return f
}

func (f *curveFlags) usage(w io.Writer) {
	fmt.Fprintln(w, "usage: tripgrade curve --shape NAME --pickup-a A [settings] (--current-a A[,A...] | --table)")
	fmt.Fprintln(w, "")
	fmt.Fprintln(w, "Prints the operating time of one relay stage at the given currents.")
	fmt.Fprintln(w, "")
	fmt.Fprint(w, f.fs.FlagUsages())
	fmt.Fprintln(w, "")
	fmt.Fprintln(w, "shapes:")
	for _, s := range curves.Shapes() {
		fmt.Fprintf(w, "  %-14s %s\n", s, s.Description())
	}
	fmt.Fprintln(w, "")
	fmt.Fprintln(w, "M is the current over the pickup. Inverse shapes need --tms (or --td).")
	fmt.Fprintln(w, "iec-user needs --k and --alpha: t = TMS·(k/(M^alpha − 1) + c);")
	fmt.Fprintln(w, "ieee-user needs --a and --p: t = TD·(A/(M^p − 1) + B). definite needs --delay-s.")
	fmt.Fprintln(w, "A stage operates only above its pickup; at or below it prints \"does not operate\".")
}

// runCurve is the "curve" subcommand.
func runCurve(args []string, stdout, stderr io.Writer) int {
	f := newCurveFlags()
	f.fs.SetOutput(io.Discard)
	f.fs.Usage = func() {}
	fail := func(err error) int {
		fmt.Fprintf(stderr, "tripgrade curve: %v\n", err)
		return exitUsage
	}
	if err := f.fs.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			f.usage(stdout)
			return exitOK
		}
		return fail(fmt.Errorf("%v; run \"tripgrade curve --help\" for the flags", err))
	}
	if f.fs.NArg() > 0 {
		return fail(fmt.Errorf("unexpected argument %q", f.fs.Arg(0)))
	}
	settings, err := f.stageSettings()
	if err != nil {
		return fail(err)
	}
	stage, err := curves.NewStage(settings)
	if err != nil {
		return fail(err)
	}
	currentsA, err := f.currents()
	if err != nil {
		return fail(err)
	}
	samples := curves.Evaluate(stage, currentsA)
	switch f.format {
	case "text":
		writeCurveText(stdout, settings, samples)
	case "json":
		if err := writeCurveJSON(stdout, settings, samples); err != nil {
			fmt.Fprintf(stderr, "tripgrade curve: %v\n", err)
			return exitUsage
		}
	}
	return exitOK
}

// stageSettings turns the flags into the curves package's settings,
// checking only what the flags themselves mean: which are required for
// the shape and which belong to another shape.
func (f *curveFlags) stageSettings() (curves.StageSettings, error) {
	if f.format != "text" && f.format != "json" {
		return curves.StageSettings{}, fmt.Errorf("--format must be text or json (got %q)", f.format)
	}
	if !f.fs.Changed("shape") {
		return curves.StageSettings{}, errors.New("--shape is required")
	}
	shape, err := curves.ParseShape(f.shape)
	if err != nil {
		return curves.StageSettings{}, err
	}
	if !f.fs.Changed("pickup-a") {
		return curves.StageSettings{}, errors.New("--pickup-a is required")
	}
	s := curves.StageSettings{Shape: shape, PickupA: f.pickupA, DelayS: f.delayS,
		MaxMultiple: f.maxMultiple, MinTimeS: f.minTimeS}
	switch {
	case f.fs.Changed("tms") && f.fs.Changed("td"):
		return s, errors.New("give --tms or --td, not both")
	case f.fs.Changed("td"):
		s.Multiplier = f.td
	default:
		s.Multiplier = f.tms
	}
	if shape.Dependent() && !f.fs.Changed("tms") && !f.fs.Changed("td") {
		return s, fmt.Errorf("--tms (or --td) is required for the %s shape", shape)
	}
	if shape == curves.ShapeDefinite && !f.fs.Changed("delay-s") {
		return s, errors.New("--delay-s is required for the definite shape")
	}
	s.Law, err = f.userLaw(shape)
	if err != nil {
		return s, err
	}
	return s, f.withinLimits()
}

// withinLimits holds the flags to the physical limits of the study file's
// keys of the same meaning, so that a typing slip gives a message instead
// of a 300-digit time.
func (f *curveFlags) withinLimits() error {
	for _, c := range []struct {
		flag, key string
		v         float64
	}{
		{"pickup-a", "pickup_a", f.pickupA}, {"tms", "tms", f.tms}, {"td", "td", f.td},
		{"delay-s", "delay_s", f.delayS}, {"max-multiple", "max_multiple", f.maxMultiple}, {"min-time-s", "min_time_s", f.minTimeS},
		{"k", "k", f.k}, {"alpha", "alpha", f.alpha}, {"a", "a", f.a}, {"p", "p", f.p},
	} {
		if err := study.CheckLimit(c.key, c.v); err != nil {
			return fmt.Errorf("--%s: %v", c.flag, err)
		}
	}
	return nil
}

// userLaw reads the user constants of iec-user and ieee-user and rejects
// constants given for any other shape.
func (f *curveFlags) userLaw(shape curves.Shape) (curves.Law, error) {
	iec, ieee := []string{"k", "alpha", "c"}, []string{"a", "b", "p", "tr"}
	check := func(names []string, owner curves.Shape, required ...string) error {
		for _, n := range names {
			if f.fs.Changed(n) && shape != owner {
				return fmt.Errorf("--%s belongs to the %s shape (shape is %s)", n, owner, shape)
			}
		}
		for _, n := range required {
			if shape == owner && !f.fs.Changed(n) {
				return fmt.Errorf("--%s is required for the %s shape", n, owner)
			}
		}
		return nil
	}
	if err := check(iec, curves.ShapeIECUser, "k", "alpha"); err != nil {
		return curves.Law{}, err
	}
	if err := check(ieee, curves.ShapeIEEEUser, "a", "p"); err != nil {
		return curves.Law{}, err
	}
	switch shape {
	case curves.ShapeIECUser:
		return curves.IECLaw(shape.String(), f.k, f.alpha, f.c)
	case curves.ShapeIEEEUser:
		return curves.IEEELaw(shape.String(), f.a, f.b, f.p, f.tr)
	}
	return curves.Law{}, nil
}

// currents returns the --current-a values followed by the --table sweep.
func (f *curveFlags) currents() ([]float64, error) {
	if len(f.currentsA) == 0 && !f.table {
		return nil, errors.New("give --current-a or --table")
	}
	for _, a := range f.currentsA {
		if math.IsNaN(a) || math.IsInf(a, 0) || a < 0 {
			return nil, fmt.Errorf("current must be a finite number >= 0 A (got %s)", plain(a))
		}
		if err := study.CheckLimit("current_a", a); err != nil {
			return nil, fmt.Errorf("--current-a: %v", err)
		}
		if m := a / f.pickupA; math.IsInf(m, 0) {
			return nil, fmt.Errorf("--current-a %s A is beyond any multiple of the pickup %s A that a number can hold", plain(a), plain(f.pickupA))
		}
	}
	out := append([]float64(nil), f.currentsA...)
	if f.table {
		sweep, err := curves.LogSpace(tableFromMultiple*f.pickupA, tableToMultiple*f.pickupA, tableRows)
		if err != nil {
			return nil, err
		}
		out = append(out, sweep...)
	}
	return out, nil
}

// describeStage is the header line: the characteristic and its settings.
func describeStage(s curves.StageSettings) string {
	parts := []string{"pickup " + plain(s.PickupA) + " A"}
	if s.Shape.Dependent() {
		parts = append(parts, s.Shape.MultiplierName()+" "+plain(s.Multiplier))
		if s.Shape.UserDefined() {
			l := s.Law
			if s.Shape == curves.ShapeIECUser {
				parts = append(parts, fmt.Sprintf("k %s s, alpha %s, c %s s", plain(l.A), plain(l.P), plain(l.B)))
			} else {
				parts = append(parts, fmt.Sprintf("A %s s, B %s s, p %s, tr %s s", plain(l.A), plain(l.B), plain(l.P), plain(l.ResetS)))
			}
		}
		if s.MaxMultiple > 0 {
			parts = append(parts, "definite above "+plain(s.MaxMultiple)+"× pickup")
		}
		if s.MinTimeS > 0 {
			parts = append(parts, "minimum time "+plain(s.MinTimeS)+" s")
		}
	} else if s.Shape == curves.ShapeDefinite || s.DelayS > 0 {
		parts = append(parts, "delay "+plain(s.DelayS)+" s")
	}
	title := s.Shape.Description()
	if title != s.Shape.String() {
		title += " (" + s.Shape.String() + ")"
	}
	return title + ": " + strings.Join(parts, ", ")
}

func writeCurveText(w io.Writer, s curves.StageSettings, samples []curves.Sample) {
	fmt.Fprintln(w, describeStage(s))
	tw := tabwriter.NewWriter(w, 0, 0, 3, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "current (A)\tmultiple of pickup\ttime (s)\t")
	for _, x := range samples {
		timeText := x.Status.String()
		if x.Status == curves.Operates {
			timeText = sig(x.TimeS)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t\n", sig(x.CurrentA), sig(x.CurrentA/s.PickupA), timeText)
	}
	tw.Flush()
	fmt.Fprintln(w, report.Caution)
}

// curveJSON is the JSON form of the output; units are in the field names.
type curveJSON struct {
	Shape          string      `json:"shape"`
	Description    string      `json:"description"`
	PickupA        float64     `json:"pickup_a"`
	MultiplierName string      `json:"multiplier_name,omitempty"`
	Multiplier     *float64    `json:"multiplier,omitempty"`
	DelayS         *float64    `json:"delay_s,omitempty"`
	MaxMultiple    float64     `json:"max_multiple,omitempty"`
	MinTimeS       float64     `json:"min_time_s,omitempty"`
	Law            *lawJSON    `json:"law,omitempty"`
	Points         []pointJSON `json:"points"`
	Caution        string      `json:"caution"`
}

// lawJSON gives an inverse shape's constants in the general form
// t = M·(A/(M^P − 1) + B).
type lawJSON struct {
	AS     float64 `json:"a_s"`
	BS     float64 `json:"b_s"`
	P      float64 `json:"p"`
	ResetS float64 `json:"reset_s"`
}

type pointJSON struct {
	CurrentA         float64  `json:"current_a"`
	MultipleOfPickup float64  `json:"multiple_of_pickup"`
	Status           string   `json:"status"`
	TimeS            *float64 `json:"time_s"` // null unless the stage operates
}

func writeCurveJSON(w io.Writer, s curves.StageSettings, samples []curves.Sample) error {
	out := curveJSON{Shape: s.Shape.String(), Description: s.Shape.Description(), PickupA: s.PickupA,
		MaxMultiple: s.MaxMultiple, MinTimeS: s.MinTimeS, Points: make([]pointJSON, len(samples)), Caution: report.Caution}
	if s.Shape.Dependent() {
		m := s.Multiplier
		out.MultiplierName, out.Multiplier = s.Shape.MultiplierName(), &m
		law, std := s.Shape.Law()
		if !std {
			law = s.Law
		}
		out.Law = &lawJSON{AS: law.A, BS: law.B, P: law.P, ResetS: law.ResetS}
	} else {
		d := s.DelayS
		out.DelayS = &d
	}
	for i, x := range samples {
		p := pointJSON{CurrentA: x.CurrentA, MultipleOfPickup: x.CurrentA / s.PickupA, Status: x.Status.String()}
		if x.Status == curves.Operates {
			t := x.TimeS
			p.TimeS = &t
		}
		out.Points[i] = p
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(out)
}

// plain prints a setting as the user would type it.
func plain(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// sig prints v with four significant digits, in fixed notation and never
// dropping integer digits: 2.971, 10.03, 0.2005, 12346; beyond a million
// or below a millionth, where fixed notation would print a long row of
// digits or nothing but zeros, in exponent form: 1.235e+07.
func sig(v float64) string {
	if v == 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	if a := math.Abs(v); a >= 1e6 || a < 1e-6 {
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	const digits, maxDecimals = 4, 6
	decimals := digits - 1 - int(math.Floor(math.Log10(math.Abs(v))))
	decimals = max(0, min(decimals, maxDecimals))
	return strconv.FormatFloat(v, 'f', decimals, 64)
}
