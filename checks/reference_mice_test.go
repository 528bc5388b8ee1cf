package checks_test

import (
	"encoding/json"
	"os"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/pathvet/pathvet/checks/missing"
)

// Rubin's rules with the Barnard–Rubin degrees of freedom, as the pipeline
// calls them (missing.Pool, 95% level), against R's mice:
// testdata/reference/mice/pool_reference.R wrote pool_reference.json with
// mice's pool.scalar, including the coefficients of a model fitted to
// mice's bundled nhanes data after mice's own imputation. Tolerance:
// relative 1e-9 (the file keeps 17 significant digits).
func TestPool_AgreesWithMice(t *testing.T) {
	b, err := os.ReadFile("../testdata/reference/mice/pool_reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Source string `json:"source"`
		Cases  []struct {
			Name     string    `json:"name"`
			Q        []float64 `json:"q"`
			U        []float64 `json:"u"`
			DFCom    float64   `json:"dfcom"`
			Estimate float64   `json:"estimate"`
			StdError float64   `json:"std_error"`
			DF       float64   `json:"df"`
			PValue   float64   `json:"p_value"`
		} `json:"cases"`
	}
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.Cases) == 0 {
		t.Fatalf("%v (%d cases)", err, len(ref.Cases))
	}
	for _, c := range ref.Cases {
		got, err := missing.Pool(c.Q, c.U, c.DFCom, 0.95)
		if err != nil {
			t.Errorf("%s: %v", c.Name, err)
			continue
		}
		for _, v := range []struct {
			what      string
			got, want float64
		}{{"estimate", got.Estimate, c.Estimate}, {"SE", got.StdError, c.StdError}, {"df", got.DF, c.DF}, {"p", got.P, c.PValue}} {
			if !scalar.EqualWithinAbsOrRel(v.got, v.want, 1e-300, 1e-9) {
				t.Errorf("%s %s: pathvet %.12g, mice %.12g (%s)", c.Name, v.what, v.got, v.want, ref.Source)
			}
		}
	}
}
