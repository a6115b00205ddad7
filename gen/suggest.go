package gen

import (
	"sort"
	"strings"
)

// closest returns the candidate nearest to word in edit distance, ignoring
// case, when it is near enough to be a likely typo: at most
// max(2, len(word)/3) single-character insertions, deletions or
// substitutions (common practice for "did you mean" hints). Ties go to
// the candidate first in sorted order.
func closest(word string, candidates []string) (string, bool) {
	sorted := append([]string(nil), candidates...)
	sort.Strings(sorted)
	limit := len([]rune(word)) / 3
	if limit < 2 {
		limit = 2
	}
	best, bestDistance := "", limit+1
	for _, c := range sorted {
		if c == word {
			continue
		}
		if d := editDistance(strings.ToLower(word), strings.ToLower(c)); d < bestDistance {
			best, bestDistance = c, d
		}
	}
	return best, best != ""
}

// editDistance is the Levenshtein distance between a and b, in runes.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	previous := make([]int, len(rb)+1)
	current := make([]int, len(rb)+1)
	for j := range previous {
		previous[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		current[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			current[j] = min(previous[j]+1, current[j-1]+1, previous[j-1]+cost)
		}
		previous, current = current, previous
	}
	return previous[len(rb)]
}
