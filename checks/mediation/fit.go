package mediation

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/linmod"
)

// Divisor is the convention for the error variance behind the
// coefficients' covariance.
type Divisor int

const (
	// OLS divides the residual sum of squares by n − k − 1, as linmod does:
	// the convention of pathvet's reports.
	OLS Divisor = iota
	// ML divides it by n: maximum likelihood with the exogenous variables'
	// moments taken as fixed, the convention of the R SEM reference
	// (testdata/reference/mediation/indirect.R, Debian's R SEM package) for
	// a model whose equations are saturated in their parents.
	ML
)

// FitModel fits each node's equation on its parents by least squares from
// the covariance matrix cov (divisor n − 1) of n complete cases: for node
// j with parents P (k of them),
//
//	b_j = S_PP⁻¹ s_Pj,  RSS_j = (n − 1)(s_jj − b_jᵀ s_Pj),
//	σ̂²_j = RSS_j/(n − k − 1) (OLS) or RSS_j/n (ML),
//	Cov(b_j) = σ̂²_j S_PP⁻¹/(n − 1).
//
// In a recursive model with independent errors these are also the
// maximum likelihood estimates (the likelihood factors by equation), and
// the estimates of different equations are uncorrelated. The solve is a
// Cholesky factorization whose condition number must stay below
// linmod.MaxCondition.
func FitModel(cov mat.Symmetric, n int, parents [][]int, d Divisor) (*Model, error) {
	p := len(parents)
	if cov.SymmetricDim() != p {
		return nil, fmt.Errorf("mediation: covariance of %d variables for %d nodes", cov.SymmetricDim(), p)
	}
	if _, err := topoOrder(parents); err != nil {
		return nil, err
	}
	m := &Model{B: mat.NewDense(p, p, nil), Parents: parents, Cov: make([]*mat.SymDense, p)}
	for j, pa := range parents {
		if len(pa) == 0 {
			continue
		}
		b, inv, rss, err := solveEquation(cov, j, pa)
		if err != nil {
			return nil, fmt.Errorf("mediation: equation of node %d: %w", j, err)
		}
		df := float64(n - len(pa) - 1)
		if d == ML {
			df = float64(n)
		}
		if df < 1 {
			return nil, fmt.Errorf("mediation: equation of node %d: %w", j, linmod.ErrTooFewCases)
		}
		sigma2 := rss * float64(n-1) / df
		for k, i := range pa {
			m.B.Set(i, j, b[k])
		}
		inv.ScaleSym(sigma2/float64(n-1), inv)
		m.Cov[j] = inv
	}
	return m, nil
}

// solveEquation regresses y on x from the covariance matrix cov and
// returns the coefficients, S_xx⁻¹ and the residual variance s_yy − bᵀs_xy.
// It solves on the correlation scale (x rescaled to unit variance), as
// linmod does, so that the condition number is that of the predictors'
// correlations and not of their units.
func solveEquation(cov mat.Symmetric, y int, x []int) ([]float64, *mat.SymDense, float64, error) {
	k := len(x)
	sd := make([]float64, k)
	for a, i := range x {
		if sd[a] = math.Sqrt(cov.At(i, i)); !(sd[a] > 0) {
			return nil, nil, 0, &linmod.SingularError{Condition: math.Inf(1)}
		}
	}
	rxx, rxy := mat.NewSymDense(k, nil), mat.NewVecDense(k, nil)
	for a, i := range x {
		for c, j := range x[:a+1] {
			rxx.SetSym(a, c, cov.At(i, j)/(sd[a]*sd[c]))
		}
		rxy.SetVec(a, cov.At(i, y)/sd[a])
	}
	var ch mat.Cholesky
	if !ch.Factorize(rxx) {
		return nil, nil, 0, &linmod.SingularError{Condition: math.Inf(1)}
	}
	if c := ch.Cond(); c > linmod.MaxCondition {
		return nil, nil, 0, &linmod.SingularError{Condition: c}
	}
	g := mat.NewVecDense(k, nil)
	inv := mat.NewSymDense(k, nil)
	if ch.SolveVecTo(g, rxy) != nil || ch.InverseTo(inv) != nil {
		return nil, nil, 0, &linmod.SingularError{Condition: ch.Cond()}
	}
	rss := cov.At(y, y) - mat.Dot(g, rxy)
	if rss <= 1e-12*cov.At(y, y) {
		return nil, nil, 0, linmod.ErrPerfectFit
	}
	b := make([]float64, k)
	for a := range k {
		b[a] = g.AtVec(a) / sd[a]
		for c := range a + 1 {
			inv.SetSym(a, c, inv.At(a, c)/(sd[a]*sd[c]))
		}
	}
	return b, inv, rss, nil
}
