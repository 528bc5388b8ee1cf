package checks_test

import (
	"context"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// The statuses each check can end with, read from its code: a check that
// gains a status must declare its summary, and this table says so.
var checkStatuses = map[string][]string{
	"graph-declared":          {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
	"graph-fit":               {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
	"equivalence":             {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
	"alternatives":            {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
	"nearby-graphs":           {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
	"missing-data":            {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
	"effect-reporting":        {checks.StatusPass, checks.StatusWarn, checks.StatusFail},
	"confounding-sensitivity": {checks.StatusPass, checks.StatusWarn, checks.StatusNotApplicable},
	"measurement":             {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
	"causal-language":         {checks.StatusPass, checks.StatusWarn, checks.StatusFail, checks.StatusNotApplicable},
}

// Every status of every check has its summary in the check's declaration.
func TestPipeline_EveryStatusHasASummary(t *testing.T) {
	for _, c := range checks.Pipeline() {
		want, ok := checkStatuses[c.ID]
		if !ok {
			t.Errorf("%s: not in the table of statuses", c.ID)
		}
		for _, st := range want {
			if strings.TrimSpace(c.Summaries[st]) == "" {
				t.Errorf("%s: no summary for %s", c.ID, st)
			}
		}
		for st := range c.Summaries {
			if !slices.Contains(want, st) {
				t.Errorf("%s: a summary for %s, which it cannot end with", c.ID, st)
			}
		}
	}
}

// A check that ends with a status it declares no summary for is reported
// as an internal error, never with an empty summary.
func TestRun_UndeclaredStatusIsAnError(t *testing.T) {
	c := checks.Check{ID: "graph-fit", Title: "Undeclared", Summaries: map[string]string{checks.StatusPass: "Fine."},
		Run: func(context.Context, *checks.Analysis) (checks.CheckResult, error) {
			return checks.CheckResult{Status: checks.StatusWarn}, nil
		}}
	r := runWith(t, "../testdata/demo/tutoring-anxiety/package.json", []checks.Check{c})
	if got := r.Checks[0]; got.Status != checks.StatusFail || !strings.Contains(got.RunError, "declares no summary") {
		t.Fatalf("%+v", got)
	}
	for _, path := range demoPackages(t) {
		for _, c := range mustRun(t, MustLoad(t, path)).Checks {
			if c.Summary == "" {
				t.Errorf("%s %s: empty summary", path, c.ID)
			}
		}
	}
}
