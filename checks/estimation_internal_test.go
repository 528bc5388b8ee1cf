package checks

import (
	"context"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/pathvet/pathvet/checks/dag"
)

// summaryPackage builds a package over continuous variables with a
// lower-triangle correlation matrix, the given graph, and one total-effect
// claim X → Y.
func summaryPackage(vars []string, edges [][2]string, lower [][]float64, n int) []byte {
	type obj = map[string]any
	var vs, es []obj
	for _, name := range vars {
		vs = append(vs, obj{"name": name, "scale": "continuous"})
	}
	for _, e := range edges {
		es = append(es, obj{"from": e[0], "to": e[1]})
	}
	doc, err := json.Marshal(obj{
		"format_version": 1, "title": "t", "design": "observational", "variables": vs,
		"graph":  obj{"edges": es},
		"claims": []obj{{"id": "T1", "text": "X raises Y", "kind": "total_effect", "from": "X", "to": "Y"}},
		"data":   obj{"kind": "summary", "n": n, "variables": vars, "correlations": lower},
	})
	if err != nil {
		panic(err)
	}
	return doc
}

// IDA's possible effects by locally valid parent sets, values worked by
// hand from the population correlations (adjusting for each locally valid
// parent set in turn, Maathuis, Kalisch & Bühlmann 2009): the chain Z − X − Y
// gives {0.4, 0.4, 0}; the complete X − A − Y gives {0.5, 0.41758, 0, 0}.
func TestLocalParentSets_IDAValues(t *testing.T) {
	cases := []struct {
		name  string
		vars  []string
		edges [][2]string
		lower [][]float64
		want  []float64
	}{
		{"chain", []string{"Z", "X", "Y"}, [][2]string{{"Z", "X"}, {"X", "Y"}},
			[][]float64{{1}, {.5, 1}, {.2, .4, 1}}, []float64{0, 0.4, 0.4}},
		{"complete", []string{"X", "A", "Y"}, [][2]string{{"X", "A"}, {"A", "Y"}, {"X", "Y"}},
			[][]float64{{1}, {.3, 1}, {.5, .4, 1}}, []float64{0, 0, 0.41758, 0.5}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			doc := summaryPackage(tc.vars, tc.edges, tc.lower, 500)
			s, err := LoadForTest(doc)
			if err != nil {
				t.Fatalf("%v\n%s", err, doc)
			}
			a := &Analysis{Study: s, Alpha: DefaultAlpha}
			graphs, err := a.localGraphs(s.Index["X"])
			if err != nil {
				t.Fatal(err)
			}
			var got []float64
			for _, g := range graphs {
				e := a.estimateClaim(s.Package.Claims[0], g.pa)
				v := e.value
				if e.method == MethodZero {
					v = 0
				}
				got = append(got, v)
			}
			slices.Sort(got)
			if len(got) != len(tc.want) {
				t.Fatalf("effects %v, want %v", got, tc.want)
			}
			for i := range got {
				if !scalar.EqualWithinAbs(got[i], tc.want[i], 5e-6) {
					t.Fatalf("effects %v, want %v", got, tc.want)
				}
			}
		})
	}
}

func runDoc(t *testing.T, doc []byte) *Report {
	t.Helper()
	s, err := LoadForTest(doc)
	if err != nil {
		t.Fatalf("%v\n%s", err, doc)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func checkByID(r *Report, id string) CheckResult {
	for _, c := range r.Checks {
		if c.ID == id {
			return c
		}
	}
	return CheckResult{}
}

// graph-fit on the worked example of reference-values.md: X → M → Y,
// r_XM = .5, r_XY = .3, r_MY = .4, N = 200.
func TestGraphFit_WorkedExample(t *testing.T) {
	doc := summaryPackage([]string{"X", "M", "Y"}, [][2]string{{"X", "M"}, {"M", "Y"}},
		[][]float64{{1}, {.5, 1}, {.3, .4, 1}}, 200)
	m := checkByID(runDoc(t, doc), "graph-fit").Metrics
	for key, want := range map[string]float64{"chi_square": 3.1841, "p_value": .0744, "rmsea": .1048,
		"cfi": .9763, "tli": .9289, "srmr": .0408, "fisher_c_p_value": .0762} {
		got, _ := m[key].(float64)
		if !scalar.EqualWithinAbs(got, want, 5e-5) {
			t.Errorf("%s = %v, want %v", key, m[key], want)
		}
	}
	if m["df"] != 1 || m["implications_tested"] != 1 || m["implications_rejected"] != 0 || m["fisher_c_df"] != 2 {
		t.Errorf(
			"df %v, tested %v, rejected %v, C df %v",
			m["df"],
			m["implications_tested"],
			m["implications_rejected"],
			m["fisher_c_df"],
		)
	}
	if ci := m["rmsea_ci"].([]any); !scalar.EqualWithinAbs(ci[1].(float64), .2431, 5e-5) || ci[0].(float64) != 0 {
		t.Errorf("RMSEA interval %v", ci)
	}
}

// A graph the data contradict: X and Y strongly related but declared
// independent given M.
func TestGraphFit_RejectedImplication(t *testing.T) {
	doc := summaryPackage([]string{"X", "M", "Y"}, [][2]string{{"X", "M"}, {"M", "Y"}},
		[][]float64{{1}, {.2, 1}, {.6, .2, 1}}, 400)
	c := checkByID(runDoc(t, doc), "graph-fit")
	if c.Status != StatusFail || c.Metrics["implications_rejected"] != 1 {
		t.Fatalf("status %s, rejected %v", c.Status, c.Metrics["implications_rejected"])
	}
}

// A class too large to list (K7: 5,040 members) is covered by local
// parent sets, and the report says so.
func TestAcrossEquivalents_LargeClassUsesLocalParentSets(t *testing.T) {
	vars := []string{"X", "Y", "A", "B", "C", "D", "E"}
	var edges [][2]string
	var lower [][]float64
	for i := range vars {
		row := make([]float64, i+1)
		for j := range i {
			edges = append(edges, [2]string{vars[j], vars[i]})
			row[j] = 0.1 + 0.02*float64(i+j)
		}
		row[i] = 1
		lower = append(lower, row)
	}
	r := runDoc(t, summaryPackage(vars, edges, lower, 300))
	ae := r.Claims[0].AcrossEquivalents
	if ae == nil || ae.Method != AcrossParentSets || ae.Estimates != 1<<6 {
		t.Fatalf("across equivalents %+v; want local parent sets over the 64 subsets of X's six neighbours", ae)
	}
	if r.Graph.EquivalenceClassSize != int64(5040) {
		t.Fatalf("class size %v", r.Graph.EquivalenceClassSize)
	}
}

func TestAlternatives_EquivalentAndDistinguishable(t *testing.T) {
	r := runDoc(t, mustRead(t, "../testdata/demo/tutoring-anxiety/package.json"))
	rows := checkByID(r, "alternatives").Metrics["comparisons"].([]map[string]any)
	if rows[0]["equivalent"] != true || rows[1]["equivalent"] != false || rows[1]["delta_bic"] == nil {
		t.Fatalf("comparisons %v", rows)
	}
	// "About as well" is |ΔBIC| < 2 (Raftery 1995): the second alternative,
	// at ΔBIC −5.8, fits better, which is not about as well; the equivalent
	// one fits exactly as well.
	if d := rows[1]["delta_bic"].(float64); d > -2 || rows[1]["fits_about_as_well"] != false ||
		rows[1]["fits_better"] != true || rows[0]["fits_about_as_well"] != true || rows[0]["fits_better"] != false {
		t.Fatalf("comparisons %v", rows)
	}
	c1 := r.Claims[0]
	if len(c1.UnderAlternatives) != 2 || !c1.UnderAlternatives[0].Changed || *c1.UnderAlternatives[0].Estimate != 0 {
		t.Fatalf("C1 under alternatives %+v", c1.UnderAlternatives)
	}
	if c1.AcrossEquivalents == nil || !c1.AcrossEquivalents.Unstable || c1.AcrossEquivalents.Estimates != 6 {
		t.Fatalf("C1 across equivalents %+v", c1.AcrossEquivalents)
	}
}

func mustRead(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// With background knowledge, the local parent sets are exactly the parent
// sets the plausible members give the node: on random DAGs, against the
// members listed one by one.
func TestLocalGraphs_BackgroundKnowledgeExact(t *testing.T) {
	r := rand.New(rand.NewPCG(31, 32))
	checked := 0
	for range 300 {
		n := 3 + r.IntN(4)
		names := make([]string, n)
		for i := range names {
			names[i] = string(rune('A' + i))
		}
		perm := r.Perm(n)
		var edges [][2]string
		for i := range n {
			for j := i + 1; j < n; j++ {
				if r.Float64() < 0.6 {
					edges = append(edges, [2]string{names[perm[i]], names[perm[j]]})
				}
			}
		}
		if len(edges) == 0 {
			continue
		}
		lower := make([][]float64, n)
		for i := range n {
			lower[i] = make([]float64, i+1)
			lower[i][i] = 1
		}
		vars := append([]string(nil), names...)
		doc := summaryPackageBK(vars, edges, lower, edges[r.IntN(len(edges))])
		s, err := LoadForTest(doc)
		if err != nil {
			t.Fatal(err)
		}
		a := &Analysis{Study: s, Alpha: DefaultAlpha}
		eq := a.equivalenceClass()
		members, _, err := dag.Members(eq.cpdag, s.Background, 10000)
		if err != nil {
			t.Fatal(err)
		}
		for node := range n {
			want := map[string]bool{}
			for _, m := range members {
				want[fmt.Sprint(m.Parents(node))] = true
			}
			graphs, err := a.localGraphs(node)
			if err != nil {
				t.Fatal(err)
			}
			got := map[string]bool{}
			for _, g := range graphs {
				got[fmt.Sprint(g.parents)] = true
			}
			if fmt.Sprint(keysOf(got)) != fmt.Sprint(keysOf(want)) {
				t.Fatalf(
					"node %d of %v with %v: local sets %v, members give %v",
					node,
					edges,
					s.Background,
					keysOf(got),
					keysOf(want),
				)
			}
			checked++
		}
	}
	if checked < 500 {
		t.Fatalf("only %d nodes checked", checked)
	}
}

func keysOf(m map[string]bool) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	slices.Sort(out)
	return out
}

// summaryPackageBK is summaryPackage with one edge fixed by background
// knowledge.
func summaryPackageBK(vars []string, edges [][2]string, lower [][]float64, fixed [2]string) []byte {
	var m map[string]any
	_ = json.Unmarshal(summaryPackage(vars, edges, lower, 500), &m)
	m["graph"].(map[string]any)["fixed_edges"] = []map[string]string{{"from": fixed[0], "to": fixed[1]}}
	m["claims"] = []map[string]any{{"id": "A1", "text": "t", "kind": "association", "from": vars[0], "to": vars[1]}}
	doc, _ := json.Marshal(m)
	return doc
}

// An alternative that cannot be fitted (here: too few cases for its
// equations) is reported as such, and the check still runs to the end.
func TestAlternatives_UnfittableAlternative(t *testing.T) {
	var m map[string]any
	_ = json.Unmarshal(summaryPackage(
		[]string{"X", "A", "B", "Y"},
		[][2]string{
			{"B", "A"},
			{"A", "X"},
			{"X", "Y"},
		},
		[][]float64{{1}, {.1, 1}, {.1, .1, 1}, {.6, .1, .1, 1}},
		3,
	), &m)
	m["alternatives"] = []map[string]any{{"name": "crowded", "edges": []map[string]string{
		{"from": "A", "to": "Y"}, {"from": "B", "to": "Y"}, {"from": "Y", "to": "X"}}}}
	m["claims"] = []map[string]any{
		{"id": "D1", "text": "X raises Y", "kind": "direct_effect", "from": "X", "to": "Y", "headline": true},
	}
	doc, _ := json.Marshal(m)
	c := checkByID(runDoc(t, doc), "alternatives")
	found := false
	for _, f := range c.Findings {
		if f.Severity == StatusWarn && strings.Contains(f.Message, `"crowded" could not be fitted`) {
			found = true
		}
	}
	if !found || c.RunError != "" || c.Metrics["comparisons"].([]map[string]any)[0]["delta_bic"] != nil {
		t.Fatalf("status %s, run error %q, findings %+v", c.Status, c.RunError, c.Findings)
	}
}
