package review

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

func golden(t *testing.T, demo string) *checks.Report {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "demo", demo, "report.golden.json"))
	if err != nil {
		t.Fatal(err)
	}
	var r checks.Report
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	return &r
}

// findingWith returns a copy of the report with the finding of key set to
// severity, or removed where severity is "".
func withFinding(t *testing.T, r *checks.Report, key, severity string) *checks.Report {
	t.Helper()
	b, _ := json.Marshal(r)
	var out checks.Report
	_ = json.Unmarshal(b, &out)
	for i := range out.Checks {
		fs := out.Checks[i].Findings[:0]
		for _, f := range out.Checks[i].Findings {
			if f.Key == key {
				if severity == "" {
					continue
				}
				f.Severity = severity
			}
			fs = append(fs, f)
		}
		out.Checks[i].Findings = fs
	}
	return &out
}

const (
	c1Across = "equivalence:C1:across-equivalents" // fail in the tutoring-anxiety demo
	c2Across = "equivalence:C2:across-equivalents" // warn
	c3Across = "equivalence:C3:across-equivalents" // warn
	c4Figs   = "effect-reporting:C4:figures"       // warn
)

func TestDecide_Defaults(t *testing.T) {
	r := golden(t, "tutoring-anxiety")
	for _, d := range Decide(r, nil) {
		want := Note
		if d.Severity == checks.StatusFail || d.Severity == checks.StatusWarn {
			want = Ask
		}
		if d.Decision != want || d.Annotation != nil || d.Question != d.Finding.Question {
			t.Errorf("%s (%s): %s, question %q", d.Key, d.Severity, d.Decision, d.Question)
		}
	}
	eff := map[string]Annotation{c2Across: {Decision: Dismiss, Reason: "r"}, c3Across: {Decision: Ask, Question: "Q?"}}
	for _, d := range Decide(r, eff) {
		switch d.Key {
		case c2Across:
			if d.Decision != Dismiss || d.Question != d.Finding.Question {
				t.Errorf("dismissed: %+v", d)
			}
		case c3Across:
			if d.Question != "Q?" || !d.Edited() {
				t.Errorf("reworded: %+v", d)
			}
		}
	}
}

// A decision follows the manuscript while its finding stays the same (key
// and severity), through a version that made no decision of its own; it
// stops where the finding changed or went; a version's own decision wins.
func TestEffective_CarriesStillOpenFindings(t *testing.T) {
	v1 := golden(t, "tutoring-anxiety")
	v2 := withFinding(t, withFinding(t, v1, c2Across, checks.StatusFail), c4Figs, "")
	v3 := withFinding(t, v2, c1Across, checks.StatusFail)
	own := map[string]Annotation{
		c1Across: {Decision: Note, By: "editor a"}, c2Across: {Decision: Dismiss, Reason: "r"},
		c3Across: {Decision: Ask, Question: "Q?"}, c4Figs: {Decision: Dismiss, Reason: "r"},
	}
	eff := Effective([]Version{{ID: "v1", Report: v1, Own: own}, {ID: "v2", Report: v2},
		{ID: "v3", Report: v3, Own: map[string]Annotation{c3Across: {Decision: Note, By: "editor b"}}}})
	if a, ok := eff[c1Across]; !ok || a.CarriedFrom != "v1" || a.Decision != Note {
		t.Errorf("C1, still open: %+v %v", a, ok)
	}
	if _, ok := eff[c2Across]; ok {
		t.Error("C2 became a failure, yet its dismissal was carried")
	}
	if _, ok := eff[c4Figs]; ok {
		t.Error("C4's finding went, yet its decision was carried")
	}
	if a := eff[c3Across]; a.CarriedFrom != "" || a.By != "editor b" {
		t.Errorf("C3: the version's own decision should win: %+v", a)
	}
	eff2 := Effective([]Version{{ID: "v1", Report: v1, Own: own}, {ID: "v2"}, {ID: "v3", Report: v1}})
	if eff2[c2Across].CarriedFrom != "v1" {
		t.Errorf("a version without a report broke the chain: %+v", eff2)
	}
}

// What became of the earlier questions: the finding gone or now a note is
// answered, the same severity open, another severity changed; a question
// dismissed before was not asked; a new fail or warn key is raised.
func TestCompare(t *testing.T) {
	v1 := golden(t, "tutoring-anxiety")
	v2 := withFinding(t, withFinding(t, withFinding(t, v1, c4Figs, ""), c2Across, checks.SeverityInfo),
		c1Across, checks.StatusWarn)
	v2.Checks[0].Findings = append(v2.Checks[0].Findings, checks.Finding{Key: "graph-declared:C9:no-arrow",
		Severity: checks.StatusFail, Claim: "C9", Topic: "no-arrow", Message: "m"})
	cmp := Compare(v1, map[string]Annotation{c3Across: {Decision: Dismiss, Reason: "r"}}, v2, nil)
	states := map[string]string{}
	for _, o := range cmp.Asked {
		states[o.Key] = o.State
	}
	want := map[string]string{c4Figs: Answered, c2Across: Answered, c1Across: Changed,
		"causal-language:C1:wording": Open}
	for k, s := range want {
		if states[k] != s {
			t.Errorf("%s: %q, want %q", k, states[k], s)
		}
	}
	if _, ok := states[c3Across]; ok {
		t.Error("a dismissed finding counted as asked")
	}
	if len(cmp.Raised) != 1 || cmp.Raised[0].Key != "graph-declared:C9:no-arrow" {
		t.Errorf("raised %+v", cmp.Raised)
	}
}

func TestCompose_GroupsAndPlurals(t *testing.T) {
	r := golden(t, "tutoring-anxiety")
	l := Compose(r, Decide(r, nil))
	first := l.Items[0]
	if len(first.Claims) != 3 || !first.Claims[0].Headline || first.Claims[0].Text == "" ||
		!strings.Contains(first.Question, "each of these claims depends on") {
		t.Errorf("first item %+v", first)
	}
	for _, it := range l.Items {
		if len(it.Claims) == 1 && strings.Contains(it.Question, "each of these") {
			t.Errorf("one claim asked in the plural: %+v", it)
		}
	}
	if len(l.Notes) == 0 || slices.ContainsFunc(l.Notes, func(it Item) bool { return it.Question != "" }) {
		t.Errorf("notes %+v", l.Notes)
	}
	refs := claimRefs(r)
	got := mentioned("the pooled estimate of C1, C3 and C10; 1 of C", refs)
	if !slices.Equal(got, []string{"C1", "C3"}) {
		t.Errorf("mentioned %v", got)
	}
}

func TestPackageChanges(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "demo", "tutoring-anxiety", "package.json"))
	if err != nil {
		t.Fatal(err)
	}
	var p1, p2 checks.Package
	_ = json.Unmarshal(b, &p1)
	_ = json.Unmarshal(b, &p2)
	p2.Claims = append([]checks.Claim(nil), p1.Claims...)
	p2.Claims[0].Text = "Peer tutoring goes with lower maths anxiety"
	e := -0.31
	p2.Claims[0].Estimate = &e
	p2.Claims = p2.Claims[:3]
	p2.Graph = &checks.Graph{Edges: append(p1.Graph.Edges[1:], checks.Edge{From: "long_commute", To: "maths_score"}),
		EquivalentsDiscussed: true}
	p2.MissingData = &checks.MissingData{Method: "multiple_imputation", Imputations: 40}
	got := PackageChanges(&p1, &p2, DataFacts{Digest: "a", Rows: 640}, DataFacts{Digest: "b", Rows: 702})
	var parts []string
	for _, c := range got {
		if len(parts) == 0 || parts[len(parts)-1] != c.Part {
			parts = append(parts, c.Part)
		}
	}
	if !slices.Equal(parts, []string{PartClaims, PartArrows, PartData, PartMethod}) {
		t.Errorf("parts in the order %v:\n%+v", parts, got)
	}
	text := ""
	for _, c := range got {
		text += c.Text + "\n"
	}
	for _, s := range []string{"Claim C1 is reworded", "estimate -0.29 (standardized) then, -0.31 (standardized) now",
		"Claim C4 “Students with long commutes attend fewer sessions” is no longer made.",
		"The arrow long_commute → tutor_sessions is removed from the declared graph.",
		"now say that they discussed", "The data changed: 640 cases then, 702 now.",
		"Missing values: multiple imputation with 40 imputations now,"} {
		if !strings.Contains(text, s) {
			t.Errorf("changes lack %q:\n%s", s, text)
		}
	}
	if same := PackageChanges(&p1, &p1, DataFacts{Digest: "a"}, DataFacts{Digest: "a"}); len(same) != 1 ||
		same[0].Text != "The data are the same as before." {
		t.Errorf("an unchanged package: %+v", same)
	}
}

// A report stored before findings had keys and questions still reviews:
// each finding gets a key of its own from its check and claim, and a fail
// or warn finding the fallback question.
func TestDecide_ReportWithoutKeys(t *testing.T) {
	r := golden(t, "tutoring-anxiety")
	for i := range r.Checks {
		for j := range r.Checks[i].Findings {
			f := &r.Checks[i].Findings[j]
			f.Key, f.Topic, f.Question = "", "", ""
		}
	}
	seen := map[string]bool{}
	for _, d := range Decide(r, nil) {
		if d.Key == "" || seen[d.Key] || (d.Decision == Ask) != (d.Question == checks.FallbackQuestion) {
			t.Errorf("%+v", d)
		}
		seen[d.Key] = true
	}
	if l := Compose(r, Decide(r, nil)); len(l.Items) == 0 || l.Items[0].Question != checks.FallbackQuestion {
		t.Errorf("letter %+v", l.Items)
	}
}
