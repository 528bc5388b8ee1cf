package checks

import (
	"errors"
	"math/big"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks/missing"
	"github.com/pathvet/pathvet/checks/sem"
)

func sig(v float64) est   { return est{value: v, additive: v, p: 0.001, method: MethodOLS} }
func insig(v float64) est { return est{value: v, additive: v, p: 0.4, method: MethodOLS} }

// Each branch of the agreement sentence says only what its numbers show.
func TestAgreement_EveryBranch(t *testing.T) {
	zero := est{method: MethodZero}
	for _, tc := range []struct {
		a, b      est
		want, not string
	}{
		{sig(0.30), sig(0.33), "keeps its sign and significance", "though"},
		{sig(0.21), sig(0.42), "changes size by a factor of 2.0", ""},
		{sig(0.40), sig(0.19), "changes size by a factor of 0.5", ""},
		{insig(0.04), insig(-0.01), "is not significant either way, though its estimate changes sign", "keeps its sign"},
		{insig(0.04), insig(0.05), "is not significant either way", "keeps"},
		{zero, zero, "is zero by the graph either way", "keeps"},
		{zero, insig(0.1), "not significant either way (zero by the graph in one)", "keeps"},
	} {
		got := agreement(tc.a, tc.b, 0.05)
		if !strings.Contains(got, tc.want) || (tc.not != "" && strings.Contains(got, tc.not)) {
			t.Errorf("agreement(%v, %v) = %q, want %q without %q", tc.a.value, tc.b.value, got, tc.want, tc.not)
		}
	}
}

func TestCount_Plurals(t *testing.T) {
	for n, want := range map[int]string{0: "0 claims", 1: "1 claim", 2: "2 claims"} {
		if got := count(n, "claim", "claims"); got != want {
			t.Errorf("count(%d) = %q, want %q", n, got, want)
		}
	}
	for n, want := range map[int64]string{2: "1 other graph", 24: "23 other graphs"} {
		if got := otherGraphs(big.NewInt(n)); got != want {
			t.Errorf("otherGraphs(%d) = %q, want %q", n, got, want)
		}
	}
	if got := plausibleOthers(big.NewInt(6)); got != "5 of them respect the stated background knowledge" {
		t.Errorf("plausibleOthers(6) = %q", got)
	}
}

// The methods named as re-run are the ones that ran.
func TestPrincipledDone_NamesWhatRan(t *testing.T) {
	ml := map[string]*Moments{MissingMaximumLikelihood: {}}
	for _, tc := range []struct {
		r          *missingResult
		done, miss string
	}{
		{&missingResult{moments: ml, imputed: []*Moments{{}}}, "maximum likelihood and multiple imputation", ""},
		{&missingResult{moments: ml}, "maximum likelihood", "multiple imputation"},
		{&missingResult{moments: map[string]*Moments{}}, "", "maximum likelihood and multiple imputation"},
	} {
		if d, m := principledDone(tc.r), principledMissing(tc.r); d != tc.done || m != tc.miss {
			t.Errorf("done %q, missing %q; want %q, %q", d, m, tc.done, tc.miss)
		}
	}
	fs := methodFindings(MissingMeanSubstitution, &missingResult{
		summary: missing.Summary{Rows: 10, MissingCells: 1, MissingByVariable: []int{1}}, moments: ml}, 0.05)
	for _, f := range fs {
		if strings.Contains(f.Message, "multiple imputation") {
			t.Errorf("names multiple imputation, which did not run: %s", f.Message)
		}
	}
}

// The methods said to be re-run are named apart from the one each claim is
// held against below (the findings compare one; missing_data has all).
func TestReestimatedText_NamesTheComparison(t *testing.T) {
	r := &missingResult{moments: map[string]*Moments{MissingMaximumLikelihood: {}, MissingMeanSubstitution: {}},
		imputed: []*Moments{{}}}
	got := reestimatedText(MissingMeanSubstitution, r)
	want := "; the claims are re-estimated by maximum likelihood and multiple imputation, and each claim's " +
		"mean substitution estimate is held against its estimate by multiple imputation with"
	if !strings.HasPrefix(got, want) {
		t.Errorf("%q\nwant prefix %q", got, want)
	}
	r.imputed = nil // MI did not run: no comparison to name
	got = reestimatedText(MissingMeanSubstitution, r)
	if got != "; the claims are re-estimated by maximum likelihood." {
		t.Errorf("without imputations: %q", got)
	}
}

// One Holm-adjusted rejection under linear-normal tests is not "the graph
// is wrong": the summary counts it and names the assumptions.
func TestFitSummary_OneRejection(t *testing.T) {
	tests := []implicationTest{{pHolm: 0.01}, {pHolm: 0.5}, {pHolm: 0.9}}
	got := fitSummary(StatusFail, &sem.Fit{DF: 3}, tests, 0.05)
	for _, want := range []string{"reject 1 of the 3 independences", "linear relations and normal errors", "may lack an arrow"} {
		if !strings.Contains(got, want) {
			t.Errorf("%q lacks %q", got, want)
		}
	}
	if strings.Contains(got, "wrong somewhere") {
		t.Errorf("overstates: %q", got)
	}
	if got := fitSummary(StatusFail, &sem.Fit{DF: 1}, tests[:1], 0.05); !strings.Contains(got, "the one independence") {
		t.Errorf("%q", got)
	}
}

// The equivalence summary never says no claimed arrow depends on the
// class when one can be reversed, and counts other graphs, not the
// declared one.
func TestEquivalenceSummary_Branches(t *testing.T) {
	eq := &equivalenceResult{size: big.NewInt(24), plausible: big.NewInt(6)}
	s := &Study{Package: &Package{}}
	got := equivalenceSummary(s, eq, StatusWarn, equivalenceTally{reversible: 2})
	if !strings.Contains(got, "2 claimed arrows can point the other way") || !strings.Contains(got, "23 other graphs") {
		t.Errorf("%q", got)
	}
	got = equivalenceSummary(s, eq, StatusWarn, equivalenceTally{})
	if !strings.Contains(got, "no claimed arrow can point the other way") {
		t.Errorf("%q", got)
	}
	got = equivalenceSummary(s, eq, StatusWarn, equivalenceTally{unstable: 1})
	if !strings.HasPrefix(got, "1 claim changes") {
		t.Errorf("%q", got)
	}
	got = equivalenceSummary(s, eq, StatusWarn, equivalenceTally{claimWarnings: 1})
	if !strings.Contains(got, "the findings about 1 claim need attention") {
		t.Errorf("%q", got)
	}
	got = equivalenceSummary(
		s,
		&equivalenceResult{size: big.NewInt(3), plausible: big.NewInt(1)},
		StatusPass,
		equivalenceTally{},
	)
	if !strings.Contains(got, "2 other graphs") || !strings.Contains(got, "rules them all out") {
		t.Errorf("%q", got)
	}
}

// The measurement pass summary counts what was re-estimated without a
// bare "(of n)", in the singular for one claim.
func TestMeasurementPassText(t *testing.T) {
	for _, tc := range []struct {
		n, claims int
		want      string
	}{
		{4, 4, "changes the conclusion of none of the 4 claims, each re-estimated on the corrected correlations."},
		{1, 1, "the claim, re-estimated on the corrected correlations, keeps its conclusion."},
		{1, 3, "1 of the 3 claims was re-estimated on the corrected correlations, and correcting"},
		{0, 2, "no claim could be re-estimated on the corrected correlations."},
	} {
		if got := measurementPassText(tc.n, tc.claims); !strings.HasSuffix(got, tc.want) &&
			!strings.Contains(got, tc.want) {
			t.Errorf("%d of %d: %q lacks %q", tc.n, tc.claims, got, tc.want)
		}
	}
}

// An alternative that fits better by 2 or more is not said to fit "about
// as well".
func TestFitWord(t *testing.T) {
	for _, tc := range []struct {
		delta float64
		want  string
	}{{-5.8, "better"}, {-2, "better"}, {-1.9, "about as well"}, {1.9, "about as well"}, {2, "worse"}} {
		if got := fitWord(tc.delta); got != tc.want {
			t.Errorf("fitWord(%g) = %q, want %q", tc.delta, got, tc.want)
		}
	}
}

func TestAlternativesSummary_Branches(t *testing.T) {
	asWell := []map[string]any{{"fits_about_as_well": true}, {"fits_about_as_well": false}}
	claimWarn := []Finding{{Severity: StatusWarn, Claim: "C1"}}
	otherWarn := []Finding{{Severity: StatusWarn}}
	for _, tc := range []struct {
		status string
		n      int
		rows   []map[string]any
		fs     []Finding
		want   string
	}{
		{StatusPass, 1, asWell[1:], nil, "states 1 alternative graph; none fits the data about as well"},
		{StatusPass, 2, asWell, nil, "under the one that fits the data about as well as the declared graph or better"},
		{StatusPass, 2, append(asWell[:1:1], asWell[0]), nil, "under the 2 that fit the data"},
		{StatusWarn, 2, asWell, claimWarn, "1 claim changes sign"},
		{StatusWarn, 2, asWell, otherWarn, "comparisons with the declared graph could not be made"},
	} {
		if got := alternativesSummary(tc.status, tc.n, tc.rows, tc.fs); !strings.Contains(got, tc.want) {
			t.Errorf("%s: %q lacks %q", tc.status, got, tc.want)
		}
	}
}

func TestMissingSummary_Branches(t *testing.T) {
	r := &missingResult{
		moments: map[string]*Moments{MissingCompleteCases: {}, MissingMaximumLikelihood: {}},
		imputed: []*Moments{{}},
		summary: missing.Summary{Rows: 10, CompleteRows: 8},
	}
	for _, tc := range []struct {
		status              string
		changed, uncompared int
		want                string
	}{
		{StatusWarn, 1, 0, "1 claim changes sign"},
		{StatusWarn, 2, 0, "2 claims change sign"},
		{StatusWarn, 0, 1, "1 claim could not be compared between complete cases and multiple imputation"},
		{StatusPass, 0, 0, "between complete cases and multiple imputation with 20 imputations (8 of 10 rows complete)"},
	} {
		if got := missingSummary(tc.status, tc.changed, tc.uncompared, "", r); !strings.Contains(got, tc.want) {
			t.Errorf("%q lacks %q", got, tc.want)
		}
	}
}

func TestLanguageSummary_Branches(t *testing.T) {
	if got := languageSummary(StatusWarn, 0); !strings.Contains(got, "No claim is worded causally") {
		t.Errorf("%q", got)
	}
	if got := languageSummary(StatusPass, 2); strings.Contains(got, "sensitivity analysis") {
		t.Errorf("%q", got)
	}
}

// nearLine: two Monte Carlo errors either side of t(.975, df)·SE.
// Figures: with df = 1e6 the critical value is 1.95996 (normal quantile).
func TestNearLine(t *testing.T) {
	for _, tc := range []struct {
		est, between float64
		want         bool
	}{
		{0.196, 0.0002, true},  // margin 0.00004, MC error 0.0032
		{0.250, 0.0002, false}, // margin 0.054, 2 MC errors 0.0063
		{0.150, 0.0002, false}, // margin −0.046
		{0.190, 0.0002, true},  // margin −0.006
	} {
		pr := missing.Pooled{M: 20, Estimate: tc.est, Between: tc.between, StdError: 0.1, DF: 1e6}
		if got := nearLine(pr, 0.05); got != tc.want {
			t.Errorf("nearLine(%v) = %v, want %v", tc.est, got, tc.want)
		}
	}
}

// Where m could not be raised, the claim is read as on the line, with a
// warning; where it was, the report says for which claims.
func TestRaisedFindings(t *testing.T) {
	fs := raisedFindings(&missingResult{raised: []string{"S1"}, imputed: make([]*Moments, MaxImputations)})
	if len(fs) != 1 || fs[0].Severity != SeverityInfo ||
		!strings.Contains(fs[0].Message, "run with 100 imputations, not 20") {
		t.Errorf("%+v", fs)
	}
	fs = raisedFindings(&missingResult{raised: []string{"S1"}, raiseErr: errors.New("not raised: too large")})
	if len(fs) != 1 || fs[0].Severity != StatusWarn || !strings.Contains(fs[0].Message, "read S1 as on the line") {
		t.Errorf("%+v", fs)
	}
	if fs := raisedFindings(&missingResult{}); fs != nil {
		t.Errorf("%+v", fs)
	}
}
