package load

import (
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// Rules for suspect values (common practice, after Tukey's "far out"
// fences: Tukey 1977, Exploratory Data Analysis, ch. 2).
const (
	farOut       = 3  // interquartile ranges beyond a quartile
	minRepeats   = 2  // copies of the same value
	minOthers    = 10 // other observed values needed for quartiles
	maxPerColumn = 3  // values peeled from each end of a column
)

// Suspects finds the values of one column (NaN is missing) that appear at
// least twice and lie more than three interquartile ranges beyond the
// quartiles of the column's other values. It looks from both ends of the
// sorted values, up to three distinct values each, so that two codes
// (−99 and −98) are both found. A column whose other values have no
// spread (an interquartile range of 0) gives none: there is no scale to
// call a value far by.
func Suspects(name string, col []float64) []checks.Suspect {
	if !endsRepeat(col) {
		return nil
	}
	obs := make([]float64, 0, len(col))
	for _, x := range col {
		if !math.IsNaN(x) {
			obs = append(obs, x)
		}
	}
	slices.Sort(obs)
	var out []checks.Suspect
	lo, hi := 0, len(obs)
	for range maxPerColumn {
		s, k, ok := suspectAt(obs, lo, hi, true)
		if !ok {
			break
		}
		out, lo = append(out, named(name, s)), lo+k
	}
	for range maxPerColumn {
		s, k, ok := suspectAt(obs, lo, hi, false)
		if !ok {
			break
		}
		out, hi = append(out, named(name, s)), hi-k
	}
	return out
}

// endsRepeat reports whether the smallest or the largest observed value
// appears more than once: without that no value is suspect, and the
// column need not be sorted.
func endsRepeat(col []float64) bool {
	lo, hi := math.Inf(1), math.Inf(-1)
	nlo, nhi := 0, 0
	for _, x := range col {
		switch {
		case math.IsNaN(x):
			continue
		case x < lo:
			lo, nlo = x, 1
		case x == lo:
			nlo++
		}
		switch {
		case x > hi:
			hi, nhi = x, 1
		case x == hi:
			nhi++
		}
	}
	return nlo >= minRepeats || nhi >= minRepeats
}

// suspectAt tests the lowest (or highest) value of the sorted window
// obs[lo:hi] against the quartiles of the rest of the window, and returns
// it with its number of copies.
func suspectAt(obs []float64, lo, hi int, low bool) (checks.Suspect, int, bool) {
	if hi-lo < minRepeats+minOthers {
		return checks.Suspect{}, 0, false
	}
	v, k := obs[lo], 0
	if !low {
		v = obs[hi-1]
	}
	for k < hi-lo && (low && obs[lo+k] == v || !low && obs[hi-1-k] == v) {
		k++
	}
	rest := obs[lo+k : hi]
	if !low {
		rest = obs[lo : hi-k]
	}
	if k < minRepeats || len(rest) < minOthers {
		return checks.Suspect{}, 0, false
	}
	q1, q3 := quantile7(rest, 0.25), quantile7(rest, 0.75)
	iqr := q3 - q1
	far := low && v < q1-farOut*iqr || !low && v > q3+farOut*iqr
	if iqr <= 0 || !far {
		return checks.Suspect{}, 0, false
	}
	return checks.Suspect{Value: v, Count: k, Q1: q1, Q3: q3, Code: CodeLike(v)}, k, true
}

// quantile7 is the p-quantile of sorted x by definition 7 of Hyndman &
// Fan (1996), "Sample quantiles in statistical packages", the default of R
// and numpy: linear interpolation between order statistics at (n − 1)p.
//
//	h = (n − 1)p,  Q(p) = x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋])
func quantile7(x []float64, p float64) float64 {
	h := float64(len(x)-1) * p
	i := int(h)
	if i+1 >= len(x) {
		return x[len(x)-1]
	}
	return x[i] + (h-float64(i))*(x[i+1]-x[i])
}

func named(name string, s checks.Suspect) checks.Suspect {
	s.Variable = name
	return s
}

// CodeLike reports whether v is an integer of two or more digits written
// with nines or eights only, with either sign: the usual shapes of a
// missing-value code (99, −999, 8888).
func CodeLike(v float64) bool {
	if v != math.Trunc(v) || math.Abs(v) < 9 || math.Abs(v) > 1e15 {
		return false
	}
	d := strconv.FormatFloat(math.Abs(v), 'f', 0, 64)
	return len(d) >= 2 && (strings.Trim(d, "9") == "" || strings.Trim(d, "8") == "")
}

// missingMark reports whether a cell that is not a number looks like a
// mark for a missing value.
func missingMark(cell string) bool {
	switch strings.ToLower(cell) {
	case ".", "-", "?", "nan", "n/a", "null", "none", "missing", "miss", "--", "..":
		return true
	}
	return false
}
