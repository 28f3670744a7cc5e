package tcc

import (
	"strings"
	"testing"
)

func TestSanitise(t *testing.T) {
	cases := []struct {
		name, in, want string
	}{
		{"plain", "F1", "F1"},
		{"hyphens and dots kept", "T1-LV.a", "T1-LV.a"},
		{"parent folder", "../x", "__x"},
		{"dot-dot alone", "..", "_"},
		{"slash", "a/b", "a_b"},
		{"backslash", `a\b`, "a_b"},
		{"absolute path", "/etc/passwd", "_etc_passwd"},
		{"windows device", "con", "con_"},
		{"windows device any case with extension", "NUL.txt", "NUL_.txt"},
		{"windows device inside a longer name", "console", "console"},
		{"spaces", "Mill Lane  incomer", "Mill_Lane_incomer"},
		{"unicode", "Überlandwerk Süd", "_berlandwerk_S_d"},
		{"control characters", "F1\x00\n\tx", "F1_x"},
		{"empty", "", "unnamed"},
		{"only dots", "...", "_"},
		{"leading dot", ".hidden", "_hidden"},
		{"leading dash", "-rf", "_rf"},
		{"trailing dots", "F1..", "F1_"},
		{"trailing dot", "F1.", "F1"},
		{"colon and star", "A:B*C?", "A_B_C_"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := Sanitise(tc.in)
			if got != tc.want {
				t.Errorf("Sanitise(%q) = %q, want %q", tc.in, got, tc.want)
			}
			if again := Sanitise(tc.in); again != got {
				t.Errorf("Sanitise(%q) not deterministic: %q then %q", tc.in, got, again)
			}
			if Sanitise(got) != got {
				t.Errorf("Sanitise(%q) = %q is not a fixed point", tc.in, got)
			}
		})
	}
}

// TestSanitiseIsSafe checks the promises on every result, for names built
// to break them.
func TestSanitiseIsSafe(t *testing.T) {
	hostile := []string{"../x", "a/b", "con", "Con.PNG", " ", "\u202e", "名前", "a\x7fb", "..a..b..",
		strings.Repeat("x", 1000), strings.Repeat("é", 300), ".", "-", "a/../../b", "lpt9", "com1.tar.gz"}
	for _, in := range hostile {
		s := Sanitise(in)
		switch {
		case s == "", len(s) > MaxStemLen:
			t.Errorf("Sanitise(%q) = %q: empty or longer than %d", in, s, MaxStemLen)
		case strings.Contains(s, ".."), strings.ContainsAny(s, `/\`):
			t.Errorf("Sanitise(%q) = %q holds a path separator or ..", in, s)
		case s[0] == '.' || s[0] == '-':
			t.Errorf("Sanitise(%q) = %q starts with %q", in, s, s[0])
		case strings.HasSuffix(s, "."):
			t.Errorf("Sanitise(%q) = %q ends with a dot", in, s)
		}
		for _, r := range s {
			if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '.' || r == '_' || r == '-') {
				t.Errorf("Sanitise(%q) = %q holds %q", in, s, r)
			}
		}
		base, _, _ := strings.Cut(s, ".")
		if reservedStems[strings.ToLower(base)] {
			t.Errorf("Sanitise(%q) = %q is a reserved device name", in, s)
		}
	}
}

func TestNamerUnique(t *testing.T) {
	// "a/b" and "a b" both sanitise to a_b; case-only differences collide
	// on case-insensitive file systems.
	in := []string{"a/b", "a b", "A_B", "a_b-2", "c", "a/b"}
	want := []string{"a_b", "a_b-2", "A_B-3", "a_b-2-2", "c", "a_b-4"}
	for run := 0; run < 2; run++ {
		var n Namer
		for i, s := range in {
			if got := n.Unique(Sanitise(s)); got != want[i] {
				t.Errorf("run %d: name %d (%q): got %q, want %q", run, i, s, got, want[i])
			}
		}
	}
}

func TestStems(t *testing.T) {
	if got := pathStem([]string{"ML-LV FUSE", "F1", "T1/HV"}); got != "path-ML-LV_FUSE--F1--T1_HV" {
		t.Errorf("pathStem = %q", got)
	}
	if got := pairStem("../R11", "R33"); got != "pair-__R11-under-R33" {
		t.Errorf("pairStem = %q", got)
	}
	long := make([]string, 12)
	for i := range long {
		long[i] = strings.Repeat(string(rune('A'+i)), 20)
	}
	got := pathStem(long)
	want := "path-" + long[0] + "--10-more--" + long[11]
	if got != want {
		t.Errorf("long pathStem = %q, want %q", got, want)
	}
	if huge := pathStem([]string{strings.Repeat("x", 500)}); len(huge) > MaxStemLen {
		t.Errorf("pathStem of a 500-character name is %d long", len(huge))
	}
}
