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
