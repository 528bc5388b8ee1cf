package checks_test

import (
	"context"
	"fmt"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// Progress hears of every check before it runs, of the end, and of each
// imputation of the missing-data check, counting up to its total.
func TestRun_Progress(t *testing.T) {
	var got []string
	opt := checks.Options{Now: fixedNow, Progress: func(stage string, done, total int) {
		got = append(got, fmt.Sprintf("%s %d/%d", stage, done, total))
	}}
	if _, err := checks.Run(context.Background(), MustLoad(t, "../testdata/demo/sleep-attention/package.json"), opt); err != nil {
		t.Fatal(err)
	}
	n := len(checks.Pipeline())
	if want := fmt.Sprintf("checks %d/%d", n, n); got[len(got)-1] != want {
		t.Errorf("last call %q, want %q", got[len(got)-1], want)
	}
	if want := fmt.Sprintf("checks (now: Missing data) %d/%d", slices.IndexFunc(checks.Pipeline(),
		func(c checks.Check) bool { return c.ID == "missing-data" }), n); !slices.Contains(got, want) {
		t.Errorf("no %q in %q", want, got)
	}
	var imps []string
	for _, s := range got {
		if strings.HasPrefix(s, "missing data: imputations ") {
			imps = append(imps, s)
		}
	}
	if len(imps) != checks.Imputations ||
		imps[len(imps)-1] != fmt.Sprintf("missing data: imputations %d/%d", checks.Imputations, checks.Imputations) {
		t.Errorf("imputation progress %q", imps)
	}
}

// The percentile bootstrap of an indirect effect with raw rows reports
// its resamples as the imputations do, counting up to Options.Resamples,
// which sets how many it draws (the declared interval's draws and
// failures add up to it).
func TestRun_BootstrapProgressAndResamples(t *testing.T) {
	var got []string
	opt := checks.Options{Now: fixedNow, Resamples: 300, Progress: func(stage string, done, total int) {
		if strings.HasPrefix(stage, "indirect effect W1: bootstrap resamples") {
			got = append(got, fmt.Sprintf("%d/%d", done, total))
		}
	}}
	r, err := checks.Run(context.Background(), MustLoad(t, "../testdata/demo/mentoring-waves/package.json"), opt)
	if err != nil {
		t.Fatal(err)
	}
	if len(got) == 0 || got[len(got)-1] != "300/300" {
		t.Errorf("bootstrap progress %q", got)
	}
	sig := claimByID(r, "W1").Declared.Significance
	if sig == nil || sig.Method != checks.IntervalBootstrap || sig.Draws+sig.Failed != 300 {
		t.Errorf("significance %+v, want the bootstrap's 300 resamples", sig)
	}
}
