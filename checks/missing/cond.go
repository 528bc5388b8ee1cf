package missing

import (
	"errors"
	"math"

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
	// lean: only C was computed (setLean); predict then works from the
	// precision matrix, full (p × p, both triangles), and mean.
	lean bool
	full []float64
	mean []float64
	v    []float64 // scratch: P_MO (x_O − μ_O)
}

// set computes the condition of the pattern (obs, mis) under mean and the
// precision prec. B = −C P_MO is a product of small matrices, formed by
// loops: BLAS call overhead outweighs them.
func (c *condition) set(prec *mat.SymDense, mean []float64, obs, mis []int) error {
	c.obs, c.mis, c.lean = obs, mis, false
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

// setLean computes only C of the pattern (obs, mis), from full, the
// precision matrix with both triangles: for a pattern of a few rows, whose
// conditional means predict then takes row by row as
//
//	E[x_M | x_O] = μ_M − C P_MO (x_O − μ_O),
//
// which costs |M| · |O| + |M|² a row and spares forming B and a, about
// |M|² · |O| for the pattern.
func (c *condition) setLean(full, mean []float64, obs, mis []int) error {
	c.obs, c.mis, c.lean, c.full, c.mean = obs, mis, true, full, mean
	nm, p := len(mis), len(mean)
	c.c, c.v = grow(c.c, nm*nm), grow(c.v, nm)
	for x, i := range mis {
		for y, j := range mis {
			c.c[x*nm+y] = full[i*p+j]
		}
	}
	if nm == 0 {
		return nil
	}
	return invertSym(c.c, nm)
}

// setFor is set for a pattern whose rows are reduced (reduced) and
// setLean for one whose rows are predicted one by one.
func (c *condition) setFor(reduced bool, prec *mat.SymDense, full, mean []float64, obs, mis []int) error {
	if reduced {
		return c.set(prec, mean, obs, mis)
	}
	return c.setLean(full, mean, obs, mis)
}

// fullSymmetric returns prec with both triangles, p × p row-major.
func fullSymmetric(prec *mat.SymDense) []float64 {
	p := prec.SymmetricDim()
	out := make([]float64, p*p)
	for i := range p {
		for j := i; j < p; j++ {
			v := prec.At(i, j)
			out[i*p+j], out[j*p+i] = v, v
		}
	}
	return out
}

// invertSym replaces the k × k positive definite matrix s (row-major,
// both triangles) by its inverse, through the Cholesky factor: by loops up
// to smallInverse (a pattern's few missing variables, where the LAPACK
// calls cost more than the arithmetic), by LAPACK dpotrf and dpotri past it.
func invertSym(s []float64, k int) error {
	if k <= smallInverse {
		return invertSmall(s, k)
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

// smallInverse is the largest k that invertSmall inverts.
const smallInverse = 8

// invertSmall is invertSym for k ≤ smallInverse: s = L Lᵀ (Cholesky, by
// columns), then s⁻¹ = L⁻ᵀ L⁻¹ from L⁻¹ by forward substitution. A pivot
// that is not positive means s is not positive definite, as in dpotrf.
func invertSmall(s []float64, k int) error {
	var lb, ib [smallInverse * smallInverse]float64
	l, li := lb[:k*k], ib[:k*k]
	for j := range k {
		d := s[j*k+j]
		for m := range j {
			d -= l[j*k+m] * l[j*k+m]
		}
		if !(d > 0) {
			return errNotPD
		}
		d = math.Sqrt(d)
		l[j*k+j] = d
		for i := j + 1; i < k; i++ {
			v := s[i*k+j]
			for m := range j {
				v -= l[i*k+m] * l[j*k+m]
			}
			l[i*k+j] = v / d
		}
	}
	for i := range k {
		li[i*k+i] = 1 / l[i*k+i]
		for j := range i {
			v := 0.0
			for m := j; m < i; m++ {
				v -= l[i*k+m] * li[m*k+j]
			}
			li[i*k+j] = v / l[i*k+i]
		}
	}
	for i := range k {
		for j := 0; j <= i; j++ {
			v := 0.0
			for m := i; m < k; m++ {
				v += li[m*k+i] * li[m*k+j]
			}
			s[i*k+j], s[j*k+i] = v, v
		}
	}
	return nil
}

// predict writes the conditional means of the missing values of the row
// x into x[mis], from its observed values x[obs].
func (c *condition) predict(x []float64) {
	if c.lean {
		c.predictLean(x)
		return
	}
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

// predictLean is predict after setLean.
func (c *condition) predictLean(x []float64) {
	p, nm := len(c.mean), len(c.mis)
	for a, i := range c.mis {
		row, s := c.full[i*p:(i+1)*p], 0.0
		for _, j := range c.obs {
			s += row[j] * (x[j] - c.mean[j])
		}
		c.v[a] = s
	}
	for a, i := range c.mis {
		e := c.mean[i]
		for b, v := range c.v {
			e -= c.c[a*nm+b] * v
		}
		x[i] = e
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
