// Package numpytest finds the Python interpreter the independent
// cross-checks run with (numpy and scipy from Debian: python3-numpy,
// python3-scipy). It serves tests only.
package numpytest

import (
	"os"
	"os/exec"
	"strings"
	"testing"
)

// Interpreter returns the first interpreter that can import every module
// of imports ("numpy", "scipy.optimize"): $TRIPGRADE_PYTHON, python3 on
// PATH, /usr/bin/python3. Without one the test is skipped, unless
// TRIPGRADE_REQUIRE_PYTHON=1 (as in CI), when it fails; purpose says what
// the interpreter was wanted for.
func Interpreter(t testing.TB, purpose string, imports ...string) string {
	t.Helper()
	var tried []string
	for _, c := range []string{os.Getenv("TRIPGRADE_PYTHON"), "python3", "/usr/bin/python3"} {
		if c == "" {
			continue
		}
		path, err := exec.LookPath(c)
		if err != nil {
			tried = append(tried, c+" (not found)")
			continue
		}
		if err := exec.Command(path, "-c", "import "+strings.Join(imports, ", ")).Run(); err != nil {
			tried = append(tried, path+" (no "+strings.Join(imports, "/")+")")
			continue
		}
		return path
	}
	msg := "no Python interpreter with " + strings.Join(imports, " and ") + " for " + purpose + "; tried " +
		strings.Join(tried, ", ") + "; install the Debian packages (python3-numpy, python3-scipy) or set TRIPGRADE_PYTHON"
	if os.Getenv("TRIPGRADE_REQUIRE_PYTHON") == "1" {
		t.Fatal(msg)
	}
	t.Skip(msg)
	return ""
}
