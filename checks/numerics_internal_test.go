package checks

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

type obj = map[string]any

// binaryOutcomePackage is a summary package over a continuous exposure X
// and a binary outcome Y (X → Y) with the given claim and data.means
// (nil to leave them out).
func binaryOutcomePackage(claim obj, means []float64) []byte {
	data := obj{"kind": "summary", "n": 500, "variables": []string{"X", "Y"},
		"correlations": [][]float64{{1}, {0.2, 1}}}
	if means != nil {
		data["means"] = means
	}
	doc, err := json.Marshal(obj{
		"format_version": 1, "title": "t", "design": "observational",
		"variables": []obj{{"name": "X", "scale": "continuous"}, {"name": "Y", "scale": "binary"}},
		"graph":     obj{"edges": []obj{{"from": "X", "to": "Y"}}},
		"claims":    []obj{claim},
		"data":      data,
	})
	if err != nil {
		panic(err)
	}
	return doc
}

// VanderWeele & Ding (2017, Ann. Intern. Med. 167:268), worked example:
// a risk ratio of 3.9 (1.8 to 8.7) has E-values 7.26 and 3.00. An odds
// ratio of a rare outcome (prevalence from data.means, 8%) is taken as
// that risk ratio; at a prevalence of 90% the outcome is common (sqrt),
// not rare as min(p, 1 − p) would make it; without means it is unknown.
func TestConfounding_PrevalenceFromMeans(t *testing.T) {
	claim := obj{"id": "K1", "text": "X raises Y", "kind": "total_effect", "from": "X", "to": "Y",
		"estimate": 3.9, "estimate_scale": "odds_ratio", "ci": []float64{1.8, 8.7}}
	rare := runDoc(t, binaryOutcomePackage(claim, []float64{0, 0.08})).Claims[0].EValue
	if rare == nil || !scalar.EqualWithinAbs(*rare.Estimate, 7.26, 0.005) ||
		!scalar.EqualWithinAbs(*rare.CILimit, 3.00, 0.005) ||
		!strings.Contains(rare.Conversion, "rarer than 15%") {
		t.Fatalf("rare outcome: %+v", rare)
	}
	// sqrt(3.9) = 1.9748: E = 1.9748 + sqrt(1.9748 × 0.9748) = 3.362.
	common := runDoc(t, binaryOutcomePackage(claim, []float64{0, 0.9})).Claims[0].EValue
	if common == nil || !scalar.EqualWithinAbs(*common.Estimate, 3.362, 0.001) ||
		!strings.Contains(common.Conversion, "0.90, not rare") {
		t.Fatalf("common outcome: %+v", common)
	}
	unknown := runDoc(t, binaryOutcomePackage(claim, nil)).Claims[0].EValue
	if unknown == nil || !strings.Contains(unknown.Conversion, "prevalence unknown") {
		t.Fatalf("no means: %+v", unknown)
	}
}

// An odds-ratio claim with a standard error but no interval (the SE's
// scale is not stated) gets its E-value from the recomputed figures or a
// reason, never a crash (nor a linear coefficient read as an odds ratio);
// log-odds with an SE get the Wald interval.
func TestConfounding_OddsRatioWithSEOnly(t *testing.T) {
	for _, claim := range []obj{
		{"id": "K1", "text": "X raises Y", "kind": "total_effect", "from": "X", "to": "Y",
			"estimate": 3.9, "estimate_scale": "odds_ratio", "std_error": 0.4},
		{"id": "K1", "text": "X raises Y", "kind": "total_effect", "from": "X", "to": "Y",
			"estimate": math.Log(3.9), "estimate_scale": "log_odds", "std_error": 0.4},
	} {
		r := runDoc(t, binaryOutcomePackage(claim, []float64{0, 0.08}))
		if c := checkByID(r, "confounding-sensitivity"); c.RunError != "" {
			t.Fatalf("%v: %s", claim["estimate_scale"], c.RunError)
		}
		if claim["estimate_scale"] == "odds_ratio" {
			// The summary data re-estimate a binary outcome linearly: no conversion, and a reason.
			c := checkByID(r, "confounding-sensitivity")
			if r.Claims[0].EValue != nil || len(c.Findings) != 1 ||
				!strings.Contains(c.Findings[0].Message, "outcome is binary") {
				t.Fatalf("odds ratio with SE only: %+v, %+v", r.Claims[0].EValue, c.Findings)
			}
		}
		if claim["estimate_scale"] == "log_odds" {
			ev := r.Claims[0].EValue
			// 95% Wald interval exp(ln 3.9 ± 1.96 × 0.4) = 1.781 to 8.54: limit 1.781 + sqrt(1.781 × 0.781) = 2.960.
			if ev == nil || ev.Source != "reported" || !scalar.EqualWithinAbs(*ev.CILimit, 2.960, 0.001) {
				t.Fatalf("log-odds with SE: %+v", ev)
			}
		}
	}
}

// The whole pipeline over the demo packages and an odds-ratio claim with
// every field, with each optional claim field dropped, one at a time:
// every check runs (no run_error).
func TestRun_OptionalClaimFieldsDropped(t *testing.T) {
	optional := []string{"adjust_for", "estimate", "estimate_scale", "std_error", "ci", "ci_level",
		"p_value", "p_relation", "asserts_absence", "headline"}
	docs := map[string][]byte{"odds ratio": binaryOutcomePackage(obj{"id": "K1", "text": "X raises Y",
		"kind": "total_effect", "from": "X", "to": "Y", "adjust_for": []string{}, "estimate": 3.9,
		"estimate_scale": "odds_ratio", "std_error": 0.4, "ci": []float64{1.8, 8.7}, "ci_level": 0.95,
		"p_value": 0.001, "p_relation": "<", "asserts_absence": false, "headline": true}, []float64{0, 0.08})}
	for _, path := range []string{"../testdata/demo/tutoring-anxiety/package.json", "../testdata/demo/coding-club/package.json",
		"../testdata/demo/sleep-attention/package.json"} {
		docs[path] = mustRead(t, path)
	}
	for path, src := range docs {
		var doc obj
		if err := json.Unmarshal(src, &doc); err != nil {
			t.Fatal(err)
		}
		for i := range doc["claims"].([]any) {
			for _, field := range optional {
				screenWithout(t, path, doc, i, field)
			}
		}
	}
}

func screenWithout(t *testing.T, path string, doc obj, i int, field string) {
	t.Helper()
	claim := doc["claims"].([]any)[i].(obj)
	v, had := claim[field]
	if !had {
		return
	}
	delete(claim, field)
	defer func() { claim[field] = v }()
	b, _ := json.Marshal(doc)
	s, err := LoadForTest(b)
	var invalid *InvalidPackageError
	if errors.As(err, &invalid) {
		return // a field another one needs: not a valid package without it
	}
	if err != nil {
		t.Fatalf("%s claim %d without %s: %v", path, i, field, err)
	}
	r, err := Run(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Checks {
		if c.RunError != "" {
			t.Errorf("%s claim %d without %s: %s failed to run: %s", path, i, field, c.ID, c.RunError)
		}
	}
}

// A summary package with an enormous n screens and returns (the RMSEA
// interval's noncentral chi-square has a bounded cost whatever λ is); a
// cancelled context stops the screen with its error. Where the format
// refuses such an n, the largest n it accepts is what runs.
func TestRun_HugeN(t *testing.T) {
	lower := [][]float64{{1}, {.5, 1}, {.3, .4, 1}}
	edges := [][2]string{{"X", "M"}, {"M", "Y"}}
	for _, n := range []int{1e12, 1e15, math.MaxInt64} {
		s, err := LoadForTest(summaryPackage([]string{"X", "M", "Y"}, edges, lower, n))
		var invalid *InvalidPackageError
		if errors.As(err, &invalid) {
			t.Logf("n = %d refused by the format: %v", n, err)
			continue
		}
		if err != nil {
			t.Fatal(err)
		}
		r, err := Run(context.Background(), s, Options{})
		if err != nil {
			t.Fatalf("n = %d: %v", n, err)
		}
		for _, c := range r.Checks {
			if c.RunError != "" {
				t.Errorf("n = %d: %s failed to run: %s", n, c.ID, c.RunError)
			}
		}
		if c := checkByID(r, "graph-fit"); c.Status == StatusNotApplicable || c.Metrics["rmsea_ci"] == nil {
			t.Errorf("n = %d: graph-fit %s, %v", n, c.Status, c.Metrics["rmsea_ci"])
		}
		ctx, cancel := context.WithCancel(context.Background())
		cancel()
		if _, err := Run(ctx, s, Options{}); !errors.Is(err, context.Canceled) {
			t.Errorf("n = %d, cancelled: %v", n, err)
		}
	}
}

// A claim of no effect on the unstandardized scale is tested once the SDs
// are known (the unstandardized re-estimate rescaled by SD(X)/SD(Y)),
// under t on the fit's df, and gives what the standardized re-estimate
// (without SDs) gives: r = .02, n = 1000, SE = sqrt((1 − r²)/998) =
// .03165, TOST p = P(T < (r − .1)/SE) = .005816 on t(998) (scipy's t).
func TestEffectReporting_AbsenceUnstandardized(t *testing.T) {
	doc := func(sds []float64) []byte {
		data := obj{
			"kind":         "summary",
			"n":            1000,
			"variables":    []string{"X", "Y"},
			"correlations": [][]float64{{1}, {0.02, 1}},
		}
		if sds != nil {
			data["sds"] = sds
		}
		b, _ := json.Marshal(obj{"format_version": 1, "title": "t", "design": "observational",
			"variables": []obj{{"name": "X", "scale": "continuous"}, {"name": "Y", "scale": "continuous"}},
			"claims": []obj{{"id": "A1", "text": "X is unrelated to Y", "kind": "association", "from": "X", "to": "Y",
				"estimate": 0.04, "estimate_scale": "unstandardized", "std_error": 0.063, "asserts_absence": true}},
			"data": data})
		return b
	}
	for _, sds := range [][]float64{{2, 4}, nil} {
		ab := runDoc(t, doc(sds)).Claims[0].Absence
		if ab == nil || ab.Distribution != "t(998)" || ab.Verdict != "excludes_meaningful_effects" ||
			ab.Source != "recomputed" ||
			!scalar.EqualWithinAbs(*ab.TOSTP, 0.005816, 1e-6) {
			t.Fatalf("SDs %v: %+v", sds, ab)
		}
	}
}
