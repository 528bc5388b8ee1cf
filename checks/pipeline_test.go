package checks_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/pathvet/pathvet/checks"
)

var update = flag.Bool("update", false, "rewrite the golden reports in testdata/demo")

// fixedNow is the clock of every golden report.
func fixedNow() time.Time { return time.Date(2026, 1, 2, 3, 4, 5, 0, time.UTC) }

func encode(tb testing.TB, r *checks.Report) []byte {
	tb.Helper()
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(r); err != nil {
		tb.Fatal(err)
	}
	return b.Bytes()
}

func mustRun(tb testing.TB, s *checks.Study) *checks.Report {
	tb.Helper()
	r, err := checks.Run(context.Background(), s, checks.Options{Now: fixedNow})
	if err != nil {
		tb.Fatal(err)
	}
	return r
}

// Golden reports for the demo packages: go test ./checks -update rewrites
// them; review the diff before committing.
func TestRun_Golden(t *testing.T) {
	for _, path := range demoPackages(t) {
		t.Run(filepath.Base(filepath.Dir(path)), func(t *testing.T) {
			got := encode(t, mustRun(t, MustLoad(t, path)))
			golden := filepath.Join(filepath.Dir(path), "report.golden.json")
			if *update {
				if err := os.WriteFile(golden, got, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test ./checks -update to create it)", err)
			}
			if !bytes.Equal(got, want) {
				t.Errorf("report differs from %s; run go test ./checks -update and review the diff", golden)
			}
		})
	}
}

// The same package gives the same report, byte for byte apart from the
// time stamp.
func TestRun_Deterministic(t *testing.T) {
	for _, path := range demoPackages(t) {
		a := mustRun(t, MustLoad(t, path))
		b, err := checks.Run(context.Background(), MustLoad(t, path), checks.Options{})
		if err != nil {
			t.Fatal(err)
		}
		b.GeneratedAt = a.GeneratedAt
		if !bytes.Equal(encode(t, a), encode(t, b)) {
			t.Errorf("%s: two runs differ", path)
		}
	}
}

func TestRun_PanickingCheckIsReported(t *testing.T) {
	s := MustLoad(t, "../testdata/demo/tutoring-anxiety/package.json")
	boom := checks.Check{
		ID:    "graph-fit",
		Title: "Boom",
		Run: func(context.Context, *checks.Analysis) (checks.CheckResult, error) {
			panic("deliberate")
		},
	}
	broken := checks.Check{
		ID:    "alternatives",
		Title: "Broken",
		Run: func(context.Context, *checks.Analysis) (checks.CheckResult, error) {
			return checks.CheckResult{Status: checks.StatusPass, Metrics: map[string]any{"x": func() {}}}, nil
		},
	}
	r, err := checks.Run(context.Background(), s, checks.Options{Checks: append(checks.Pipeline(), boom, broken)})
	if err != nil {
		t.Fatal(err)
	}
	n := len(r.Checks)
	for _, c := range r.Checks[n-2:] {
		if c.Status != checks.StatusFail || c.RunError == "" {
			t.Errorf("%s: status %s, run error %q", c.ID, c.Status, c.RunError)
		}
	}
	if _, err := json.Marshal(r); err != nil {
		t.Fatalf("report with a failed check does not encode: %v", err)
	}
	if r.Checks[0].Status == checks.StatusFail && r.Checks[0].RunError != "" {
		t.Error("the other checks should still run")
	}
}

func TestRun_Cancelled(t *testing.T) {
	s := MustLoad(t, "../testdata/demo/tutoring-anxiety/package.json")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := checks.Run(ctx, s, checks.Options{}); !errors.Is(err, context.Canceled) {
		t.Fatalf("got %v, want context.Canceled", err)
	}
}

// A declared graph that is complete on four variables has 24 equivalent
// graphs (4!, every order of the variables).
func TestRun_CompleteGraphOnFour(t *testing.T) {
	r := mustRun(t, MustLoad(t, "../testdata/demo/tutoring-anxiety/package.json"))
	if r.Graph == nil || r.Graph.EquivalenceClassSize != int64(24) {
		t.Fatalf("class size %v, want 24", r.Graph)
	}
	if r.Graph.PlausibleClassSize != int64(6) { // long_commute exogenous: 3! orders of the rest
		t.Fatalf("plausible size %v, want 6", r.Graph.PlausibleClassSize)
	}
	if len(r.Graph.EquivalentDAGs) != 24 || r.Graph.EquivalentDAGsTruncated {
		t.Fatalf("listed %d members", len(r.Graph.EquivalentDAGs))
	}
}

func TestScore_Bands(t *testing.T) {
	for _, tc := range []struct {
		score int
		band  string
	}{{100, checks.BandLow}, {80, checks.BandLow}, {79, checks.BandModerate}, {50, checks.BandModerate}, {49, checks.BandHigh}, {0, checks.BandHigh}} {
		if got := checks.Band(tc.score); got != tc.band {
			t.Errorf("Band(%d) = %s, want %s", tc.score, got, tc.band)
		}
	}
}
