package checks_test

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// loadEdited loads a demo with old replaced by new in its document.
func loadEdited(tb testing.TB, path, old, new string) *checks.Study {
	tb.Helper()
	doc, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	if !bytes.Contains(doc, []byte(old)) {
		tb.Fatalf("%s does not contain %q", path, old)
	}
	doc = bytes.Replace(doc, []byte(old), []byte(new), 1)
	s, err := load.Load(doc, load.Options{ReadFile: func(name string) ([]byte, error) {
		return os.ReadFile(filepath.Join(filepath.Dir(path), name))
	}})
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

// An estimate that the graph makes zero is no significant result: its p,
// SE and interval are null, and it says why (tutoring-anxiety: the
// headline's arrow is reversed in 3 of the 6 plausible members and in the
// stated alternative).
func TestRun_StructuralZeroIsNull(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/tutoring-anxiety/package.json"))
	c := r.Claims[0]
	ct := c.AcrossEquivalents.Contrast.Estimate
	if ct.Method != checks.MethodZero || ct.PValue != nil || ct.StdError != nil || ct.CI != nil ||
		ct.Estimate == nil || *ct.Estimate != 0 || !strings.Contains(ct.StructuralZero, "points the other way") {
		t.Errorf("contrast %+v", ct)
	}
	// The zeros count as zero in the range and as not significant in the
	// share: C1 is negative and significant in 3 of the 6, zero in 3.
	ae := c.AcrossEquivalents
	if ae.Max == nil || *ae.Max != 0 || ae.Min == nil || *ae.Min >= 0 || ae.ShareSignificantSameSign == nil ||
		*ae.ShareSignificantSameSign != 0.5 || ae.Estimates != 6 || ae.Differing != 3 {
		t.Errorf("across %+v", ae)
	}
	alt := c.UnderAlternatives[0]
	if alt.PValue != nil || alt.CI != nil || alt.StructuralZero == "" {
		t.Errorf("alternative %+v", alt)
	}
	b, _ := json.Marshal(ct)
	if !bytes.Contains(b, []byte(`"p_value":null`)) || !bytes.Contains(b, []byte(`"std_error":null`)) {
		t.Errorf("JSON %s", b)
	}
}

// A claim that is not an arrow of the declared graph fails graph-declared,
// is a structural zero under it, and gets no E-value and no "keeps its
// sign" elsewhere (coding-club H1 reversed: practice_hours → club_member).
func TestRun_ClaimAgainstGraph(t *testing.T) {
	s := loadEdited(t, "../testdata/demo/coding-club/package.json",
		`"kind": "direct_effect", "from": "club_member", "to": "practice_hours"`,
		`"kind": "direct_effect", "from": "practice_hours", "to": "club_member"`)
	r := mustRun(t, s)
	h1 := r.Claims[0]
	if h1.Declared.StructuralZero == "" || h1.Declared.PValue != nil || h1.EValue != nil {
		t.Errorf("H1 declared %+v, E-value %+v", h1.Declared, h1.EValue)
	}
	if c := checkOf(r, "graph-declared"); c.Status != checks.StatusFail {
		t.Errorf("graph-declared %s", c.Status)
	}
	for _, c := range r.Checks {
		for _, f := range c.Findings {
			if f.Claim == "H1" &&
				(strings.Contains(f.Message, "keeps its sign") || strings.HasPrefix(f.Message, "E-value for")) {
				t.Errorf("%s: %s", c.ID, f.Message)
			}
			if f.Claim == "H1" && c.ID == "confounding-sensitivity" && f.Severity != checks.SeverityInfo {
				t.Errorf("confounding charges again for a claim graph-declared fails: %s", f.Message)
			}
		}
	}
}

// A claim of no effect needs no E-value: causal wording on it does not ask
// for one (the format has no field an author could fill).
func TestCausalLanguage_NoEValueForAbsence(t *testing.T) {
	s := loadEdited(t, "../testdata/demo/sleep-attention/package.json",
		"Sleep duration does not predict classroom attention", "Sleep duration does not affect classroom attention")
	c := checkOf(mustRun(t, s), "causal-language")
	found := false
	for _, f := range c.Findings {
		if f.Claim == "S1" {
			found = true
			if strings.Contains(f.Message, "E-value") || strings.Contains(f.Message, "sensitivity analysis") {
				t.Errorf("S1: %s", f.Message)
			}
		}
	}
	if !found {
		t.Fatalf("no wording finding for S1: %+v", c.Findings)
	}
}

// The checks give the same results run in reverse order, or one at a
// time, as in pipeline order: no check reads another's annotations.
func TestRun_OrderAndSubsetsAgree(t *testing.T) {
	for _, path := range demoPackages(t) {
		full := mustRun(t, MustLoad(t, path))
		pipe := checks.Pipeline()
		rev := make([]checks.Check, len(pipe))
		for i, c := range pipe {
			rev[len(pipe)-1-i] = c
		}
		r := runWith(t, path, rev)
		for i := range full.Checks {
			if got := checkOf(r, full.Checks[i].ID); !reflect.DeepEqual(got, full.Checks[i]) {
				t.Errorf("%s: %s differs in reverse order", path, full.Checks[i].ID)
			}
		}
		if !reflect.DeepEqual(r.Claims, full.Claims) {
			t.Errorf("%s: claims differ in reverse order", path)
		}
		for _, c := range pipe {
			one := runWith(t, path, []checks.Check{c})
			got, want := one.Checks[0], checkOf(full, c.ID)
			got.Deduction, want.Deduction = 0, 0
			if !reflect.DeepEqual(got, want) {
				t.Errorf("%s: %s alone differs:\n%+v\n%+v", path, c.ID, got, want)
			}
		}
	}
}

func runWith(tb testing.TB, path string, cs []checks.Check) *checks.Report {
	tb.Helper()
	r, err := checks.Run(context.Background(), MustLoad(tb, path), checks.Options{Now: fixedNow, Checks: cs})
	if err != nil {
		tb.Fatal(err)
	}
	return r
}

// A cosmetic edit moves no number: the imputations are seeded from the
// data, not from the whole package (a trailing space in the title, a
// reworded claim text).
func TestRun_CosmeticEditMovesNoNumber(t *testing.T) {
	path := "../testdata/demo/sleep-attention/package.json"
	want := mustRun(t, MustLoad(t, path))
	for _, edit := range [][2]string{
		{`"title": "`, `"title": " `},
		{"Students with part-time jobs sleep less", "Students with part-time jobs sleep less each night"},
	} {
		got := mustRun(t, loadEdited(t, path, edit[0], edit[1]))
		if got.PackageSHA256 == want.PackageSHA256 {
			t.Fatalf("%q: the edit did not change the package", edit[1])
		}
		for i := range got.Claims { // the claim's own words are copied, not computed
			got.Claims[i].Text = want.Claims[i].Text
		}
		if !reflect.DeepEqual(got.Claims, want.Claims) || !reflect.DeepEqual(got.Checks, want.Checks) {
			t.Errorf("%q: the report's numbers or sentences moved", edit[1])
		}
	}
}

// Where the Monte Carlo error of a pooled estimate could carry it across
// the significance line, m is raised and the report says so
// (sleep-attention at a significance level of .011: S1's pooled p with 20
// imputations is .011, on the line).
func TestMissingData_RaisesImputations(t *testing.T) {
	r, err := checks.Run(context.Background(), MustLoad(t, "../testdata/demo/sleep-attention/package.json"),
		checks.Options{Now: fixedNow, Alpha: 0.011})
	if err != nil {
		t.Fatal(err)
	}
	c := checkOf(r, "missing-data")
	if c.Metrics["imputations"] != checks.MaxImputations ||
		!reflect.DeepEqual(c.Metrics["imputations_raised_for"], []string{"S1"}) {
		t.Fatalf("imputations %v, raised for %v", c.Metrics["imputations"], c.Metrics["imputations_raised_for"])
	}
	mi := r.Claims[0].MissingData[checks.MissingMultipleImputation]
	if mi.MonteCarloError == nil || *mi.MonteCarloError <= 0 || !strings.Contains(mi.Note, "100 imputations") {
		t.Fatalf("S1 pooled %+v", mi)
	}
	r = mustRun(t, MustLoad(t, "../testdata/demo/coding-club/package.json"))
	if c := checkOf(r, "missing-data"); c.Metrics["imputations"] != checks.Imputations {
		t.Errorf("coding-club: m = %v, nothing near the line", c.Metrics["imputations"])
	}
}

// A total effect without a directed path is zero by the declared graph,
// as graph-declared says, whichever way the regression would come out.
func TestRun_TotalEffectWithoutPath(t *testing.T) {
	s := loadEdited(t, "../testdata/demo/coding-club/package.json",
		`"kind": "direct_effect", "from": "club_member", "to": "practice_hours"`,
		`"kind": "total_effect", "from": "persistence", "to": "club_member"`)
	d := mustRun(t, s).Claims[0].Declared
	if d.Method != checks.MethodZero || d.PValue != nil ||
		!strings.Contains(d.StructuralZero, "no directed path from persistence to club_member") {
		t.Fatalf("%+v", d)
	}
}
