package load

import (
	"math/rand/v2"
	"testing"
)

// fullDistance is the whole dynamic-programming table of the
// optimal-string-alignment distance, written out as its definition reads
// (Levenshtein distance plus adjacent transpositions): the oracle of the
// banded, early-stopping distance.within.
func fullDistance(s, t []rune) int {
	d := make([][]int, len(s)+1)
	for i := range d {
		d[i] = make([]int, len(t)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(s); i++ {
		for j := 1; j <= len(t); j++ {
			cost := 1
			if s[i-1] == t[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
			if i > 1 && j > 1 && s[i-1] == t[j-2] && s[i-2] == t[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(s)][len(t)]
}

// TestDistanceWithin: on random strings over a small alphabet (so that
// transpositions and near misses are common), within(s, t, k) is the full
// table's distance when that is at most k, and k+1 otherwise, for every
// k, with one distance value reused across all calls.
func TestDistanceWithin(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	word := func() []rune {
		w := make([]rune, rng.IntN(12))
		for i := range w {
			w[i] = rune('a' + rng.IntN(3))
		}
		return w
	}
	var d distance
	for range 3000 {
		s, u := word(), word()
		want := fullDistance(s, u)
		for k := 0; k <= 12; k++ {
			got := d.within(s, string(u), k)
			if exp := min(want, k+1); got != exp {
				t.Fatalf("within(%q, %q, %d) = %d, want %d (distance %d)", string(s), string(u), k, got, exp, want)
			}
		}
	}
}
