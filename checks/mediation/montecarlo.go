package mediation

import (
	"context"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// DefaultDraws is the number of Monte Carlo draws unless set.
const DefaultDraws = 20000

// monteCarloChunk is the draws of one random stream.
const monteCarloChunk = 1000

// MCOptions tune MonteCarlo.
type MCOptions struct {
	Draws   int     // default DefaultDraws
	Level   float64 // default DefaultLevel
	Seed    uint64  // all randomness comes from it
	Workers int     // goroutines; default GOMAXPROCS; the draws do not depend on it
}

// MonteCarlo returns the Monte Carlo interval of an effect (MacKinnon,
// Lockwood & Williams 2004; Preacher & Selig 2012): the coefficients are
// drawn from their estimated joint normal distribution, one block per
// equation, the effect is computed for each draw, and the interval is read
// off the draws' percentiles (Percentile),
//
//	b*_j ~ N(b̂_j, Cov_j) independently for each equation j,  θ* = θ(b*),
//	[θ*_(α/2), θ*_(1−α/2)].
//
// Unlike the delta method's symmetric interval it follows the skewness of
// the product of coefficients (Preacher & Hayes 2008). Only the
// coefficients the effect depends on are drawn (a margin of a normal is
// normal). Draws come in chunks of 1,000, each from its own stream seeded
// by opt.Seed and the chunk, spread over opt.Workers goroutines; the
// context is checked between chunks.
func MonteCarlo(ctx context.Context, m *Model, p Path, opt MCOptions) (*Interval, error) {
	if opt.Draws == 0 {
		opt.Draws = DefaultDraws
	}
	if opt.Level == 0 {
		opt.Level = DefaultLevel
	}
	if err := m.Validate(); err != nil {
		return nil, err
	}
	if m.Cov == nil {
		return nil, fmt.Errorf("mediation: Monte Carlo interval needs the coefficients' covariance")
	}
	c, err := newChain(m.Parents, p)
	if err != nil {
		return nil, err
	}
	e := newEvaluator(m.Parents, c)
	blocks, err := drawBlocks(m, e)
	if err != nil {
		return nil, err
	}
	draws := make([]float64, opt.Draws)
	err = parallel(ctx, opt.Draws, monteCarloChunk, opt.Workers, nil, func() func(k, lo, hi int) error {
		beta, t, z := make([]float64, len(e.arcs)), make([]float64, len(e.nodes)), make([]float64, len(e.arcs))
		return func(k, lo, hi int) error {
			rng := stream(opt.Seed, k)
			for d := lo; d < hi; d++ {
				for _, b := range blocks {
					b.draw(beta, z, rng.NormFloat64)
				}
				draws[d] = e.eval(beta, t)
			}
			return nil
		}
	})
	if err != nil {
		return nil, err
	}
	return newInterval(draws, opt.Level)
}

// block is one equation's relevant coefficients: their slots, estimates
// and a square root L of their covariance (LLᵀ = Cov).
type block struct {
	slot []int
	mean []float64
	l    *mat.Dense
}

// drawBlocks builds the blocks of the equations the effect depends on. L
// comes from the eigendecomposition, so that a covariance that is only
// positive semidefinite (a coefficient fixed, with variance zero) still
// gives draws.
func drawBlocks(m *Model, e *evaluator) ([]block, error) {
	var out []block
	for j := range m.Parents {
		pos, slot := e.slots(m.Parents, j)
		if len(pos) == 0 {
			continue
		}
		sub := mat.NewSymDense(len(pos), nil)
		b := block{slot: slot, mean: make([]float64, len(pos))}
		for a, ka := range pos {
			b.mean[a] = m.B.At(m.Parents[j][ka], j)
			for c, kc := range pos[:a+1] {
				sub.SetSym(a, c, m.Cov[j].At(ka, kc))
			}
		}
		var eig mat.EigenSym
		if !eig.Factorize(sub, true) {
			return nil, fmt.Errorf("mediation: node %d: covariance block does not factorize", j)
		}
		var v mat.Dense
		eig.VectorsTo(&v)
		for c, lambda := range eig.Values(nil) {
			if lambda < -1e-12*math.Max(1, mat.Max(sub)) {
				return nil, fmt.Errorf("mediation: node %d: covariance block is not positive semidefinite", j)
			}
			col := mat.Col(nil, c, &v)
			for r := range col {
				v.Set(r, c, col[r]*math.Sqrt(math.Max(lambda, 0)))
			}
		}
		b.l = &v
		out = append(out, b)
	}
	return out, nil
}

// draw puts one draw of the block into beta; z is scratch.
func (b block) draw(beta, z []float64, normal func() float64) {
	k := len(b.slot)
	for i := range k {
		z[i] = normal()
	}
	for i := range k {
		v := b.mean[i]
		for c := range k {
			v += b.l.At(i, c) * z[c]
		}
		beta[b.slot[i]] = v
	}
}
