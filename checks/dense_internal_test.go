package checks

import (
	"bytes"
	"encoding/json"
	"fmt"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/schema/schematest"
)

// A complete graph on 16 variables: every node of the declared class has
// 15 undirected neighbours, all adjacent, so 2^15 locally valid parent sets,
// past dag.MaxParentSets. The checks bound the work there and say so:
// equivalence warns per claim, nearby-graphs runs to the end (it used to
// fail with "too many locally valid parent sets"), re-estimates the claims
// it can, names those it could not in each class, warns, and the report
// keeps to its schema.
func TestDenseGraph_BoundedAndSaid(t *testing.T) {
	r := runDoc(t, denseSEMPackage(16, 1, 3))
	nb := checkByID(r, "nearby-graphs")
	if nb.RunError != "" || nb.Status == StatusPass {
		t.Fatalf("nearby-graphs %s, run error %q", nb.Status, nb.RunError)
	}
	if nb.Metrics["claims_not_examined"] == nil || !strings.Contains(nb.Summary, "could not be re-estimated") {
		t.Errorf("nearby metrics %v, summary %q", nb.Metrics, nb.Summary)
	}
	said := false
	for _, f := range nb.Findings {
		said = said || f.Severity == StatusWarn && strings.Contains(f.Message, "could not be re-estimated in") &&
			strings.Contains(f.Message, "more than 4,096 locally valid parent sets")
	}
	named := 0
	for _, g := range r.Graph.NearbyGraphs {
		for id, why := range g.ClaimsNotExamined {
			_, both := g.Claims[id]
			if both || !strings.Contains(why, "has more than 4,096 locally valid parent sets") {
				t.Errorf("class %v, claim %s: %q (also re-estimated: %v)", g.Edits, id, why, both)
			}
			named++
		}
	}
	if !said || named == 0 {
		t.Errorf("finding %v, %d claims named in classes; findings %+v", said, named, nb.Findings)
	}
	eq := checkByID(r, "equivalence")
	warned := map[string]bool{}
	for _, f := range eq.Findings {
		const why = "more than 4,096 locally valid parent sets (IDA) in the declared graph's class"
		if strings.Contains(f.Message, "could not be re-estimated across the equivalent graphs") &&
			strings.Contains(f.Message, why) {
			warned[f.Claim] = f.Severity == StatusWarn
		}
	}
	if len(warned) != len(r.Claims) { // every claim is causal, and every node has 15 neighbours
		t.Errorf("equivalence warns for %v of %d claims", warned, len(r.Claims))
	}
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	v, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	if err := schematest.Report(t).Validate(v); err != nil {
		t.Error(err)
	}
}

// A class of large graphs lists fewer members: a complete graph on 30
// variables has 435 arrows, so 10,000 / 435 = 22 of its 30! members are
// listed (truncated), each with all 435; on 8 variables (28 arrows) the
// usual 50.
func TestListMembers_BoundedByArrows(t *testing.T) {
	for _, tc := range []struct{ p, want int }{{30, 22}, {8, MaxListedMembers}} {
		var lines [][2]int
		for i := range tc.p {
			for j := i + 1; j < tc.p; j++ {
				lines = append(lines, [2]int{i, j})
			}
		}
		s := &Study{Names: make([]string, tc.p)}
		for i := range s.Names {
			s.Names[i] = fmt.Sprintf("v%d", i)
		}
		ms, truncated, err := listMembers(s, dag.New(tc.p, nil, lines), nil)
		if err != nil || len(ms) != tc.want || !truncated || len(ms[0]) != len(lines) {
			t.Errorf("K%d: %d members (truncated %v, %v), want %d", tc.p, len(ms), truncated, err, tc.want)
		}
	}
}

// The finding on claims not re-estimated counts claims and classes in
// every combination: one claim or several (named, the first five and a
// count), in the one class examined, in each of several, or in some.
func TestUnlistedText_Counts(t *testing.T) {
	claims := make([]Claim, 8)
	for i := range claims {
		claims[i].ID = fmt.Sprintf("C%d", i+1)
	}
	a := &Analysis{Study: &Study{Package: &Package{Claims: claims}}}
	class := func(key string, unlisted ...int) *nearClass {
		return &nearClass{key: key, claims: map[int]*AcrossEquivalents{}, unlisted: unlisted}
	}
	for _, tc := range []struct {
		listed []*nearClass
		want   string
	}{
		{[]*nearClass{class("a", 0)}, "Claim C1 could not be re-estimated in the one class examined: " +
			"there the variable whose parents the estimate uses has more than 4,096"},
		{[]*nearClass{class("a", 1), class("b", 1), class("c", 1)},
			"Claim C2 could not be re-estimated in each of the 3 classes examined: there"},
		{[]*nearClass{class("a", 0, 1), class("b", 1), class("a", 5)},
			"2 claims (C1 and C2) could not be re-estimated in the 2 classes examined (each claim in at least one of " +
				"them)"},
		{[]*nearClass{class("a", 0, 1, 2, 3, 4, 5, 6), class("b"), class("c")},
			"7 claims (C1, C2, C3, C4, C5 and 2 more) could not be re-estimated in 1 of the 3 classes examined: there"},
		{[]*nearClass{class("a", 0), class("b", 2), class("c")},
			"2 claims (C1 and C3) could not be re-estimated in 2 of the 3 classes examined (each claim in at least"},
	} {
		fs := a.unlistedFinding(&nearbyRun{listed: tc.listed})
		if len(fs) != 1 || fs[0].Severity != StatusWarn || !strings.HasPrefix(fs[0].Message, tc.want) {
			t.Errorf("got %+v\nwant a warning starting %q", fs, tc.want)
		}
	}
	if fs := a.unlistedFinding(&nearbyRun{listed: []*nearClass{class("a")}}); fs != nil {
		t.Errorf("every claim re-estimated, yet %+v", fs)
	}
	one := a.unlistedFinding(&nearbyRun{listed: []*nearClass{class("a", 0)}})[0].Message
	if !strings.HasSuffix(one, "cannot say that the claim holds there (the report's nearby graphs name, class by "+
		"class, the claims and their variables).") {
		t.Errorf("one claim: %q", one)
	}
}
