package missing

import (
	"math"
	"sort"
)

// Pattern is one missingness pattern: which variables are observed, and
// the rows that have it.
type Pattern struct {
	Observed []bool
	Rows     []int
	obs, mis []int
}

// ObservedIndex returns the observed and the missing variables of p.
func (p Pattern) ObservedIndex() (obs, mis []int) { return p.obs, p.mis }

// Patterns groups the rows of cols by missingness pattern, the complete
// pattern first, then by first row.
func Patterns(cols [][]float64) []Pattern {
	n := rows(cols)
	index := map[string]int{}
	var out []Pattern
	key := make([]byte, len(cols))
	for i := range n {
		for j, c := range cols {
			key[j] = '0'
			if !math.IsNaN(c[i]) {
				key[j] = '1'
			}
		}
		k, ok := index[string(key)]
		if !ok {
			pat := Pattern{Observed: make([]bool, len(cols))}
			for j := range cols {
				pat.Observed[j] = key[j] == '1'
				if pat.Observed[j] {
					pat.obs = append(pat.obs, j)
				} else {
					pat.mis = append(pat.mis, j)
				}
			}
			k = len(out)
			index[string(key)] = k
			out = append(out, pat)
		}
		out[k].Rows = append(out[k].Rows, i)
	}
	sort.SliceStable(out, func(a, b int) bool { return complete(out[a]) && !complete(out[b]) })
	return out
}

func complete(p Pattern) bool {
	for _, o := range p.Observed {
		if !o {
			return false
		}
	}
	return true
}

func rows(cols [][]float64) int {
	if len(cols) == 0 {
		return 0
	}
	return len(cols[0])
}

// Summary counts what is missing.
type Summary struct {
	Rows, CompleteRows int
	MissingCells       int
	MissingByVariable  []int
	// RowsByMissing[k] counts the rows with k missing values.
	RowsByMissing []int
	Patterns      int
}

// Summarize counts missing cells per variable, complete rows and patterns.
func Summarize(cols [][]float64) Summary {
	s := Summary{
		Rows:              rows(cols),
		MissingByVariable: make([]int, len(cols)),
		RowsByMissing:     make([]int, len(cols)+1),
	}
	ps := Patterns(cols)
	s.Patterns = len(ps)
	for _, p := range ps {
		if complete(p) {
			s.CompleteRows += len(p.Rows)
		}
		s.RowsByMissing[len(p.mis)] += len(p.Rows)
	}
	for j, c := range cols {
		for _, x := range c {
			if math.IsNaN(x) {
				s.MissingByVariable[j]++
				s.MissingCells++
			}
		}
	}
	return s
}
