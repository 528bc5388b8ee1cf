package checks

import (
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks/nearby"
)

// ΔBIC is printed with two decimals unless they would round it across the
// edge of one of Raftery's bands (2, 6, 10).
func TestBICText_BandEdges(t *testing.T) {
	for _, tc := range []struct {
		d    float64
		want string
	}{
		{0.7203, "+0.72"}, {-1.996, "-1.996"}, {1.9999, "+1.9999"}, {2, "+2.00"},
		{-5.999, "-5.999"}, {10.004, "+10.004"}, {-9.2779, "-9.28"}, {0, "+0.00"},
	} {
		if got := bicText(tc.d); got != tc.want {
			t.Errorf("bicText(%g) = %q, want %q", tc.d, got, tc.want)
		}
	}
}

// The overview and the pass summaries count graphs, classes and steps in
// proper singulars and plurals, and a pass summary never says no claim
// changes where one does (among the declared graph's own equivalents) or
// keeps quiet about classes that fit better.
func TestNearbyText_Counts(t *testing.T) {
	cls := func(ds ...float64) []nearby.Class {
		var cs []nearby.Class
		for _, d := range ds {
			cs = append(cs, nearby.Class{DeltaBIC: d})
		}
		return cs
	}
	for _, tc := range []struct {
		run     *nearbyRun
		finding string
		summary string
	}{
		{&nearbyRun{nb: &nearby.Neighbourhood{DAGs: 1, Classes: cls(5)}},
			"1 graph lies one edit from the declared graph within the background knowledge; none is Markov " +
				"equivalent to the declared graph; they fall in 1 equivalence class: 0 within ΔBIC 2",
			"The one class of graphs one edit from the declared graph does not fit within ΔBIC 2 of it."},
		{&nearbyRun{nb: &nearby.Neighbourhood{DAGs: 3, Equivalent: 1, Classes: cls(-5, 8)}, better: 1, examinedBetter: 1},
			"3 graphs lie one edit from the declared graph within the background knowledge; 1 is Markov " +
				"equivalent to the declared graph (a reversible arrow reversed); the others fall in 2 equivalence classes:",
			"None of the 2 classes of graphs one edit from the declared graph fits within ΔBIC 2 of it; 1 class fits " +
				"better by 2 or more, and the claims are re-estimated in each of them (see the findings)."},
		{&nearbyRun{nb: &nearby.Neighbourhood{DAGs: 7, Classes: cls(-9, -8, -7, -6, -5, -4, -3)}, better: 7,
			examinedBetter: 5},
			"7 graphs lie one edit from the declared graph within the background knowledge; none is Markov " +
				"equivalent to the declared graph; they fall in 7 equivalence classes: 0 within ΔBIC 2 of the declared graph, 7",
			"None of the 7 classes of graphs one edit from the declared graph fits within ΔBIC 2 of it; 7 classes " +
				"fit better by 2 or more, and the claims are re-estimated in the 5 that fit best and where the greedy " +
				"search ends, not in the other 2 (see the findings)."},
		{&nearbyRun{nb: &nearby.Neighbourhood{DAGs: 2, Equivalent: 1, Classes: cls(1)}, near: 1,
			listed: []*nearClass{{delta: 1, claims: map[int]*AcrossEquivalents{0: {Unstable: true}}}}},
			"2 graphs lie one edit from the declared graph within the background knowledge; 1 is Markov " +
				"equivalent to the declared graph (a reversible arrow reversed); the other falls in 1 equivalence class:",
			"1 class of graphs lies one edit from the declared graph; 1 fits within ΔBIC 2 of it, and a claim that " +
				"changes in it already changes among the declared graph's own equivalent graphs"},
	} {
		got := overviewFinding(tc.run, "exogenous variables, fixed arrows").Message
		if !strings.HasPrefix(got, tc.finding) {
			t.Errorf("overview %q\nwant prefix %q", got, tc.finding)
		}
		if got := nearbySummary(StatusPass, tc.run, nil); !strings.HasPrefix(got, tc.summary) {
			t.Errorf("summary %q\nwant prefix %q", got, tc.summary)
		}
	}
}
