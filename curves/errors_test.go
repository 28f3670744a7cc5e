package curves_test

import (
	"errors"
	"math"
	"testing"

	"tripgrade/curves"
)

func TestSettingErrorMessage(t *testing.T) {
	tests := []struct {
		err  curves.SettingError
		want string
	}{
		{curves.SettingError{Setting: "pickup", Rule: "> 0", Unit: "A", Value: -5}, "pickup must be > 0 A (got -5)"},
		{curves.SettingError{Setting: "TMS", Rule: "> 0", Value: 0}, "TMS must be > 0 (got 0)"},
		{curves.SettingError{Setting: "delay", Rule: "a finite number", Value: math.NaN()}, "delay must be a finite number (got NaN)"},
	}
	for _, tc := range tests {
		if got := tc.err.Error(); got != tc.want {
			t.Errorf("got %q, want %q", got, tc.want)
		}
	}
}

func TestSettingErrorsUnwrap(t *testing.T) {
	_, err := curves.NewDefiniteTime(-1, -1)
	var list curves.SettingErrors
	if !errors.As(err, &list) || len(list) != 2 {
		t.Fatalf("error %v is not a list of two", err)
	}
	if want := "pickup must be > 0 A (got -1); delay must be >= 0 s (got -1)"; err.Error() != want {
		t.Errorf("got %q, want %q", err.Error(), want)
	}
	var se *curves.SettingError
	if !errors.As(err, &se) || se.Setting != "pickup" {
		t.Errorf("errors.As found %+v", se)
	}
}
