package missing

import (
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// MCARTest is Little's test of missing completely at random.
type MCARTest struct {
	ChiSquare float64
	DF        int
	P         float64
}

// LittleMCAR computes Little's (1988) test from the data and their EM
// estimates (ML, divisor n, as ../shared/spec/checks.md requires):
//
//	d² = Σ_j n_j (ȳ_j − μ_Oj)ᵀ Σ_OjOj⁻¹ (ȳ_j − μ_Oj),  df = Σ_j p_j − p
//
// over the patterns j, with ȳ_j the mean of the n_j rows of pattern j over
// its p_j observed variables. Patterns with nothing observed add nothing.
func LittleMCAR(cols [][]float64, em *EMResult) (MCARTest, error) {
	var t MCARTest
	p := len(cols)
	for _, pat := range Patterns(cols) {
		obs, _ := pat.ObservedIndex()
		if len(obs) == 0 {
			continue
		}
		sub := mat.NewSymDense(len(obs), nil)
		for a, i := range obs {
			for b, j := range obs[:a+1] {
				sub.SetSym(a, b, em.Cov.At(i, j))
			}
		}
		var ch mat.Cholesky
		if !ch.Factorize(sub) {
			return t, errorf("the EM covariance is not positive definite")
		}
		d := mat.NewVecDense(len(obs), nil)
		for a, j := range obs {
			s := 0.0
			for _, i := range pat.Rows {
				s += cols[j][i]
			}
			d.SetVec(a, s/float64(len(pat.Rows))-em.Mean[j])
		}
		var w mat.VecDense
		if err := ch.SolveVecTo(&w, d); err != nil {
			return t, err
		}
		t.ChiSquare += float64(len(pat.Rows)) * mat.Dot(d, &w)
		t.DF += len(obs)
	}
	t.DF -= p
	t.P = math.NaN()
	if t.DF > 0 {
		t.P = distuv.ChiSquared{K: float64(t.DF)}.Survival(t.ChiSquare)
	}
	return t, nil
}
