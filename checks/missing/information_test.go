package missing

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/floats/scalar"
)

// mlSECase is one coefficient of testdata/reference/mlse/ml_se.json, from
// the R SEM reference (testdata/reference/mlse/ml_se.R, Debian's R SEM
// package): full-information ML, observed information.
type mlSECase struct {
	Name, Data, Outcome, Focal, Scale string
	Adjust                            []string
	Estimate                          float64
	StdError                          float64 `json:"std_error"`
}

func mlSECases(tb testing.TB) []mlSECase {
	b, err := os.ReadFile("../../testdata/reference/mlse/ml_se.json")
	if err != nil {
		tb.Fatal(err)
	}
	var ref struct{ Cases []mlSECase }
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.Cases) == 0 {
		tb.Fatalf("reference: %v", err)
	}
	return ref.Cases
}

// referenceColumns reads a reference CSV (header; empty or NA missing),
// naming airquality's columns as the reference script does.
func referenceColumns(tb testing.TB, file string) ([]string, [][]float64) {
	f, err := os.Open(filepath.Join("../../testdata/reference/mlse", file))
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	names := recs[0]
	if filepath.Base(file) == "airquality.csv" {
		names = []string{"ozone", "solar_r", "wind", "temp", "month", "day"}
	}
	cols := make([][]float64, len(names))
	for _, rec := range recs[1:] {
		for j, v := range rec {
			x := math.NaN()
			if v != "" && v != "NA" {
				if x, err = strconv.ParseFloat(v, 64); err != nil {
					tb.Fatal(err)
				}
			}
			cols[j] = append(cols[j], x)
		}
	}
	return names, cols
}

var coefficientOf = map[string]Coefficient{
	"unstandardized": Unstandardized, "standardized": Standardized, "correlation": PartialCorrelation,
}

// The ML estimates and their SEs from the observed information of the
// saturated model, carried to each coefficient by the delta method,
// against the R SEM reference (testdata/reference/mlse/ml_se.R, Debian's
// R SEM package, missing = "ml", observed information) on mtcars with
// only the outcome missing and on airquality's six columns. Tolerance:
// 1e-6 relative for estimates and SEs (seen: 1.2e-7 at worst; EM and the
// reference's optimizer each stop at their own tolerance).
func TestDeltaSE_Reference(t *testing.T) {
	for _, c := range mlSECases(t) {
		names, cols := referenceColumns(t, c.Data)
		em, err := EM(context.Background(), cols, Options{})
		if err != nil {
			t.Fatal(err)
		}
		acov, err := EstimateCovariance(context.Background(), cols, em)
		if err != nil {
			t.Fatal(err)
		}
		x := []int{slices.Index(names, c.Focal)}
		for _, a := range c.Adjust {
			x = append(x, slices.Index(names, a))
		}
		v, se, err := DeltaSE(em.Cov, acov, slices.Index(names, c.Outcome), x, coefficientOf[c.Scale])
		if err != nil {
			t.Fatal(err)
		}
		if !scalar.EqualWithinAbsOrRel(v, c.Estimate, 1e-9, 1e-6) ||
			!scalar.EqualWithinAbsOrRel(se, c.StdError, 1e-9, 1e-6) {
			t.Errorf("%s, %s on %s (%s): %.8g (SE %.8g), reference %.8g (SE %.8g)",
				c.Name, c.Outcome, c.Focal, c.Scale, v, se, c.Estimate, c.StdError)
		}
	}
}

// With complete data the observed information at the MLE is the expected
// one, whose inverse is known in closed form (Anderson 2003, An
// Introduction to Multivariate Statistical Analysis, 3rd ed., sec. 3.4):
// Var μ̂_i = σ_ii/n, Cov(μ̂, Σ̂) = 0, Cov(σ̂_ij, σ̂_kl) = (σ_ik σ_jl + σ_il σ_jk)/n,
// at Σ̂ (divisor n). Tolerance 1e-9 relative.
func TestEstimateCovariance_CompleteDataClosedForm(t *testing.T) {
	_, aq := referenceColumns(t, "../airquality/airquality.csv")
	var cols [][]float64
	for _, j := range []int{2, 3, 4} { // wind, temp, month: complete
		cols = append(cols, aq[j])
	}
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	v, err := EstimateCovariance(context.Background(), cols, em)
	if err != nil {
		t.Fatal(err)
	}
	p, n, s := 3, float64(len(cols[0])), em.Cov.At
	check := func(what string, got, want float64) {
		if !scalar.EqualWithinAbsOrRel(got, want, 1e-12, 1e-9) {
			t.Errorf("%s = %v, closed form %v", what, got, want)
		}
	}
	for i := range p {
		for j := range p {
			check(fmt.Sprintf("Cov(μ%d, μ%d)", i, j), covAt(v, MeanParam(i), MeanParam(j)), s(i, j)/n)
			for k := range p {
				check(fmt.Sprintf("Cov(μ%d, σ%d%d)", i, j, k), covAt(v, MeanParam(i), CovParam(p, j, k)), 0)
				for l := range p {
					check(fmt.Sprintf("Cov(σ%d%d, σ%d%d)", i, j, k, l), covAt(v, CovParam(p, i, j), CovParam(p, k, l)),
						(s(i, k)*s(j, l)+s(i, l)*s(j, k))/n)
				}
			}
		}
	}
}

// covAt is V_ij of c, z_iᵀ z_j with Uᵀ z_i = e_i.
func covAt(c *Covariance, i, j int) float64 {
	fi, zi := c.solve([]int{i}, []float64{1})
	fj, zj := c.solve([]int{j}, []float64{1})
	if fi < fj {
		fi, zi, fj, zj = fj, zj, fi, zi
	}
	return floats.Dot(zi, zj[fi-fj:])
}

// A block of the covariance is its entries (covAt), in the order asked,
// on airquality's incomplete columns. Tolerance 1e-12 relative (the same
// solves, summed in another order).
func TestCovariance_BlockIsItsEntries(t *testing.T) {
	_, aq := referenceColumns(t, "../airquality/airquality.csv")
	em, err := EM(context.Background(), aq, Options{})
	if err != nil {
		t.Fatal(err)
	}
	v, err := EstimateCovariance(context.Background(), aq, em)
	if err != nil {
		t.Fatal(err)
	}
	idx := []int{CovParam(6, 4, 1), MeanParam(0), CovParam(6, 0, 0), CovParam(6, 5, 2), MeanParam(3)}
	b := v.Block(idx)
	for x, i := range idx {
		for y, j := range idx {
			if got, want := b.At(x, y), covAt(v, i, j); !scalar.EqualWithinAbsOrRel(got, want, 1e-15, 1e-12) {
				t.Errorf("block[%d][%d] = %v, V[%d][%d] = %v", x, y, got, i, j, want)
			}
		}
	}
}

// The information refuses what it cannot hold, and stops with its context.
func TestObservedInformation_BoundsAndContext(t *testing.T) {
	_, aq := referenceColumns(t, "../airquality/airquality.csv")
	em, err := EM(context.Background(), aq, Options{})
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := ObservedInformation(ctx, aq, em); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
	wide := make([][]float64, MaxInformationVariables+1)
	for j := range wide {
		wide[j] = aq[j%len(aq)]
	}
	if _, err := ObservedInformation(context.Background(), wide, em); !errors.Is(err, ErrInformationTooLarge) {
		t.Errorf("%d variables: %v", len(wide), err)
	}
}
