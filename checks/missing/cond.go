package missing

import (
	"errors"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

var errNotPD = errors.New("the covariance estimate is not positive definite")

// condition is the conditional normal of a pattern's missing variables M
// given its observed ones O, from the precision matrix P = Σ⁻¹:
//
//	x_M | x_O ~ N(a + B x_O, C),  C = P_MM⁻¹,  B = −C P_MO,  a = μ_M − B μ_O
//
// so only |M| × |M| systems are solved. Its slices are reused between
// patterns, so that a pattern per row costs no allocation.
type condition struct {
	obs, mis []int
	c        []float64 // |M| × |M|, row-major, both triangles
	b        []float64 // |M| × |O|, row-major
	a        []float64 // |M|
	pmo      []float64 // scratch: P_MO
	l        []float64 // scratch: the factor of C
}

// set computes the condition of the pattern (obs, mis) under mean and the
// precision prec. B = −C P_MO is a product of small matrices, formed by
// loops: BLAS call overhead outweighs them.
func (c *condition) set(prec *mat.SymDense, mean []float64, obs, mis []int) error {
	c.obs, c.mis = obs, mis
	nm, no := len(mis), len(obs)
	c.c, c.b, c.a, c.pmo = grow(c.c, nm*nm), grow(c.b, nm*no), grow(c.a, nm), grow(c.pmo, nm*no)
	if nm == 0 {
		return nil
	}
	raw := prec.RawSymmetric()
	at := func(i, j int) float64 { return raw.Data[min(i, j)*raw.Stride+max(i, j)] }
	for x, i := range mis {
		for y, j := range mis {
			c.c[x*nm+y] = at(i, j)
		}
		for y, j := range obs {
			c.pmo[x*no+y] = at(i, j)
		}
	}
	if err := invertSym(c.c, nm); err != nil {
		return err
	}
	for x := range nm {
		row := c.b[x*no : (x+1)*no]
		clear(row)
		for z := range nm {
			f := -c.c[x*nm+z]
			for y, v := range c.pmo[z*no : (z+1)*no] {
				row[y] += f * v
			}
		}
		c.a[x] = mean[mis[x]]
		for y, j := range obs {
			c.a[x] -= row[y] * mean[j]
		}
	}
	return nil
}

// invertSym replaces the k × k positive definite matrix s (row-major,
// both triangles) by its inverse, through the Cholesky factor (LAPACK
// dpotrf, dpotri).
func invertSym(s []float64, k int) error {
	if k == 1 {
		if !(s[0] > 0) {
			return errNotPD
		}
		s[0] = 1 / s[0]
		return nil
	}
	sym := blas64.Symmetric{N: k, Stride: k, Data: s, Uplo: blas.Upper}
	t, ok := lapack64.Potrf(sym)
	if !ok {
		return errNotPD
	}
	if _, ok := lapack64.Potri(t); !ok {
		return errNotPD
	}
	for x := range k {
		for y := range x {
			s[x*k+y] = s[y*k+x]
		}
	}
	return nil
}

// predict writes the conditional means of the missing values of the row
// x into x[mis], from its observed values x[obs].
func (c *condition) predict(x []float64) {
	no := len(c.obs)
	for a, j := range c.mis {
		v := c.a[a]
		row := c.b[a*no : (a+1)*no]
		for b, k := range c.obs {
			v += row[b] * x[k]
		}
		x[j] = v
	}
}

func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}

func precision(cov *mat.SymDense) (*mat.SymDense, error) {
	var ch mat.Cholesky
	if !ch.Factorize(cov) {
		return nil, errNotPD
	}
	prec := mat.NewSymDense(cov.SymmetricDim(), nil)
	return prec, ch.InverseTo(prec)
}

// factor returns the lower Cholesky factor of the conditional covariance,
// k × k row-major.
func (c *condition) factor() ([]float64, error) {
	k := len(c.mis)
	c.l = grow(c.l, k*k)
	l := c.l
	copy(l, c.c)
	t, ok := lapack64.Potrf(blas64.Symmetric{N: k, Stride: k, Data: l, Uplo: blas.Lower})
	if !ok {
		return nil, errors.New("a conditional covariance is not positive definite")
	}
	for a := range k {
		for b := a + 1; b < k; b++ {
			t.Data[a*k+b] = 0
		}
	}
	return t.Data, nil
}
