package gen

import (
	"sort"
	"strings"
)

// closest returns the candidate nearest to word, for a "did you mean"
// hint after a name was not found. Names are compared ignoring case, by
// edit distance: insertions, deletions, substitutions and swaps of two
// adjacent letters each count one. A candidate is close enough when its
// distance is at most max(2, len(word)/3) and below len(word), so a short
// word is not matched to an unrelated short name. Ties go to the
// candidate that also differs least in case, then to the first in
// sorted order. ok is false when no candidate is close enough.
func closest(word string, candidates []string) (best string, ok bool) {
	w := []rune(strings.ToLower(word))
	limit := max(2, len(w)/3)
	limit = min(limit, len(w)-1)
	sorted := append([]string(nil), candidates...)
	sort.Strings(sorted)
	bestDist, bestCase := 0, 0
	for _, c := range sorted {
		d := editDistance(w, []rune(strings.ToLower(c)))
		if d > limit {
			continue
		}
		cd := editDistance([]rune(word), []rune(c))
		if !ok || d < bestDist || d == bestDist && cd < bestCase {
			best, bestDist, bestCase, ok = c, d, cd, true
		}
	}
	return best, ok
}

// editDistance is the optimal string alignment distance between a and b:
// the fewest insertions, deletions, substitutions and adjacent swaps that
// turn a into b, no substring edited twice.
func editDistance(a, b []rune) int {
	// rows i-2, i-1 and i of the (len(a)+1) × (len(b)+1) table
	prev2 := make([]int, len(b)+1)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(b)]
}

// didYouMean returns "; did you mean NAME?" for the candidate closest to
// word, or "" when none is close enough.
func didYouMean(word string, candidates []string) string {
	if c, ok := closest(word, candidates); ok {
		return "; did you mean " + c + "?"
	}
	return ""
}
