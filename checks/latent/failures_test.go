package latent

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
)

var bg = context.Background()

// oneFactor3 is a one-factor model of three items with a Heywood
// solution in closed form: a just-identified model reproduces S, so
// φ = s12 s13/s23 = .8 × .7/.4 = 1.4, θ1 = 1 − φ = −0.4 and x1's
// standardized loading is sqrt(1.4) = 1.18322.
var oneFactor3 = mat.NewSymDense(3, []float64{1, .8, .7, .8, 1, .4, .7, .4, 1})

func TestFit_HeywoodCase(t *testing.T) {
	res, err := Fit(bg, oneFactor3, 200, Spec{Observed: 3, Indicators: [][]int{{0, 1, 2}}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Proper || !close(res.Cov.At(0, 0), -0.4, 1e-9, 0) || !close(res.StdCoef.At(0, 3), math.Sqrt(1.4), 1e-9, 0) {
		t.Fatalf("θ1 %.6f, std loading %.6f, proper %v", res.Cov.At(0, 0), res.StdCoef.At(0, 3), res.Proper)
	}
	want := []ProblemKind{NegativeVariance, LoadingAboveOne}
	var got []ProblemKind
	for _, p := range res.Problems {
		got = append(got, p.Kind)
		if p.To != 0 {
			t.Errorf("problem %v names node %d, want x1 (0)", p, p.To)
		}
	}
	if !slices.Equal(got, want) || res.Fit.DF != 0 || res.Fit.ChiSquare > 1e-9 {
		t.Errorf("problems %v, df %d, χ² %g", res.Problems, res.Fit.DF, res.Fit.ChiSquare)
	}
}

// Two factors of three items, correlations .3 within and .5 between:
// the exact fit (loadings 1, φ11 = φ22 = .3, φ12 = .5, θ = .7) has a
// latent correlation of .5/.3 > 1.
func TestFit_LatentCovarianceNotPD(t *testing.T) {
	s := mat.NewSymDense(6, nil)
	for i := range 6 {
		for j := range 6 {
			switch {
			case i == j:
				s.SetSym(i, j, 1)
			case i/3 == j/3:
				s.SetSym(i, j, .3)
			default:
				s.SetSym(i, j, .5)
			}
		}
	}
	res, err := Fit(bg, s, 300, Spec{Observed: 6, Indicators: [][]int{{0, 1, 2}, {3, 4, 5}}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.Proper || len(res.Problems) != 1 || res.Problems[0].Kind != LatentCovarianceNotPD {
		t.Fatalf("problems %v", res.Problems)
	}
	if !close(res.Cov.At(7, 6), .5, 1e-8, 0) || !close(res.Cov.At(6, 6), .3, 1e-8, 0) {
		t.Errorf("φ12 %.6f, φ11 %.6f", res.Cov.At(7, 6), res.Cov.At(6, 6))
	}
}

// A single latent with two items: 3 moments, 4 parameters.
func TestFit_TwoIndicatorSingleLatent(t *testing.T) {
	s := mat.NewSymDense(2, []float64{1, .5, .5, 1})
	_, err := Fit(bg, s, 100, Spec{Observed: 2, Indicators: [][]int{{0, 1}}}, nil)
	var ue *UnidentifiedError
	if !errors.As(err, &ue) || ue.Reason != TooFewIndicators || ue.Latent != 0 || ue.Indicators != 2 {
		t.Fatalf("err %v", err)
	}
	one := Spec{Observed: 4, Indicators: [][]int{{0, 1, 2}, {3}}}
	if _, err := Fit(bg, oneFactor4(), 100, one, nil); !errors.As(err, &ue) || ue.Reason != TooFewIndicators ||
		ue.Latent != 1 || !strings.Contains(err.Error(), "one indicator") {
		t.Fatalf("one indicator: %v", err)
	}
}

// oneFactor4 is the exact covariance of four items with loadings .8, .7,
// .6, .5 on one standardized factor.
func oneFactor4() *mat.SymDense {
	lam := []float64{.8, .7, .6, .5}
	s := mat.NewSymDense(4, nil)
	for i := range 4 {
		for j := range 4 {
			s.SetSym(i, j, lam[i]*lam[j])
		}
		s.SetSym(i, i, 1)
	}
	return s
}

// Two latents of two items each, joined by a path, are identified (the
// two-indicator rule; Bollen 1989, ch. 7); cut the path and they are not.
func TestFit_TwoIndicatorsJoined(t *testing.T) {
	spec := Spec{Observed: 4, Indicators: [][]int{{0, 1}, {2, 3}}, Parents: [][]int{5: {4}}}
	if _, err := Fit(bg, oneFactor4(), 300, spec, nil); err != nil {
		t.Fatalf("joined: %v", err)
	}
	spec.Parents, spec.IndependentSources = nil, true
	var ue *UnidentifiedError
	if _, err := Fit(bg, oneFactor4(), 300, spec, nil); !errors.As(err, &ue) || ue.Reason != TooFewIndicators {
		t.Fatalf("cut: %v", err)
	}
}

func TestFit_NegativeDF(t *testing.T) {
	spec := Spec{Observed: 3, Indicators: [][]int{{0, 1, 2}}, ResidualCovariances: [][2]int{{0, 1}}}
	var ue *UnidentifiedError
	if _, err := Fit(bg, oneFactor3, 100, spec, nil); !errors.As(err, &ue) || ue.Reason != NegativeDF || ue.DF != -1 {
		t.Fatalf("err %v", err)
	}
}

// Three items whose residuals all covary, beside a second factor of four
// items: df = 28 − 18 = 10, but the first factor's variance cannot be
// told from its items' residual (co)variances.
func TestFit_SingularInformation(t *testing.T) {
	spec := Spec{Observed: 7, Indicators: [][]int{{0, 1, 2}, {3, 4, 5, 6}},
		ResidualCovariances: [][2]int{{0, 1}, {0, 2}, {1, 2}}}
	s := randomCovariance(Spec{Observed: 7, Indicators: spec.Indicators}, rand.New(rand.NewPCG(4, 4)), 500)
	_, err := Fit(bg, s, 500, spec, nil)
	var ue *UnidentifiedError
	if !errors.As(err, &ue) || ue.Reason != SingularInformation {
		t.Fatalf("err %v", err)
	}
	for _, want := range []Param{{Variance, 7, 7}, {Covariance, 1, 0}, {Covariance, 2, 0}, {Covariance, 2, 1}} {
		if !slices.Contains(ue.Params, want) {
			t.Errorf("%v not named among %v", want, ue.Params)
		}
	}
	for _, p := range ue.Params {
		if p.To >= 3 && p.To != 7 {
			t.Errorf("%v named, but the second factor is identified", p)
		}
	}
}

// A start far from the solution with a small iteration limit; a start
// whose implied covariance is not positive definite.
func TestFit_NonConvergingStart(t *testing.T) {
	spec := Spec{Observed: 4, Indicators: [][]int{{0, 1, 2, 3}}}
	start := []float64{40, -30, 25, 1, 1, 1, 1, 1} // 3 loadings, 4 residual variances, the latent's variance
	_, err := Fit(bg, oneFactor4(), 100, spec, &Options{Start: start, MaxIterations: 3})
	var ne *NotConvergedError
	if !errors.As(err, &ne) || ne.Iterations != 3 || !(ne.GradientNorm > 0) || ne.Cause != msgIterations {
		t.Fatalf("err %v", err)
	}
	start = []float64{1, 1, 1, -1, 1, 1, 1, 1}
	if _, err := Fit(bg, oneFactor4(), 100, spec, &Options{Start: start}); !errors.As(err, &ne) ||
		ne.Cause != msgStartNotPD {
		t.Fatalf("err %v", err)
	}
	if _, err := Fit(bg, oneFactor4(), 100, spec, &Options{Start: start[:3]}); err == nil {
		t.Fatal("a short start vector was taken")
	}
}
