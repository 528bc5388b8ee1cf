package checks_test

import (
	"bytes"
	"context"
	"os"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
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
	if *md["mean_substitution"].PValue < 0.05 || *md["multiple_imputation"].PValue > 0.05 || *md["maximum_likelihood"].PValue > 0.05 {
		t.Fatalf("mean substitution p %v, MI p %v, ML p %v", *md["mean_substitution"].PValue, *md["multiple_imputation"].PValue, *md["maximum_likelihood"].PValue)
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
	doc = bytes.Replace(doc, []byte(`"file": "rows.csv", "ignore_columns": ["student"]`), []byte(`"csv": "`+strings.ReplaceAll(rows, "\n", `\n`)+`"`), 1)
	s, err := checks.Load(doc, checks.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := checks.Run(context.Background(), s, checks.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if c := checkOf(r, "missing-data"); c.Status != checks.StatusWarn || !strings.Contains(c.Findings[0].Message, "completed data") {
		t.Fatalf("%s %+v", c.Status, c.Findings)
	}
}
