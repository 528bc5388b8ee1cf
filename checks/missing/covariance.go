package missing

import (
	"errors"
	"fmt"
	"slices"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
)

// Covariance is the covariance V = I⁻¹ of the ML estimates θ̂ = (μ̂, vech Σ̂),
// indexed as MeanParam and CovParam do, held as the Cholesky factor of
// the observed information I = Uᵀ U (LAPACK dpotrf), so that a quadratic
// form is a triangular solve, never an inverse:
//
//	gᵀ V g = ‖z‖²,  Uᵀ z = g.
type Covariance struct {
	u blas64.Triangular // upper
}

// factorInformation factors info in place into a Covariance. As
// gonum's mat.Cholesky and its InverseTo, it refuses an information that
// is not positive definite, or whose condition number (the 1-norm,
// estimated by LAPACK dpocon) passes mat.ConditionTolerance.
func factorInformation(info *mat.SymDense) (*Covariance, error) {
	sym := info.RawSymmetric()
	n := sym.N
	norm := lapack64.Lansy(mat.CondNorm, sym, make([]float64, n))
	u, ok := lapack64.Potrf(sym)
	if !ok {
		return nil, errors.New("missing: the observed information is not positive definite " +
			"(the EM estimate is not a maximum of the likelihood)")
	}
	if rc := lapack64.Pocon(sym, norm, make([]float64, 3*n), make([]int, n)); 1/rc > mat.ConditionTolerance {
		return nil, fmt.Errorf("missing: inverting the observed information: %w", mat.Condition(1/rc))
	}
	return &Covariance{u: u}, nil
}

// Quadratic is gᵀ V g for the gradient g given by its entries g[k] at the
// parameters idx[k].
func (c *Covariance) Quadratic(idx []int, g []float64) float64 {
	_, z := c.solve(idx, g)
	return floats.Dot(z, z)
}

// Block is V over the parameters idx, in their order: z_aᵀ z_b for the
// solves Uᵀ z_a = e_idx[a], each from its own parameter on.
func (c *Covariance) Block(idx []int) *mat.SymDense {
	first, z := make([]int, len(idx)), make([][]float64, len(idx))
	for a, i := range idx {
		first[a], z[a] = c.solve([]int{i}, []float64{1})
	}
	out := mat.NewSymDense(len(idx), nil)
	for a := range idx {
		for b := range a + 1 {
			za, zb, off := z[a], z[b], first[a]-first[b]
			if off < 0 {
				za, zb, off = zb, za, -off
			}
			out.SetSym(a, b, floats.Dot(za, zb[off:]))
		}
	}
	return out
}

// solve is z of Uᵀ z = g (g as in Quadratic) from the first parameter g
// touches, the entries of z before it being zero.
func (c *Covariance) solve(idx []int, g []float64) (first int, z []float64) {
	first = slices.Min(idx)
	n := c.u.N - first
	z = make([]float64, n)
	for k, i := range idx {
		z[i-first] += g[k]
	}
	sub := blas64.Triangular{Uplo: blas.Upper, Diag: blas.NonUnit, N: n, Stride: c.u.Stride,
		Data: c.u.Data[first*c.u.Stride+first:]}
	blas64.Trsv(blas.Trans, sub, blas64.Vector{N: n, Inc: 1, Data: z})
	return first, z
}
