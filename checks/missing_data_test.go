package checks_test

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

func checkOf(r *checks.Report, id string) checks.CheckResult {
	for _, c := range r.Checks {
		if c.ID == id {
			return c
		}
	}
	return checks.CheckResult{}
}

// The missing-data demo: a predictor missing at random, mean-substituted
// and called non-significant; ML and MI find it significant.
func TestMissingData_Demo(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/sleep-attention/package.json"))
	c := checkOf(r, "missing-data")
	if c.Status != checks.StatusFail || c.Metrics["claims_changed"] != 1 || c.Metrics["mcar_df"] != 2 {
		t.Fatalf("status %s, metrics %v", c.Status, c.Metrics)
	}
	md := r.Claims[0].MissingData
	var keys []string
	for k := range md {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	if strings.Join(keys, ",") != "complete_cases,maximum_likelihood,mean_substitution,multiple_imputation" {
		t.Fatalf("methods %v", keys)
	}
	if *md["mean_substitution"].PValue < 0.05 || *md["multiple_imputation"].PValue > 0.05 ||
		*md["maximum_likelihood"].PValue > 0.05 {
		t.Fatalf(
			"mean substitution p %v, MI p %v, ML p %v",
			*md["mean_substitution"].PValue,
			*md["multiple_imputation"].PValue,
			*md["maximum_likelihood"].PValue,
		)
	}
	if *md["mean_substitution"].Estimate >= *md["maximum_likelihood"].Estimate {
		t.Fatal("mean substitution should attenuate the coefficient")
	}
}

func TestMissingData_SummaryData(t *testing.T) {
	c := checkOf(mustRun(t, MustLoad(t, "../testdata/demo/tutoring-anxiety/package.json")), "missing-data")
	if c.Status != checks.StatusNotApplicable || !strings.Contains(c.Summary, "raw rows") {
		t.Fatalf("%s: %s", c.Status, c.Summary)
	}
}

// Rows without a missing value, from a package that says values were
// mean-substituted: the uploaded rows may be the completed ones.
func TestMissingData_CompletedRowsUploaded(t *testing.T) {
	doc, _ := os.ReadFile("../testdata/demo/sleep-attention/package.json")
	rows := "part_time_job,sleep_hours,attention\n1,6.5,55\n0,7.5,60\n1,6,50\n0,8,62\n1,7,58\n0,7,57\n"
	doc = bytes.Replace(
		doc,
		[]byte(`"file": "rows.csv", "ignore_columns": ["student"]`),
		[]byte(`"csv": "`+strings.ReplaceAll(rows, "\n", `\n`)+`"`),
		1,
	)
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := checks.Run(context.Background(), s, checks.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if c := checkOf(r, "missing-data"); c.Status != checks.StatusWarn ||
		!strings.Contains(c.Findings[0].Message, "completed data") {
		t.Fatalf("%s %+v", c.Status, c.Findings)
	}
}

// rowsPackage is a package over x (continuous), y and z, with the given
// CSV rows inline and the given claims and missing-data method.
func rowsPackage(t *testing.T, csv, yScale, claims, method string) *checks.Report {
	t.Helper()
	doc := `{"format_version": 1, "title": "t", "design": "observational",
		"variables": [{"name": "x", "scale": "continuous"}, {"name": "y", "scale": "` + yScale + `"}, {"name": "z", "scale": "continuous"}],
		"claims": [` + claims + `], "missing_data": {"method": "` + method + `"},
		"data": {"kind": "rows", "csv": "` + strings.ReplaceAll(csv, "\n", `\n`) + `"}}`
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return mustRun(t, s)
}

// Pairwise deletion whose correlation matrix is not positive definite:
// x and y agree where both are seen, y and z agree, x and z disagree.
func TestMissingData_PairwiseNotPositiveDefinite(t *testing.T) {
	var b strings.Builder
	b.WriteString("x,y,z\n")
	for i := range 10 {
		v := float64(i)
		fmt.Fprintf(
			&b,
			"%g,%g,\n%g,,%g\n,%g,%g\n",
			v,
			v+0.1*float64(i%3),
			v,
			-v+0.1*float64(i%2),
			v,
			v+0.1*float64(i%4),
		)
	}
	r := rowsPackage(
		t,
		b.String(),
		"continuous",
		`{"id": "A1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y", "adjust_for": ["z"]}`,
		"available_cases",
	)
	c := checkOf(r, "missing-data")
	if c.Metrics["available_cases_error"] == nil || !strings.Contains(fmt.Sprint(c.Findings), "not positive definite") {
		t.Fatalf("%+v", c.Findings)
	}
}

// A binary outcome with raw rows: a logistic regression, and the odds
// ratio between the 10th and 90th percentile of the predictor equals
// exp(β (x90 − x10)).
// logisticRows draws 400 rows of a binary y with logit 0.8x − 0.2.
func logisticRows() string {
	r := rand.New(rand.NewPCG(3, 3))
	var b strings.Builder
	b.WriteString("x,y,z\n")
	for range 400 {
		x := r.NormFloat64()
		y := 0
		if r.Float64() < 1/(1+math.Exp(-(0.8*x-0.2))) {
			y = 1
		}
		fmt.Fprintf(&b, "%.4f,%d,%.4f\n", x, y, r.NormFloat64())
	}
	return b.String()
}

// The odds-ratio range's interval is at the claim's level, and says so.
func TestEffectReporting_OddsRatioRangeLevel(t *testing.T) {
	rep := rowsPackage(t, logisticRows(), "binary", `{"id": "L1", "text": "x goes with y", "kind": "association",
		"from": "x", "to": "y", "estimate_scale": "odds_ratio", "estimate": 2.2, "ci": [1.8, 2.7], "ci_level": 0.9,
		"p_value": 0.001, "p_relation": "<"}`, "none")
	found := false
	for _, f := range checkOf(rep, "effect-reporting").Findings {
		if strings.HasPrefix(f.Message, "For L1: from the 10th") {
			found = strings.Contains(f.Message, "(90% interval")
			t.Log(f.Message)
		}
	}
	if !found {
		t.Error("no odds-ratio range finding with its 90% interval")
	}
	if rep.Claims[0].OddsRatio == nil || rep.Claims[0].OddsRatio.RangeCI == nil {
		t.Fatalf("no range interval: %+v", rep.Claims[0].OddsRatio)
	}
}

func TestEffectReporting_OddsRatioRange(t *testing.T) {
	rep := rowsPackage(
		t,
		logisticRows(),
		"binary",
		`{"id": "L1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y", "estimate_scale": "odds_ratio", "estimate": 2.2, "ci": [1.7, 2.8], "p_value": 0.001, "p_relation": "<"}`,
		"none",
	)
	cl := rep.Claims[0]
	if cl.Declared.Method != "logistic" || cl.OddsRatio == nil {
		t.Fatalf("declared %+v, odds ratio %+v", cl.Declared, cl.OddsRatio)
	}
	beta := math.Log(*cl.OddsRatio.PerUnit)
	want := math.Exp(beta * (cl.OddsRatio.P90 - cl.OddsRatio.P10))
	if math.Abs(*cl.OddsRatio.Range-want) > 1e-6*want || *cl.OddsRatio.Range < 3 {
		t.Fatalf("range odds ratio %v, want %v", *cl.OddsRatio.Range, want)
	}
	if math.Abs(*cl.Declared.Estimate-*cl.OddsRatio.PerUnit) > 1e-9 {
		t.Fatalf("per-unit odds ratio %v vs declared %v", *cl.OddsRatio.PerUnit, *cl.Declared.Estimate)
	}
}

// A pooled estimate names its distribution, t on the Barnard–Rubin df
// its note prints (report-format.md).
func TestMissingData_PooledDistribution(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/sleep-attention/package.json"))
	for _, c := range r.Claims {
		mi := c.MissingData["multiple_imputation"]
		df := strings.TrimSuffix(strings.TrimPrefix(mi.Distribution, "t("), ")")
		if df == "" || !strings.HasPrefix(mi.Distribution, "t(") ||
			!strings.Contains(mi.Note, "Barnard–Rubin df "+df+";") {
			t.Errorf("%s: distribution %q, note %q", c.ID, mi.Distribution, mi.Note)
		}
	}
}

// blankEvery empties column col (0-based) of every k-th data row of csv.
func blankEvery(csv string, col, k int) string {
	lines := strings.Split(strings.TrimSuffix(csv, "\n"), "\n")
	for i := 1; i < len(lines); i++ {
		if i%k == 0 {
			cells := strings.Split(lines[i], ",")
			cells[col] = ""
			lines[i] = strings.Join(cells, ",")
		}
	}
	return strings.Join(lines, "\n") + "\n"
}

// The imputations keep their rows where a claim needs them: a binary
// outcome is estimated in each imputed dataset by a logistic regression of
// the rows, not by moments; and a binary variable with missing values has
// its draws rounded row by row, which moments alone cannot do.
func TestMissingData_ImputationsKeepRowsWhereNeeded(t *testing.T) {
	claim := `{"id": "L1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y",
		"estimate_scale": "odds_ratio", "estimate": 2.2, "ci": [1.7, 2.8], "p_value": 0.001, "p_relation": "<"}`
	rep := rowsPackage(t, blankEvery(logisticRows(), 0, 6), "binary", claim, "complete_cases")
	mi := rep.Claims[0].MissingData["multiple_imputation"]
	if mi == nil || mi.Scale != "odds_ratio" || !strings.Contains(mi.Note, "log-odds scale") {
		t.Fatalf("binary outcome: multiple-imputation estimate %+v, want odds ratios pooled on the log-odds scale", mi)
	}
	claim = `{"id": "C1", "text": "x goes with z", "kind": "association", "from": "x", "to": "z", "estimate": 0.1, "p_value": 0.2}`
	rep = rowsPackage(t, blankEvery(logisticRows(), 1, 5), "binary", claim, "complete_cases")
	c := checkOf(rep, "missing-data")
	if c.RunError != "" || rep.Claims[0].MissingData["multiple_imputation"] == nil {
		t.Fatalf("binary variable with missing values: %s %q %+v", c.Status, c.RunError, c.Findings)
	}
}
