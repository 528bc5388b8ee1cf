package missing

// The EM of pathvet before the sufficient statistics by pattern: one
// rank-one update per row per iteration, no acceleration. Kept only to
// compare the new EM with it (TestEM_AgreesWithRowByRow).

import (
	"context"
	"errors"

	"gonum.org/v1/gonum/mat"
)

func emRowByRow(ctx context.Context, cols [][]float64, opt Options) (*EMResult, error) {
	mean, cov, err := startValues(cols, opt.Start)
	if err != nil {
		return nil, err
	}
	ps := Patterns(cols)
	res := &EMResult{Tolerance: opt.Tolerance}
	for res.Iterations < opt.MaxIter {
		res.Iterations++
		m2, c2, err := refStep(cols, ps, mean, cov)
		if err != nil {
			return nil, err
		}
		change := maxChange(mean, cov, m2, c2)
		mean, cov = m2, c2
		if change < opt.Tolerance {
			res.Converged = true
			break
		}
	}
	res.Mean, res.Cov = mean, cov
	return res, nil
}

// refCondition is the conditional normal of a pattern's missing variables.
type refCondition struct {
	obs, mis []int
	coef     *mat.Dense    // −P_MM⁻¹ P_MO, |M| × |O|
	cov      *mat.SymDense // P_MM⁻¹
}

// conditional returns the regression of a pattern's missing variables on
// its observed ones under (mean, cov), through the precision matrix.
func refConditional(prec *mat.SymDense, pat Pattern) (*refCondition, error) {
	obs, mis := pat.ObservedIndex()
	c := &refCondition{obs: obs, mis: mis}
	switch len(mis) {
	case 0:
		return c, nil
	case 1: // the common case: a scalar P_MM
		return c.scalar(prec)
	}
	pmm := mat.NewSymDense(len(mis), nil)
	for a, i := range mis {
		for b, j := range mis[:a+1] {
			pmm.SetSym(a, b, prec.At(i, j))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(pmm) {
		return nil, errors.New("the covariance estimate is not positive definite")
	}
	c.cov = mat.NewSymDense(len(mis), nil)
	if err := ch.InverseTo(c.cov); err != nil {
		return nil, err
	}
	if len(obs) == 0 {
		return c, nil
	}
	pmo := mat.NewDense(len(mis), len(obs), nil)
	for a, i := range mis {
		for b, j := range obs {
			pmo.Set(a, b, prec.At(i, j))
		}
	}
	c.coef = mat.NewDense(len(mis), len(obs), nil)
	c.coef.Mul(c.cov, pmo)
	c.coef.Scale(-1, c.coef)
	return c, nil
}

// scalar fills the refCondition of a pattern with one missing variable m:
// variance 1/P_mm and coefficients −P_mO/P_mm.
func (c *refCondition) scalar(prec *mat.SymDense) (*refCondition, error) {
	m := c.mis[0]
	pmm := prec.At(m, m)
	if !(pmm > 0) {
		return nil, errors.New("the covariance estimate is not positive definite")
	}
	c.cov = mat.NewSymDense(1, []float64{1 / pmm})
	if len(c.obs) == 0 {
		return c, nil
	}
	c.coef = mat.NewDense(1, len(c.obs), nil)
	for b, j := range c.obs {
		c.coef.Set(0, b, -prec.At(m, j)/pmm)
	}
	return c, nil
}

// predict fills the missing values of row i into x with their conditional
// means.
func (c *refCondition) predict(cols [][]float64, i int, mean []float64, x []float64) {
	for _, j := range c.obs {
		x[j] = cols[j][i]
	}
	for a, j := range c.mis {
		v := mean[j]
		for b, k := range c.obs {
			v += c.coef.At(a, b) * (cols[k][i] - mean[k])
		}
		x[j] = v
	}
}

// refStep is one E and M step.
func refStep(cols [][]float64, ps []Pattern, mean []float64, cov *mat.SymDense) ([]float64, *mat.SymDense, error) {
	p, n := len(cols), rows(cols)
	prec, err := refPrecision(cov)
	if err != nil {
		return nil, nil, err
	}
	t1 := make([]float64, p)
	t2 := mat.NewSymDense(p, nil)
	x := mat.NewVecDense(p, nil)
	for _, pat := range ps {
		c, err := refConditional(prec, pat)
		if err != nil {
			return nil, nil, err
		}
		for _, i := range pat.Rows {
			c.predict(cols, i, mean, x.RawVector().Data)
			for j := range p {
				t1[j] += x.AtVec(j)
			}
			t2.SymRankOne(t2, 1, x)
		}
		for a, i := range c.mis {
			for b, j := range c.mis[:a+1] {
				t2.SetSym(i, j, t2.At(i, j)+float64(len(pat.Rows))*c.cov.At(a, b))
			}
		}
	}
	m2 := make([]float64, p)
	for j := range p {
		m2[j] = t1[j] / float64(n)
	}
	c2 := mat.NewSymDense(p, nil)
	for i := range p {
		for j := 0; j <= i; j++ {
			c2.SetSym(i, j, t2.At(i, j)/float64(n)-m2[i]*m2[j])
		}
	}
	return m2, c2, nil
}

func refPrecision(cov *mat.SymDense) (*mat.SymDense, error) {
	var ch mat.Cholesky
	if !ch.Factorize(cov) {
		return nil, errors.New("the covariance estimate is not positive definite")
	}
	prec := mat.NewSymDense(cov.SymmetricDim(), nil)
	return prec, ch.InverseTo(prec)
}
