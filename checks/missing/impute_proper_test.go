package missing

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

// Proper imputation redraws the parameters for each imputation; improper
// imputation (every dataset drawn from the one EM estimate) understates
// the between-imputation variance B. One normal variable, n = 200, half
// of it missing completely at random. Given the data, the completed-data
// mean of imputation k is Q_k = (n_obs ȳ + Σ y*)/n with y* ~ N(μ*, σ*²);
// the bootstrap gives Var(μ*) ≈ σ̂²/n_obs, so
//
//	Var(Q_k) ≈ (n_mis/n)² σ̂²/n_obs + n_mis σ̂²/n² = σ̂² n_mis/(n n_obs),
//
// the observed-data variance σ̂²/n_obs less the complete-data σ̂²/n (the
// fraction of missing information is n_mis/n). Improper imputation gives
// only n_mis σ̂²/n², a factor n_obs/n ≈ 0.5 of it. The Q_k are independent
// normal draws given the data, so (m − 1)B/Var(Q_k) ~ χ²(m − 1), and over 8
// datasets of m = 51 imputations the sum S ~ χ²(400). The test asks S to
// lie in the central 99.9% of χ²(400), [313.4, 499.7]; improper imputation
// puts it near 200. (σ̂² is the ML variance of the observed values; the
// approximations are off by O(1/n_obs), about 1%, far inside the band.)
//
// Both ImputeEach (rows) and ImputeMoments (moments) are held to it.
func TestImpute_ProperBetweenVariance(t *testing.T) {
	for _, path := range []string{"rows", "moments"} {
		t.Run(path, func(t *testing.T) { properBetweenVariance(t, path) })
	}
}

func properBetweenVariance(t *testing.T, path string) {
	const n, m, datasets = 200, 51, 8
	r := rand.New(rand.NewPCG(1987, 1999))
	s := 0.0
	for d := range datasets {
		y, obs := mcarNormal(r, n, 0.5)
		em, err := EM(context.Background(), [][]float64{y}, Options{})
		if err != nil {
			t.Fatal(err)
		}
		q, u := make([]float64, m), make([]float64, m)
		opt := ImputeOptions{M: m, Seed: uint64(d)}
		if path == "rows" {
			imps, err := impute(context.Background(), [][]float64{y}, em, opt)
			if err != nil {
				t.Fatal(err)
			}
			for k, imp := range imps {
				q[k] = stat.Mean(imp[0], nil)
				u[k] = stat.Variance(imp[0], nil) / n
			}
		} else {
			err := ImputeMoments(context.Background(), [][]float64{y}, em, opt,
				func(k int, mean []float64, cov *mat.SymDense) error {
					q[k], u[k] = mean[0], cov.At(0, 0)/n
					return nil
				})
			if err != nil {
				t.Fatal(err)
			}
		}
		pooled, err := Pool(q, u, n-1, 0.95)
		if err != nil {
			t.Fatal(err)
		}
		_, v := stat.PopMeanVariance(obs, nil)
		mis := float64(n - len(obs))
		s += (m - 1) * pooled.Between / (v * mis / (n * float64(len(obs))))
	}
	chi := distuv.ChiSquared{K: datasets * (m - 1)}
	lo, hi := chi.Quantile(0.0005), chi.Quantile(0.9995)
	t.Logf("Σ(m − 1)B/E[B] = %.1f, χ²(%v) central 99.9%%: [%.1f, %.1f]", s, chi.K, lo, hi)
	if s < lo || s > hi {
		t.Fatalf("Σ(m − 1)B/E[B] = %.1f, want within [%.1f, %.1f] (χ²(%v), central 99.9%%)", s, lo, hi, chi.K)
	}
}

// mcarNormal draws n standard normal values, hides each with probability
// rate, and returns the column and its observed values.
func mcarNormal(r *rand.Rand, n int, rate float64) (col, obs []float64) {
	col = make([]float64, n)
	for i := range col {
		col[i] = r.NormFloat64()
		if r.Float64() < rate {
			col[i] = math.NaN()
			continue
		}
		obs = append(obs, col[i])
	}
	return col, obs
}
