package load

import (
	"fmt"
	"maps"
	"slices"
	"strconv"
	"strings"
)

// didYouMean suggests the candidate nearest to name, as `; did you mean
// "conductivity"?`, or returns "" when none is near (Nearest).
func didYouMean(name string, candidates []string) string {
	best := Nearest(name, candidates)
	if best == "" {
		return ""
	}
	return fmt.Sprintf("; did you mean %q?", best)
}

// Nearest is the candidate nearest to name, or "" when none is near or
// the nearest is name itself. Near means an edit distance (Levenshtein
// 1966: insertions, deletions, substitutions, and here also a swap of two
// neighbouring characters), ignoring case, of at most a third of the
// name's length; names shorter than four characters are only matched when
// they differ in case alone.
func Nearest(name string, candidates []string) string {
	limit := len([]rune(name)) / 3
	best, bestD := "", limit+1
	for _, c := range candidates {
		if d := editDistance(strings.ToLower(name), strings.ToLower(c)); d < bestD {
			best, bestD = c, d
		}
	}
	if best == name {
		return ""
	}
	return best
}

// unknownName says that name is not declared, suggesting the nearest
// declared name.
func unknownName(name string, index map[string]int) string {
	return fmt.Sprintf("%q names no declared variable", name) + didYouMean(name, slices.Sorted(maps.Keys(index)))
}

// editDistance is the optimal-string-alignment distance between a and b
// (Levenshtein distance with adjacent transpositions), by rows of the
// dynamic-programming table.
func editDistance(a, b string) int {
	s, t := []rune(a), []rune(b)
	prev2, prev, cur := make([]int, len(t)+1), make([]int, len(t)+1), make([]int, len(t)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(s); i++ {
		cur[0] = i
		for j := 1; j <= len(t); j++ {
			cost := 1
			if s[i-1] == t[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && s[i-1] == t[j-2] && s[i-2] == t[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(t)]
}

// relationApart is the hint for a p-value given with its relation, as
// "<.001": the number, then the relation.
const relationApart = `; write the relation apart from the number: "p_value": %s, "p_relation": %q`

// numberHint says how to write a number given as a string: a p-value
// printed as "<.001" becomes a number and a p_relation.
func numberHint(ptr, str string) string {
	t := strings.TrimSpace(str)
	if strings.HasSuffix(ptr, "/p_value") {
		t = strings.TrimSpace(strings.TrimPrefix(strings.TrimPrefix(t, "p"), "P"))
		for _, rel := range []string{"<", ">", "="} {
			if rest, ok := strings.CutPrefix(t, rel); ok {
				if x, err := strconv.ParseFloat(strings.TrimSpace(rest), 64); err == nil {
					return fmt.Sprintf(relationApart, strconv.FormatFloat(x, 'g', -1, 64), rel)
				}
			}
		}
	}
	if x, err := strconv.ParseFloat(t, 64); err == nil {
		return "; write it without quotes: " + strconv.FormatFloat(x, 'g', -1, 64)
	}
	return ""
}
