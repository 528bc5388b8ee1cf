package missing

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/mat"
)

// DefaultImputations is m, the number of imputed datasets, by default.
const DefaultImputations = 20

// ImputeOptions tune multiple imputation.
type ImputeOptions struct {
	M    int    // imputations; default DefaultImputations
	Seed uint64 // all randomness comes from it
	// Binary marks 0/1 variables: their imputed values are rounded
	// adaptively (Bernaards, Belin & Schafer 2007), so that each imputed
	// dataset is coded as the analysis needs.
	Binary []bool
	EM     Options // for the EM runs on the bootstrap samples
}

// Impute returns M completed copies of cols. Each is proper (Rubin 1987):
// the parameters are drawn by running EM on a bootstrap resample of the
// rows (Honaker & King 2010; Efron 1994), and each missing value is then
// drawn from its conditional normal given the observed values of its row
// under those parameters, residual noise included. start, the EM estimate
// on the full data, starts each bootstrap run.
func Impute(ctx context.Context, cols [][]float64, start *EMResult, opt ImputeOptions) ([][][]float64, error) {
	if opt.M == 0 {
		opt.M = DefaultImputations
	}
	rng := rand.New(rand.NewPCG(opt.Seed, 0x9e3779b97f4a7c15))
	ps := Patterns(cols)
	out := make([][][]float64, opt.M)
	for k := range opt.M {
		theta, err := bootstrapEM(ctx, cols, start, opt.EM, rng)
		if err != nil {
			return nil, fmt.Errorf("missing: imputation %d: %w", k+1, err)
		}
		if out[k], err = draw(cols, ps, theta, rng); err != nil {
			return nil, fmt.Errorf("missing: imputation %d: %w", k+1, err)
		}
		roundBinary(out[k], cols, opt.Binary)
	}
	return out, nil
}

// bootstrapEM runs EM on a resample of the rows, drawn with replacement;
// a resample in which some variable is never observed is drawn again.
func bootstrapEM(ctx context.Context, cols [][]float64, start *EMResult, opt Options, rng *rand.Rand) (*EMResult, error) {
	n := rows(cols)
	opt.Start = start
	for range 20 {
		bs := make([][]float64, len(cols))
		for j := range cols {
			bs[j] = make([]float64, n)
		}
		for i := range n {
			r := rng.IntN(n)
			for j, c := range cols {
				bs[j][i] = c[r]
			}
		}
		res, err := EM(ctx, bs, opt)
		if errors.Is(err, ErrNoData) {
			continue
		}
		return res, err
	}
	return nil, errors.New("no bootstrap resample observed every variable")
}

// draw completes cols with draws from the conditional normals under theta.
func draw(cols [][]float64, ps []Pattern, theta *EMResult, rng *rand.Rand) ([][]float64, error) {
	p := len(cols)
	out := make([][]float64, p)
	for j, c := range cols {
		out[j] = append([]float64(nil), c...)
	}
	prec, err := precision(theta.Cov)
	if err != nil {
		return nil, err
	}
	x := make([]float64, p)
	for _, pat := range ps {
		c, err := conditional(prec, pat)
		if err != nil {
			return nil, err
		}
		if len(c.mis) == 0 {
			continue
		}
		var ch mat.Cholesky
		if !ch.Factorize(c.cov) {
			return nil, errors.New("a conditional covariance is not positive definite")
		}
		var l mat.TriDense
		ch.LTo(&l)
		z := make([]float64, len(c.mis))
		for _, i := range pat.Rows {
			c.predict(cols, i, theta.Mean, x)
			for a := range z {
				z[a] = rng.NormFloat64()
			}
			for a, j := range c.mis {
				e := 0.0
				for b := 0; b <= a; b++ {
					e += l.At(a, b) * z[b]
				}
				out[j][i] = x[j] + e
			}
		}
	}
	return out, nil
}

// roundBinary rounds the imputed values of binary variables at the
// adaptive threshold ω = v̄ − Φ⁻¹(v̄)·sqrt(v̄(1 − v̄)) of Bernaards, Belin
// & Schafer (2007), v̄ the mean of the variable after imputation.
func roundBinary(done, orig [][]float64, binary []bool) {
	for j, isBin := range binary {
		if !isBin {
			continue
		}
		mean := 0.0
		for _, v := range done[j] {
			mean += v
		}
		mean /= float64(len(done[j]))
		mean = math.Min(math.Max(mean, 1e-6), 1-1e-6)
		omega := mean - normalQuantile(mean)*math.Sqrt(mean*(1-mean))
		for i, v := range done[j] {
			if math.IsNaN(orig[j][i]) {
				done[j][i] = 0
				if v > omega {
					done[j][i] = 1
				}
			}
		}
	}
}
