package load

import (
	"fmt"
	"maps"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"
)

// didYouMean suggests the candidate nearest to name, as `; did you mean
// "conductivity"?`, or returns "" when none is near (Nearest).
func didYouMean(name string, candidates []string) string {
	best := Nearest(name, candidates)
	if best == "" {
		return ""
	}
	return fmt.Sprintf("; did you mean %s?", quoted(best))
}

// Nearest is the candidate nearest to name, or "" when none is near or
// the nearest is name itself. Near means an edit distance (Levenshtein
// 1966: insertions, deletions, substitutions, and here also a swap of two
// neighbouring characters), ignoring case, of at most a third of the
// name's length; names shorter than four characters are only matched when
// they differ in case alone.
func Nearest(name string, candidates []string) string {
	a := []rune(strings.ToLower(name))
	limit := len(a) / 3
	best, bestD := "", limit+1
	var d distance
	for _, c := range candidates {
		if utf8.RuneCountInString(c) < len(a)-limit {
			continue // too short to be within the limit: spares a long name the table
		}
		if n := d.within(a, strings.ToLower(c), bestD-1); n < bestD {
			best, bestD = c, n
		}
	}
	if best == name {
		return ""
	}
	return best
}

// unknown reports at ptr that name is not declared, suggesting the
// nearest declared name; nothing is computed when the problem would not be
// listed.
func (ps *problems) unknown(ptr, name string, index map[string]int) {
	if !ps.open(ptr) {
		return
	}
	if ps.names == nil {
		ps.names = slices.Sorted(maps.Keys(index))
	}
	ps.at(ptr, "%s names no declared variable%s", quoted(name), ps.suggest(name, ps.names))
}

// distance holds the rows of the dynamic-programming table, reused from
// one candidate to the next.
type distance struct {
	t                []rune
	prev2, prev, cur []int
}

// within is the optimal-string-alignment distance between s and b
// (Levenshtein distance with adjacent transpositions) when it is at most
// k, and k+1 otherwise. It fills the table row by row (Wagner & Fischer
// 1974) only in the band of cells within k of the diagonal, and stops at
// a row whose every cell is past k (Ukkonen 1985): a far name costs a
// few rows, not the whole table.
func (d *distance) within(s []rune, b string, k int) int {
	d.t = append(d.t[:0], []rune(b)...)
	t, inf := d.t, k+1
	if len(s)-len(t) > k || len(t)-len(s) > k {
		return inf
	}
	n := len(t) + 1
	d.prev2, d.prev, d.cur = resize(d.prev2, n), resize(d.prev, n), resize(d.cur, n)
	prev2, prev, cur := d.prev2, d.prev, d.cur
	for j := range prev {
		prev[j], prev2[j] = min(j, inf), inf
	}
	for i := 1; i <= len(s); i++ {
		lo, hi := max(1, i-k), min(len(t), i+k)
		best := inf
		cur[0] = min(i, inf)
		if lo > 1 {
			cur[lo-1] = inf
		} else {
			best = cur[0]
		}
		for j := lo; j <= hi; j++ {
			cost := 1
			if s[i-1] == t[j-1] {
				cost = 0
			}
			c := min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && s[i-1] == t[j-2] && s[i-2] == t[j-1] {
				c = min(c, prev2[j-2]+1)
			}
			cur[j] = min(c, inf)
			best = min(best, cur[j])
		}
		if hi < len(t) {
			cur[hi+1] = inf
		}
		if best > k {
			return inf
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(t)]
}

func resize(v []int, n int) []int {
	if cap(v) < n {
		return make([]int, n)
	}
	return v[:n]
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
