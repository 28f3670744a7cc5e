package tcc

import (
	"strconv"
	"strings"
)

// MaxStemLen bounds the length of a file stem made by Sanitise, so that a
// stem plus an extension and a de-duplication suffix stays well inside
// every file system's name limit.
const MaxStemLen = 100

// reservedStems are names Windows reserves for devices in every folder,
// with or without an extension.
var reservedStems = map[string]bool{
	"con": true, "prn": true, "aux": true, "nul": true,
	"com1": true, "com2": true, "com3": true, "com4": true, "com5": true,
	"com6": true, "com7": true, "com8": true, "com9": true,
	"lpt1": true, "lpt2": true, "lpt3": true, "lpt4": true, "lpt5": true,
	"lpt6": true, "lpt7": true, "lpt8": true, "lpt9": true,
}

// Sanitise turns a name from a study file into a safe file stem:
//
//   - ASCII letters, digits, '.', '_' and '-' are kept; every other
//     character (path separators, spaces, control characters, any
//     non-ASCII letter) becomes '_', and a run of them one '_';
//   - a run of two or more dots becomes '_', so ".." never survives;
//   - a leading '.' or '-' (a hidden file, or a name read as a flag)
//     becomes '_', and trailing dots are dropped;
//   - a name Windows reserves ("con", "nul", "com1", ...) gets a trailing
//     '_';
//   - the result is at most MaxStemLen bytes, and "unnamed" when nothing
//     is left.
//
// It is deterministic: the same name always gives the same stem. Two names
// may give the same stem; Namer makes them unique.
func Sanitise(name string) string {
	var b strings.Builder
	replaced := false
	for _, r := range name {
		keep := r < 0x80 && (r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' ||
			r == '.' || r == '_' || r == '-')
		if !keep {
			if !replaced {
				b.WriteByte('_')
			}
			replaced = true
			continue
		}
		replaced = false
		b.WriteRune(r)
	}
	s := collapseDots(b.String())
	s = strings.TrimRight(s, ".")
	if s != "" && (s[0] == '.' || s[0] == '-') {
		s = "_" + s[1:]
	}
	if len(s) > MaxStemLen {
		s = strings.TrimRight(s[:MaxStemLen], ".")
	}
	if s == "" {
		return "unnamed"
	}
	base, _, _ := strings.Cut(s, ".")
	if reservedStems[strings.ToLower(base)] {
		s = base + "_" + s[len(base):]
	}
	return s
}

// collapseDots replaces every run of two or more dots with '_'.
func collapseDots(s string) string {
	if !strings.Contains(s, "..") {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		j := i
		for j < len(s) && s[j] == '.' {
			j++
		}
		switch {
		case j-i >= 2:
			b.WriteByte('_')
			i = j
		case j-i == 1:
			b.WriteByte('.')
			i = j
		default:
			b.WriteByte(s[i])
			i++
		}
	}
	return b.String()
}

// Namer hands out file stems that are unique within one output folder,
// comparing without regard to letter case (as macOS and Windows file
// systems do). The zero value is ready to use.
type Namer struct {
	used map[string]bool
}

// Unique returns stem, or stem with "-2", "-3", ... appended when an
// earlier call already returned it. The same sequence of calls always
// gives the same names.
func (n *Namer) Unique(stem string) string {
	if n.used == nil {
		n.used = map[string]bool{}
	}
	name := stem
	for k := 2; n.used[strings.ToLower(name)]; k++ {
		name = stem + "-" + strconv.Itoa(k)
	}
	n.used[strings.ToLower(name)] = true
	return name
}

// pathStem names a path chart: "path-" and the sanitised device names from
// the downstream end to the source, joined by "--" (device names often
// hold single hyphens). A stem that would be too long keeps the two ends
// and says how many devices lie between.
func pathStem(names []string) string {
	parts := make([]string, len(names))
	for i, n := range names {
		parts[i] = Sanitise(n)
	}
	s := "path-" + strings.Join(parts, "--")
	if len(s) > MaxStemLen && len(parts) > 2 {
		s = "path-" + parts[0] + "--" + strconv.Itoa(len(parts)-2) + "-more--" + parts[len(parts)-1]
	}
	return truncateStem(s)
}

// pairStem names a failing pair's chart: "pair-D-under-U", the downstream
// device D first, as in a path's name.
func pairStem(down, up string) string {
	return truncateStem("pair-" + Sanitise(down) + "-under-" + Sanitise(up))
}

func truncateStem(s string) string {
	if len(s) > MaxStemLen {
		s = strings.TrimRight(s[:MaxStemLen], ".")
	}
	return s
}
