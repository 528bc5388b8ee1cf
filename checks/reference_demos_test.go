package checks_test

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// demoFigures are the demos' key figures as
// testdata/reference/demos/make_figures.py recomputed them with
// statsmodels, scipy and numpy (none of pathvet's code).
type demoFigures struct {
	CompleteCases *int `json:"complete_cases"`
	Claims        map[string]struct {
		Estimate float64    `json:"estimate"`
		StdError *float64   `json:"std_error"`
		PValue   float64    `json:"p_value"`
		CI       [2]float64 `json:"ci"`
		// Indirect: an indirect effect, whose p-value is none and whose
		// intervals are random draws, so only its estimate and SE are
		// recomputed.
		Indirect bool `json:"indirect"`
	} `json:"claims"`
	Fit map[string]float64 `json:"fit"`
}

// The golden reports agree with the outside recomputation: each claim's
// estimate, SE, p and interval under the declared graph (an indirect
// effect's estimate and delta-method SE, summed path by path), the
// complete cases, and the fit (χ², df, p, RMSEA, CFI, χ²-based AIC and BIC).
// Tolerance: relative 1e-6 (the reports keep 10 significant digits; the
// summary demos are fitted by statsmodels on synthetic rows whose sample
// correlations equal the printed ones to rounding).
func TestGolden_AgreesWithOutsideFigures(t *testing.T) {
	b, err := os.ReadFile("../testdata/reference/demos/figures.json")
	if err != nil {
		t.Fatal(err)
	}
	var all map[string]json.RawMessage
	if err := json.Unmarshal(b, &all); err != nil {
		t.Fatal(err)
	}
	for _, path := range demoPackages(t) {
		demo := filepath.Base(filepath.Dir(path))
		var want demoFigures
		if err := json.Unmarshal(all[demo], &want); err != nil || len(want.Claims) == 0 {
			t.Fatalf("%s: no figures (%v); rerun make_figures.py", demo, err)
		}
		golden := readGolden(t, filepath.Join(filepath.Dir(path), "report.golden.json"))
		compareDemo(t, demo, golden, want)
	}
}

type goldenReport struct {
	Data struct {
		CompleteCases int `json:"complete_cases"`
	} `json:"data"`
	Checks []struct {
		ID      string         `json:"id"`
		Metrics map[string]any `json:"metrics"`
	} `json:"checks"`
	Claims []struct {
		ID       string `json:"id"`
		Declared struct {
			Estimate *float64  `json:"estimate"`
			StdError *float64  `json:"std_error"`
			PValue   *float64  `json:"p_value"`
			CI       []float64 `json:"ci"`
		} `json:"declared"`
	} `json:"claims"`
}

func readGolden(tb testing.TB, path string) goldenReport {
	tb.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	var g goldenReport
	if err := json.Unmarshal(b, &g); err != nil {
		tb.Fatal(err)
	}
	return g
}

func compareDemo(t *testing.T, demo string, g goldenReport, want demoFigures) {
	near := func(what string, got *float64, w float64) {
		t.Helper()
		if got == nil || !scalar.EqualWithinAbsOrRel(*got, w, 1e-12, 1e-6) {
			t.Errorf("%s %s: report %v, outside %v", demo, what, deref(got), w)
		}
	}
	if want.CompleteCases != nil && g.Data.CompleteCases != *want.CompleteCases {
		t.Errorf("%s: %d complete cases, outside %d", demo, g.Data.CompleteCases, *want.CompleteCases)
	}
	for _, c := range g.Claims {
		w, ok := want.Claims[c.ID]
		if !ok {
			t.Errorf("%s %s: no outside figures", demo, c.ID)
			continue
		}
		d := c.Declared
		near(c.ID+" estimate", d.Estimate, w.Estimate)
		if w.StdError != nil {
			near(c.ID+" SE", d.StdError, *w.StdError)
		}
		if w.Indirect {
			if d.PValue != nil {
				t.Errorf("%s %s: an indirect effect with a p-value %v", demo, c.ID, *d.PValue)
			}
			continue
		}
		near(c.ID+" p", d.PValue, w.PValue)
		if len(d.CI) != 2 {
			t.Errorf("%s %s: no interval", demo, c.ID)
			continue
		}
		near(c.ID+" CI low", &d.CI[0], w.CI[0])
		near(c.ID+" CI high", &d.CI[1], w.CI[1])
	}
	for _, c := range g.Checks {
		if c.ID != "graph-fit" {
			continue
		}
		for key, w := range want.Fit {
			got, ok := c.Metrics[key].(float64)
			if key == "n" {
				continue
			}
			if !ok {
				t.Errorf("%s fit %s: report %v", demo, key, c.Metrics[key])
				continue
			}
			near("fit "+key, &got, w)
		}
	}
}

func deref(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}
