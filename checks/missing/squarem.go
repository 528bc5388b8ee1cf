package missing

import (
	"context"
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// theta is a mean and a covariance.
type theta struct {
	mean []float64
	cov  *mat.SymDense
}

// vec lays theta out as one vector: the mean, then the covariance's upper
// triangle by rows.
func (t theta) vec() []float64 {
	v := append([]float64(nil), t.mean...)
	for i := range t.mean {
		for j := i; j < len(t.mean); j++ {
			v = append(v, t.cov.At(i, j))
		}
	}
	return v
}

func thetaOf(v []float64, p int) theta {
	t := theta{append([]float64(nil), v[:p]...), mat.NewSymDense(p, nil)}
	k := p
	for i := range p {
		for j := i; j < p; j++ {
			t.cov.SetSym(i, j, v[k])
			k++
		}
	}
	return t
}

// squarem iterates the EM map of d from t0 with the SQUAREM S3 step
// (Varadhan & Roland 2008, Scand. J. Statist. 35: 335–353): from
// θ1 = F(θ0) and θ2 = F(θ1), with r = θ1 − θ0, v = θ2 − 2θ1 + θ0 and
// α = −‖r‖/‖v‖ (at most −1), the next point is θ0 − 2αr + α²v; α is
// halved towards −1 (which gives θ2) while that point's covariance is not
// positive definite. It stops when one EM step changes no mean or
// covariance by opt.Tolerance relative to the SDs, and returns that step.
func squarem(ctx context.Context, d *emData, cur theta, opt Options) (*EMResult, error) {
	res := &EMResult{Tolerance: opt.Tolerance}
	var pair [2]theta
	for {
		for k := range pair {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
			from := cur
			if k == 1 {
				from = pair[0]
			}
			next, err := emStep(d, from, res)
			if err != nil {
				return nil, err
			}
			pair[k] = next
			if res.Converged = maxChange(from.mean, from.cov, next.mean, next.cov) < opt.Tolerance; res.Converged || res.Iterations >= opt.MaxIter {
				res.Mean, res.Cov = next.mean, next.cov
				return res, nil
			}
		}
		cur = extrapolate(cur, pair[0], pair[1], d.p)
	}
}

func emStep(d *emData, t theta, res *EMResult) (theta, error) {
	res.Iterations++
	m, c, err := d.step(t.mean, t.cov)
	if err != nil {
		return theta{}, fmt.Errorf("missing: EM iteration %d: %w", res.Iterations, err)
	}
	return theta{m, c}, nil
}

// extrapolate is the SQUAREM step from t0 through t1 = F(t0), t2 = F(t1).
func extrapolate(t0, t1, t2 theta, p int) theta {
	v0, v1, v2 := t0.vec(), t1.vec(), t2.vec()
	r := make([]float64, len(v0))
	v := make([]float64, len(v0))
	floats.SubTo(r, v1, v0)
	for i := range v {
		v[i] = v2[i] - 2*v1[i] + v0[i]
	}
	alpha := -floats.Norm(r, 2) / floats.Norm(v, 2)
	next := make([]float64, len(v0))
	for alpha < -1 { // false for NaN (v = 0): plain EM
		for i := range next {
			next[i] = v0[i] - 2*alpha*r[i] + alpha*alpha*v[i]
		}
		t := thetaOf(next, p)
		if positiveDefinite(t.cov) {
			return t
		}
		alpha = (alpha - 1) / 2
		if alpha > -1-1e-3 {
			break
		}
	}
	return t2
}

func positiveDefinite(c *mat.SymDense) bool {
	var ch mat.Cholesky
	if !ch.Factorize(c) {
		return false
	}
	for i := range c.SymmetricDim() {
		if !(c.At(i, i) > 0) || math.IsInf(c.At(i, i), 0) {
			return false
		}
	}
	return true
}
