package study

import (
	"fmt"
	"sort"
	"strings"
	"unicode/utf8"
)

// Closest returns the name in names nearest to want, ignoring case, when
// it is near enough to be a slip of the keyboard: at most a third of want's
// length in single-character edits (at least one). Ties go to the earlier
// name; "" when none is near.
func Closest(want string, names []string) string {
	n := utf8.RuneCountInString(want)
	if n > maxSuggestRunes {
		return "" // no one mistypes a name that long; and the search would be slow
	}
	limit := max(1, n/3)
	best, bestD := "", limit+1
	w := strings.ToLower(want)
	for _, name := range names {
		m := utf8.RuneCountInString(name)
		if m > maxSuggestRunes || m-n > limit || n-m > limit {
			continue // too far apart in length to be near
		}
		if d := editDistance(w, strings.ToLower(name)); d < bestD {
			best, bestD = name, d
		}
	}
	return best
}

// maxSuggestRunes is the longest name "did you mean" considers.
const maxSuggestRunes = 64

// suggest proposes the known name closest to an unknown one, as a
// message suffix.
func suggest(name string, known map[string]int) string {
	names := make([]string, 0, len(known))
	for k := range known {
		names = append(names, k)
	}
	sort.Strings(names) // ties go to the first in order, whatever the map's
	if c := Closest(name, names); c != "" {
		return fmt.Sprintf(" (did you mean %q?)", c)
	}
	return ""
}

// editDistance is the number of single-rune insertions, deletions,
// substitutions and swaps of neighbours that turn a into b (the optimal
// string alignment distance: Levenshtein's, with a swapped pair such as
// "tsm" for "tms" counted as one slip of the keyboard).
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev2 := make([]int, len(rb)+1)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(rb)]
}
