package checks_test

import (
	"encoding/json"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// graphPackage: variables a, b, c, d (d in no edge), the graph a → b → c,
// and the given claims, on summary data.
func graphPackage(t *testing.T, claims ...map[string]any) *checks.Report {
	t.Helper()
	for i, c := range claims {
		c["id"], c["text"] = "K"+string(rune('1'+i)), "a claim"
	}
	doc, _ := json.Marshal(map[string]any{
		"format_version": 1, "title": "t", "design": "observational",
		"variables": []map[string]any{{"name": "a", "scale": "continuous"}, {"name": "b", "scale": "continuous"},
			{"name": "c", "scale": "continuous"}, {"name": "d", "scale": "continuous"}},
		"graph":  map[string]any{"edges": []map[string]string{{"from": "a", "to": "b"}, {"from": "b", "to": "c"}}},
		"claims": claims,
		"data": map[string]any{"kind": "summary", "n": 200, "variables": []string{"a", "b", "c", "d"},
			"correlations": [][]float64{{1}, {.3, 1}, {.1, .3, 1}, {0, 0, 0, 1}}},
	})
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return mustRun(t, s)
}

func claim(kind, from, to string) map[string]any {
	return map[string]any{"kind": kind, "from": from, "to": to}
}

func TestGraphDeclared_Findings(t *testing.T) {
	for _, tc := range []struct {
		name   string
		claim  map[string]any
		status string
		text   string
	}{
		{"an arrow", claim("direct_effect", "a", "b"), checks.StatusPass, ""},
		{"no such arrow", claim("direct_effect", "a", "c"), checks.StatusFail, "has no arrow a → c"},
		{"arrow the other way", claim("direct_effect", "b", "a"), checks.StatusFail, "the other way, a → b"},
		{"total effect along a path", claim("total_effect", "a", "c"), checks.StatusPass, ""},
		{"total effect without a path", claim("total_effect", "c", "a"), checks.StatusWarn, "no directed path from c to a"},
		{"causal claim outside the graph", claim("direct_effect", "d", "c"), checks.StatusFail, "which no arrow of the declared graph touches"},
		{"association outside the graph", claim("association", "d", "c"), checks.StatusWarn, "which no arrow of the declared graph touches"},
	} {
		c := checkOf(graphPackage(t, tc.claim), "graph-declared")
		if c.Status != tc.status {
			t.Errorf("%s: status %s, want %s (%+v)", tc.name, c.Status, tc.status, c.Findings)
		}
		if tc.text != "" && !strings.Contains(fmtFindings(c), tc.text) {
			t.Errorf("%s: no finding says %q: %s", tc.name, tc.text, fmtFindings(c))
		}
		if !strings.Contains(fmtFindings(c), "Measured but not in the graph: d") {
			t.Errorf("%s: d is not listed as outside the graph", tc.name)
		}
	}
}

func fmtFindings(c checks.CheckResult) string {
	var b strings.Builder
	for _, f := range c.Findings {
		b.WriteString(f.Severity + ": " + f.Message + "\n")
	}
	return b.String()
}

func TestCausalLanguage_Findings(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/calibration/bare-claims/package.json"))
	c := checkOf(r, "causal-language")
	got := fmtFindings(c)
	for _, want := range []string{
		`fail: B1 is worded causally ("causes", "lower") from a non-randomized design without a declared graph`,
		`warn: B3 is declared an association but worded causally ("leads to")`,
		"warn: No target trial is described",
	} {
		if !strings.Contains(got, want) {
			t.Errorf("missing %q in\n%s", want, got)
		}
	}
	r = mustRun(t, MustLoad(t, "../testdata/calibration/clean-randomized/package.json"))
	if c := checkOf(r, "causal-language"); c.Status != checks.StatusPass || len(c.Findings) != 0 {
		t.Errorf("randomized design: %s %+v", c.Status, c.Findings)
	}
}
