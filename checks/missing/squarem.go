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

// squarem iterates the EM map of d from cur with the SQUAREM S3 step
// (Varadhan & Roland 2008, Scand. J. Statist. 35: 335–353): from
// θ1 = F(θ0) and θ2 = F(θ1), with r = θ1 − θ0, v = θ2 − 2θ1 + θ0 and
// α = −‖r‖/‖v‖ (at most −1), the next point is θ0 − 2αr + α²v; α is
// halved towards −1 (which gives θ2) while that point's covariance is not
// positive definite, and where the EM step from it changes the estimates
// ten times as much as the last one did, EM goes on from θ2 instead. It
// stops when one EM step changes no mean or covariance by opt.Tolerance
// relative to the SDs, and returns that step.
func squarem(ctx context.Context, d *emData, cur theta, opt Options) (*EMResult, error) {
	res := &EMResult{Tolerance: opt.Tolerance}
	var fallback *theta
	last := math.Inf(1)
	for {
		t1, c1, err := emStep(ctx, d, cur, res)
		if err != nil {
			return nil, err
		}
		if fallback != nil && c1 > 10*last && res.Iterations < opt.MaxIter {
			cur, fallback = *fallback, nil
			continue
		}
		if res.finish(t1, c1, opt) {
			return res, nil
		}
		t2, c2, err := emStep(ctx, d, t1, res)
		if err != nil {
			return nil, err
		}
		if res.finish(t2, c2, opt) {
			return res, nil
		}
		cur, fallback, last = extrapolate(cur, t1, t2, d.p), &t2, c2
	}
}

// finish says whether EM stops at t, which changed the estimates by
// change, and fills res if so.
func (res *EMResult) finish(t theta, change float64, opt Options) bool {
	res.Converged = change < opt.Tolerance
	if !res.Converged && res.Iterations < opt.MaxIter {
		return false
	}
	res.Mean, res.Cov = t.mean, t.cov
	return true
}

// emStep is one EM step from t, and the largest change it makes.
func emStep(ctx context.Context, d *emData, t theta, res *EMResult) (theta, float64, error) {
	if err := ctx.Err(); err != nil {
		return theta{}, 0, err
	}
	res.Iterations++
	m, c, err := d.step(t.mean, t.cov)
	if err != nil {
		return theta{}, 0, fmt.Errorf("missing: EM iteration %d: %w", res.Iterations, err)
	}
	return theta{m, c}, maxChange(t.mean, t.cov, m, c), nil
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
