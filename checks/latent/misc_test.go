package latent

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/mat"
)

func TestSpec_Errors(t *testing.T) {
	for _, c := range []struct {
		name  string
		spec  Spec
		field string
		index int
	}{
		{"no latent", Spec{Observed: 3}, "Indicators", 0},
		{"empty latent", Spec{Observed: 3, Indicators: [][]int{{0, 1, 2}, {}}}, "Indicators", 1},
		{"out of range", Spec{Observed: 3, Indicators: [][]int{{0, 1, 3}}}, "Indicators", 0},
		{"cross-loading", Spec{Observed: 4, Indicators: [][]int{{0, 1, 2}, {2, 3}}}, "Indicators", 1},
		{"indicator as parent", Spec{Observed: 4, Indicators: [][]int{{0, 1, 2}}, Parents: [][]int{4: {0}}},
			"Parents", 4},
		{"arrow into an indicator", Spec{Observed: 4, Indicators: [][]int{{0, 1, 2}}, Parents: [][]int{1: {3}}},
			"Parents", 1},
		{"cycle", Spec{Observed: 6, Indicators: [][]int{{0, 1, 2}, {3, 4, 5}}, Parents: [][]int{6: {7}, 7: {6}}},
			"Parents", 7},
		{"self-loop", Spec{Observed: 3, Indicators: [][]int{{0, 1, 2}}, Parents: [][]int{3: {3}}}, "Parents", 3},
		{"long cycle", Spec{Observed: 9, Indicators: [][]int{{0, 1, 2}, {3, 4, 5}, {6, 7, 8}},
			Parents: [][]int{9: {11}, 10: {9}, 11: {10}}}, "Parents", 0},
		{"residual covariance of a non-indicator", Spec{Observed: 4, Indicators: [][]int{{0, 1, 2}},
			ResidualCovariances: [][2]int{{0, 3}}}, "ResidualCovariances", 0},
		{"residual covariance twice", Spec{Observed: 3, Indicators: [][]int{{0, 1, 2}},
			ResidualCovariances: [][2]int{{0, 1}, {1, 0}}}, "ResidualCovariances", 1},
	} {
		_, err := Parameters(c.spec)
		var se *SpecError
		if !errors.As(err, &se) || se.Field != c.field || se.Index != c.index {
			t.Errorf("%s: %v, want %s[%d]", c.name, err, c.field, c.index)
		}
	}
}

// The parameter order Parameters documents.
func TestParameters_Order(t *testing.T) {
	spec := Spec{Observed: 7, Indicators: [][]int{{0, 1, 2}, {3, 4, 5}}, Parents: [][]int{8: {7, 6}},
		ResidualCovariances: [][2]int{{2, 5}}}
	got, err := Parameters(spec)
	if err != nil {
		t.Fatal(err)
	}
	want := []Param{{Loading, 1, 7}, {Loading, 2, 7}, {Loading, 4, 8}, {Loading, 5, 8}, {Path, 8, 7}, {Path, 8, 6}}
	for v := range 9 {
		want = append(want, Param{Variance, v, v})
	}
	want = append(want, Param{Covariance, 5, 2}, Param{Covariance, 7, 6}) // sources 6 (observed) and 7
	if !slices.Equal(got, want) {
		t.Fatalf("got %v\nwant %v", got, want)
	}
}

func TestFit_BadSample(t *testing.T) {
	spec := Spec{Observed: 3, Indicators: [][]int{{0, 1, 2}}}
	singular := mat.NewSymDense(3, []float64{1, 1, 0, 1, 1, 0, 0, 0, 1})
	if _, err := Fit(bg, singular, 100, spec, nil); !errors.Is(err, ErrNotPositiveDefinite) {
		t.Errorf("singular S: %v", err)
	}
	if _, err := Fit(bg, oneFactor4(), 100, spec, nil); err == nil {
		t.Error("a 4 × 4 S for 3 variables was taken")
	}
}

// countdown is a context whose Err turns to Canceled at its n-th call.
type countdown struct {
	context.Context
	n int
}

func (c *countdown) Err() error {
	if c.n--; c.n <= 0 {
		return context.Canceled
	}
	return nil
}

// Scoring watches ctx at each iteration: a saturated model (no RMSEA
// interval, whose root finding also watches it) stops on the second.
func TestFit_ContextCancelled(t *testing.T) {
	spec := Spec{Observed: 3, Indicators: [][]int{{0, 1, 2}}}
	ctx := &countdown{Context: context.Background(), n: 2}
	if _, err := Fit(ctx, oneFactor3, 100, spec, nil); !errors.Is(err, context.Canceled) {
		t.Errorf("scoring: %v", err)
	}
	ctx = &countdown{Context: context.Background(), n: 2}
	if _, err := Fit(ctx, oneFactor3, 100, spec, &Options{Method: QuasiNewton}); !errors.Is(err, context.Canceled) {
		t.Errorf("BFGS: %v", err)
	}
}

func TestFit_WarmMismatch(t *testing.T) {
	a, err := Fit(bg, oneFactor4(), 100, Spec{Observed: 4, Indicators: [][]int{{0, 1, 2, 3}}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	other := Spec{Observed: 4, Indicators: [][]int{{0, 1, 2, 3}}, ResidualCovariances: [][2]int{{0, 1}}}
	if _, err := Fit(bg, oneFactor4(), 100, other, &Options{Warm: a}); !errors.Is(err, ErrWarmMismatch) {
		t.Errorf("err %v", err)
	}
}

// k parallel items (loadings 1, latent variance φ, residual variance θ):
// ω is the Spearman–Brown reliability of the sum, kρ/(1 + (k − 1)ρ) with
// ρ = φ/(φ + θ) the item reliability, and the AVE is ρ (closed forms).
func TestReliability_ParallelItems(t *testing.T) {
	const k, phi, theta = 5, 0.6, 0.9
	s := mat.NewSymDense(k, nil)
	for i := range k {
		for j := range k {
			s.SetSym(i, j, phi)
		}
		s.SetSym(i, i, phi+theta)
	}
	res, err := Fit(bg, s, 250, Spec{Observed: k, Indicators: [][]int{{0, 1, 2, 3, 4}}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	rho := phi / (phi + theta)
	c := res.Constructs[0]
	if !close(c.Omega, k*rho/(1+(k-1)*rho), 1e-9, 0) || !close(c.AVE, rho, 1e-9, 0) {
		t.Errorf("ω %.8f, AVE %.8f; want %.8f, %.8f", c.Omega, c.AVE, k*rho/(1+(k-1)*rho), rho)
	}
	for _, l := range c.StdLoadings {
		if !close(l, math.Sqrt(rho), 1e-9, 0) {
			t.Errorf("standardized loading %.8f, want √ρ = %.8f", l, math.Sqrt(rho))
		}
	}
}

// A residual covariance among a construct's own items enters ω's error
// part twice (Raykov 2001): with items 0 and 1 of the parallel model
// covarying by c, ω = k²φ / (k²φ + kθ + 2c).
func TestReliability_ResidualCovariance(t *testing.T) {
	const k, phi, theta, cov = 4, 0.5, 0.7, 0.2
	s := mat.NewSymDense(k, nil)
	for i := range k {
		for j := range k {
			s.SetSym(i, j, phi)
		}
		s.SetSym(i, i, phi+theta)
	}
	s.SetSym(0, 1, phi+cov)
	spec := Spec{Observed: k, Indicators: [][]int{{0, 1, 2, 3}}, ResidualCovariances: [][2]int{{0, 1}}}
	res, err := Fit(bg, s, 250, spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	want := k * k * phi / (k*k*phi + k*theta + 2*cov)
	if got := res.Constructs[0].Omega; !close(got, want, 1e-9, 0) {
		t.Errorf("ω %.8f, want %.8f", got, want)
	}
}

// Bollen's model has one indirect path, so the indirect effect of ind60
// on dem65 is the reference's a·b (testdata/reference/latent), and the
// effect through dem60 is the same number.
func TestIndirectEffect_Reference(t *testing.T) {
	ref := loadReference(t)
	m := referenceModels["poldem"]
	s, n := covariance(readColumns(t, "poldem.csv", m.columns), Wishart)
	res, err := Fit(bg, s, n, m.spec(), nil)
	if err != nil {
		t.Fatal(err)
	}
	var want refParam
	for _, p := range ref.Models["poldem"].Wishart.Params {
		if p.LHS == "ind" {
			want = p
		}
	}
	got, err := IndirectEffect(res, m.node("ind60"), m.node("dem65"))
	if err != nil || !close(got.Estimate, want.Est, refAbs, refRel) || !close(got.SE, want.SE, refAbs, refRel) {
		t.Fatalf("indirect %+v (%v), reference %.6f (%.6f)", got, err, want.Est, want.SE)
	}
	direct, _ := Effect(res, m.node("ind60"), m.node("dem65"), nil)
	if !close(direct.Estimate-got.Estimate, res.Coef.At(m.node("dem65"), m.node("ind60")), 1e-12, 0) {
		t.Errorf("total − indirect is not the direct path")
	}
	for _, bad := range [][]int{{m.node("ind60"), m.node("x1")}, {m.node("ind60"), m.node("ind60")}, {99, 0}} {
		if _, err := Effect(res, bad[0], bad[1], nil); err == nil {
			t.Errorf("Effect(%d, %d) took a bad node", bad[0], bad[1])
		}
	}
}

// An effect between nodes with no directed path is 0 with SE 0.
func TestEffect_NoPath(t *testing.T) {
	spec := randomSpec(rand.New(rand.NewPCG(8, 8)), 3, 0, false)
	spec.Parents = nil
	res, err := Fit(bg, randomCovariance(spec, rand.New(rand.NewPCG(8, 9)), 200), 200, spec, nil)
	if err != nil {
		t.Fatal(err)
	}
	e, err := Effect(res, spec.Latent(0), spec.Latent(1), nil)
	if err != nil || e.Estimate != 0 || e.SE != 0 || !isNaN(e.P) {
		t.Errorf("%+v %v", e, err)
	}
}
