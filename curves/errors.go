package curves

import (
	"math"
	"strconv"
	"strings"
)

// A SettingError reports one setting whose value is not allowed, in the
// form "pickup must be > 0 A (got -5)".
type SettingError struct {
	Setting string  // the setting as the user knows it, e.g. "pickup"
	Rule    string  // what the value must be, e.g. "> 0"
	Unit    string  // unit printed after the rule, e.g. "A"; empty for pure numbers
	Value   float64 // the rejected value
}

// Error implements the error interface.
func (e *SettingError) Error() string {
	var b strings.Builder
	b.WriteString(e.Setting)
	b.WriteString(" must be ")
	b.WriteString(e.Rule)
	if e.Unit != "" {
		b.WriteString(" ")
		b.WriteString(e.Unit)
	}
	b.WriteString(" (got ")
	b.WriteString(formatValue(e.Value))
	b.WriteString(")")
	return b.String()
}

// SettingErrors collects every problem found in one set of settings, so a
// user can fix them all at once. Error joins them on one line with "; ";
// errors.As and errors.Is see each member.
type SettingErrors []error

// Error implements the error interface.
func (l SettingErrors) Error() string {
	parts := make([]string, len(l))
	for i, err := range l {
		parts[i] = err.Error()
	}
	return strings.Join(parts, "; ")
}

// Unwrap returns the members, for errors.Is and errors.As.
func (l SettingErrors) Unwrap() []error { return l }

// formatValue prints a value the way a user would type it.
func formatValue(v float64) string {
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// checker accumulates setting errors while a constructor validates its
// arguments.
type checker struct {
	errs SettingErrors
}

func (c *checker) add(err error) {
	if err == nil {
		return
	}
	if list, ok := err.(SettingErrors); ok {
		c.errs = append(c.errs, list...)
		return
	}
	c.errs = append(c.errs, err)
}

func (c *checker) fail(setting, rule, unit string, v float64) {
	c.errs = append(c.errs, &SettingError{Setting: setting, Rule: rule, Unit: unit, Value: v})
}

// finite reports whether v is a usable number and records an error if not.
func (c *checker) finite(setting string, v float64) bool {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		c.fail(setting, "a finite number", "", v)
		return false
	}
	return true
}

// positive requires a finite v > 0.
func (c *checker) positive(setting, unit string, v float64) {
	if c.finite(setting, v) && !(v > 0) {
		c.fail(setting, "> 0", unit, v)
	}
}

// nonNegative requires a finite v >= 0.
func (c *checker) nonNegative(setting, unit string, v float64) {
	if c.finite(setting, v) && v < 0 {
		c.fail(setting, ">= 0", unit, v)
	}
}

// err returns nil, the single error, or all of them.
func (c *checker) err() error {
	switch len(c.errs) {
	case 0:
		return nil
	case 1:
		return c.errs[0]
	}
	return c.errs
}
