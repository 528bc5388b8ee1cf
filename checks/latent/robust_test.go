package latent

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// Random models of 2 to 6 latents, with and without an observed
// structural variable, sources free or independent, fitted to data
// simulated from them: the composite-correlation start converges, and
// BFGS reaches the same minimum.
func TestFit_RandomModelsConverge(t *testing.T) {
	r := rand.New(rand.NewPCG(19, 7))
	for trial := range 40 {
		spec := randomSpec(r, 2+r.IntN(5), r.Float64(), trial%2 == 0)
		spec.IndependentSources = trial%3 == 0
		n := 100 + r.IntN(900)
		s := randomCovariance(spec, r, n)
		a, err := Fit(bg, s, n, spec, nil)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		b, err := Fit(bg, s, n, spec, &Options{Method: QuasiNewton})
		if err != nil {
			t.Fatalf("trial %d BFGS: %v", trial, err)
		}
		if math.Abs(a.Fit.ChiSquare-b.Fit.ChiSquare) > 1e-8 {
			t.Errorf("trial %d: χ² %.10f by scoring, %.10f by BFGS", trial, a.Fit.ChiSquare, b.Fit.ChiSquare)
		}
		if a.Iterations > 30 {
			t.Errorf("trial %d: %d iterations", trial, a.Iterations)
		}
	}
}

// ML is scale free (Bollen 1989, ch. 4): the correlation matrix of the
// same data gives the same χ², SRMR and standardized solution.
func TestFit_CorrelationInput(t *testing.T) {
	m := referenceModels["poldem"]
	s, n := covariance(readColumns(t, "poldem.csv", m.columns), Wishart)
	p := s.SymmetricDim()
	rm := mat.NewSymDense(p, nil)
	for i := range p {
		for j := 0; j <= i; j++ {
			rm.SetSym(i, j, s.At(i, j)/math.Sqrt(s.At(i, i)*s.At(j, j)))
		}
	}
	a, err := Fit(bg, s, n, m.spec(), nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := Fit(bg, rm, n, m.spec(), nil)
	if err != nil {
		t.Fatal(err)
	}
	if !close(a.Fit.ChiSquare, b.Fit.ChiSquare, 1e-9, 1e-10) || !close(a.Fit.SRMR, b.Fit.SRMR, 1e-12, 1e-9) {
		t.Errorf("χ² %.10f vs %.10f, SRMR %.8f vs %.8f", a.Fit.ChiSquare, b.Fit.ChiSquare, a.Fit.SRMR, b.Fit.SRMR)
	}
	for i, e := range a.Params {
		if !close(e.Std, b.Params[i].Std, 1e-9, 1e-7) {
			t.Errorf("%v: standardized %.8f vs %.8f", e.Param, e.Std, b.Params[i].Std)
		}
	}
}
