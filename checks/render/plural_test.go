package render

import (
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// TestClassWords: a class of one graph is "1 graph", counts decoded from
// JSON (float64), made in memory (int64) or past 2^53 (a string) read
// alike, and a count missing is said to be missing.
func TestClassWords(t *testing.T) {
	for _, tc := range []struct {
		size, plausible any
		want            string
	}{
		{float64(1), float64(1), "1 graph, 1 plausible"},
		{int64(1), int64(0), "1 graph, 0 plausible"},
		{float64(24), float64(6), "24 graphs, 6 plausible"},
		{"12345678901234567890", nil, "12345678901234567890 graphs, plausible ones not counted"},
		{nil, nil, "graphs not counted, plausible ones not counted"},
	} {
		n := checks.NearbyGraph{EquivalenceClassSize: tc.size, PlausibleClassSize: tc.plausible}
		if got := classWords(n); got != tc.want {
			t.Errorf("%v, %v: %q, want %q", tc.size, tc.plausible, got, tc.want)
		}
		if got := nearbyRow(n).Class; got != tc.want {
			t.Errorf("%v, %v: the table says %q, want %q", tc.size, tc.plausible, got, tc.want)
		}
	}
}

// TestDataRowsPlural: the page counts raw rows as "1 row" or "2 rows".
func TestDataRowsPlural(t *testing.T) {
	for rows, want := range map[int]string{1: "<dd>1 row</dd>", 2: "<dd>2 rows</dd>"} {
		r := &checks.Report{Title: "T", Caution: checks.Caution, Data: checks.DataReport{Rows: rows}}
		var b strings.Builder
		if err := WritePage(&b, r, PageOptions{}); err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(b.String(), want) {
			t.Errorf("%d rows: the page lacks %q", rows, want)
		}
	}
}
