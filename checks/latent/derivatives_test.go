package latent

import (
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"
)

// The analytic gradient of F_ML against central differences of F_ML
// (gonum's diff/fd), on random models with loadings, paths, an observed
// structural variable, residual and source covariances, at a point that
// is not the minimum.
func TestGradient_FiniteDifferences(t *testing.T) {
	r := rand.New(rand.NewPCG(19, 1))
	for trial := range 20 {
		spec := randomSpec(r, 2+r.IntN(3), 0.5, trial%2 == 0)
		l, err := newLayout(spec)
		if err != nil {
			t.Fatal(err)
		}
		s := randomCovariance(spec, r, 200)
		var ch mat.Cholesky
		ch.Factorize(s)
		theta := randomTheta(l, r)
		f := func(x []float64) float64 { return l.newState(x, s, ch.LogDet()).f }
		want := fd.Gradient(nil, f, theta, &fd.Settings{Formula: fd.Central, Step: 1e-6})
		got := make([]float64, len(theta))
		l.gradient(l.newState(theta, s, ch.LogDet()), s, got)
		for i := range got {
			// central differences at h = 1e-6: error about h² f''' + ε/h
			if !close(got[i], want[i], 1e-7, 1e-5) {
				t.Errorf("trial %d, %v: analytic %.10g, differences %.10g", trial, l.params[i], got[i], want[i])
			}
		}
	}
}

// At S = Σ(θ) the expected information is the Hessian of F_ML (Browne
// 1974): central differences of the analytic gradient give it.
func TestInformation_IsHessianAtExactFit(t *testing.T) {
	r := rand.New(rand.NewPCG(19, 2))
	for trial := range 10 {
		spec := randomSpec(r, 2+r.IntN(3), 0.5, trial%2 == 1)
		l, err := newLayout(spec)
		if err != nil {
			t.Fatal(err)
		}
		theta := randomTheta(l, r)
		s := l.newState(theta, mat.NewSymDense(l.p, nil), 0).sigma
		var ch mat.Cholesky
		ch.Factorize(s)
		grad := func(g, x []float64) { l.gradient(l.newState(x, s, ch.LogDet()), s, g) }
		q := len(theta)
		want := mat.NewDense(q, q, nil)
		fd.Jacobian(want, grad, theta, &fd.JacobianSettings{Formula: fd.Central, Step: 1e-6})
		got := mat.NewSymDense(q, nil)
		l.information(l.newState(theta, s, ch.LogDet()), got)
		for a := range q {
			for b := range q {
				if !close(got.At(a, b), want.At(a, b), 1e-6, 1e-5) {
					t.Errorf("trial %d, H[%v, %v] = %.10g, differences %.10g", trial, l.params[a], l.params[b],
						got.At(a, b), want.At(a, b))
				}
			}
		}
	}
}

// The exact Hessian against central differences of the analytic
// gradient, away from the minimum and with S ≠ Σ(θ), where it differs
// from the expected information.
func TestHessian_FiniteDifferences(t *testing.T) {
	r := rand.New(rand.NewPCG(19, 3))
	for trial := range 10 {
		spec := randomSpec(r, 2+r.IntN(3), 0.5, trial%2 == 0)
		l, err := newLayout(spec)
		if err != nil {
			t.Fatal(err)
		}
		s := randomCovariance(spec, r, 100)
		var ch mat.Cholesky
		ch.Factorize(s)
		theta := randomTheta(l, r)
		grad := func(g, x []float64) { l.gradient(l.newState(x, s, ch.LogDet()), s, g) }
		q := len(theta)
		want := mat.NewDense(q, q, nil)
		fd.Jacobian(want, grad, theta, &fd.JacobianSettings{Formula: fd.Central, Step: 1e-6})
		got, exp := mat.NewSymDense(q, nil), mat.NewSymDense(q, nil)
		l.hessian(l.newState(theta, s, ch.LogDet()), s, got)
		l.information(l.newState(theta, s, ch.LogDet()), exp)
		differs := false
		for a := range q {
			for b := range q {
				if !close(got.At(a, b), want.At(a, b), 1e-6, 1e-5) {
					t.Errorf("trial %d, H[%v, %v] = %.10g, differences %.10g", trial, l.params[a], l.params[b],
						got.At(a, b), want.At(a, b))
				}
				differs = differs || !close(exp.At(a, b), want.At(a, b), 1e-3, 1e-3)
			}
		}
		if !differs {
			t.Errorf("trial %d: the expected information is the Hessian here; the test shows nothing", trial)
		}
	}
}
