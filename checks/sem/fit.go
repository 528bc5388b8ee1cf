package sem

import (
	"context"
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
	"github.com/pathvet/pathvet/checks/linmod"
)

// Fit is the maximum likelihood fit of a recursive path model.
type Fit struct {
	N          int
	Variables  int // p
	FreeParams int // q: one per arrow plus one (residual) variance per variable
	// ChiSquare is T = (N − 1) F_ML on DF = p(p + 1)/2 − q degrees of
	// freedom; for a DAG over all p variables DF is the number of
	// non-adjacent pairs. P is nil-valued (NaN) when DF = 0.
	ChiSquare, P float64
	DF           int
	RMSEA        float64
	RMSEACI      [2]float64 // 90%
	CFI, TLI     float64    // TLI is NaN when DF = 0
	SRMR         float64
	AIC, BIC     float64 // T + 2q and T + q ln N
	// The independence (baseline) model: every variable on its own.
	BaselineChiSquare float64
	BaselineDF        int
	// Coefficients[i][k] is the coefficient of parents[i][k] in i's
	// equation; Residual[i] its residual variance.
	Coefficients [][]float64
	Residual     []float64
	Implied      *mat.SymDense
}

// EquationError says which variable's equation could not be fitted.
type EquationError struct {
	Variable int // index into the fitted matrix
	Err      error
}

func (e *EquationError) Error() string {
	return fmt.Sprintf("sem: the equation of variable %d: %v", e.Variable, e.Err)
}

func (e *EquationError) Unwrap() error { return e.Err }

// ErrNotPositiveDefinite is returned when the sample matrix is not.
var ErrNotPositiveDefinite = errors.New("sem: the covariance matrix is not positive definite")

// FitDAG fits the DAG given by parents (parents[i] are the parents of
// variable i, indices into s) to the covariance or correlation matrix s of
// n cases. Each variable is regressed on its parents, which for a
// recursive model is the maximum likelihood fit; the implied covariance is
//
//	Σ̂ = (I − B)⁻¹ Ψ (I − B)⁻ᵀ
//
// and the discrepancy F_ML = ln|Σ̂| − ln|S| + tr(S Σ̂⁻¹) − p, with
// T = (N − 1) F_ML (README, "Checks"). It stops with ctx's error
// when ctx is cancelled (the RMSEA interval's root finding checks it).
func FitDAG(ctx context.Context, s mat.Symmetric, n int, parents [][]int) (*Fit, error) {
	p := s.SymmetricDim()
	var chS mat.Cholesky
	if !chS.Factorize(s) {
		return nil, ErrNotPositiveDefinite
	}
	f := &Fit{N: n, Variables: p, Coefficients: make([][]float64, p), Residual: make([]float64, p)}
	a, edges, err := f.regress(s, n, parents)
	if err != nil {
		return nil, err
	}
	if f.Implied, err = impliedCovariance(a, f.Residual); err != nil {
		return nil, err
	}
	f.FreeParams = edges + p
	f.DF = p*(p+1)/2 - f.FreeParams
	if err := f.discrepancy(s, &chS); err != nil {
		return nil, err
	}
	if err := f.indices(ctx, s); err != nil {
		return nil, err
	}
	return f, nil
}

// regress regresses each variable on its parents, filling f's
// coefficients and ML residual variances; it returns I − B and the number
// of edges.
func (f *Fit) regress(s mat.Symmetric, n int, parents [][]int) (*mat.Dense, int, error) {
	p := s.SymmetricDim()
	a := mat.NewDense(p, p, nil) // I − B
	edges := 0
	for i, pa := range parents {
		a.Set(i, i, 1)
		f.Residual[i] = s.At(i, i)
		edges += len(pa)
		if len(pa) == 0 {
			continue
		}
		reg, err := linmod.FromMoments(s, nil, n, i, pa, 0.95)
		if err != nil {
			return nil, 0, &EquationError{Variable: i, Err: err}
		}
		f.Coefficients[i] = make([]float64, len(pa))
		for k, c := range reg.Coefs {
			f.Coefficients[i][k] = c.Estimate
			a.Set(i, pa[k], -c.Estimate)
		}
		f.Residual[i] = reg.Sigma2 * float64(reg.DF) / float64(n-1) // ML residual variance on s's scale
	}
	return a, edges, nil
}

// impliedCovariance is Σ̂ = (I − B)⁻¹ Ψ (I − B)⁻ᵀ from a = I − B and the
// residual variances psi, the diagonal of Ψ.
func impliedCovariance(a *mat.Dense, psi []float64) (*mat.SymDense, error) {
	var ainv mat.Dense
	if err := ainv.Inverse(a); err != nil {
		return nil, fmt.Errorf("sem: the graph is not recursive: %w", err)
	}
	for j, v := range psi { // (I − B)⁻¹ Ψ^½, so that Σ̂ = L Lᵀ
		col := ainv.ColView(j).(*mat.VecDense)
		col.ScaleVec(math.Sqrt(v), col)
	}
	var implied mat.Dense
	implied.Mul(&ainv, ainv.T())
	return symmetrize(&implied), nil
}

func symmetrize(m *mat.Dense) *mat.SymDense {
	p, _ := m.Dims()
	out := mat.NewSymDense(p, nil)
	for i := range p {
		for j := 0; j <= i; j++ {
			out.SetSym(i, j, (m.At(i, j)+m.At(j, i))/2)
		}
	}
	return out
}

// discrepancy computes T and the baseline T_B.
func (f *Fit) discrepancy(s mat.Symmetric, chS *mat.Cholesky) error {
	p := f.Variables
	var chI mat.Cholesky
	if !chI.Factorize(f.Implied) {
		return ErrNotPositiveDefinite
	}
	var inv mat.SymDense
	if err := chI.InverseTo(&inv); err != nil {
		return err
	}
	trace := 0.0 // tr(S Σ̂⁻¹) = Σ_ij s_ij (Σ̂⁻¹)_ij, both symmetric
	for i := range p {
		for j := range p {
			trace += s.At(i, j) * inv.At(i, j)
		}
	}
	fml := chI.LogDet() - chS.LogDet() + trace - float64(p)
	f.ChiSquare = math.Max(float64(f.N-1)*fml, 0)
	if f.ChiSquare < 1e-9 {
		f.ChiSquare = 0 // rounding in a saturated or exactly fitting model
	}
	logDiag := 0.0
	for i := range p {
		logDiag += math.Log(s.At(i, i))
	}
	f.BaselineChiSquare = float64(f.N-1) * (logDiag - chS.LogDet())
	f.BaselineDF = p * (p - 1) / 2
	return nil
}

// indices computes p, RMSEA and its interval, CFI, TLI, SRMR, AIC, BIC.
func (f *Fit) indices(ctx context.Context, s mat.Symmetric) error {
	t, df, n := f.ChiSquare, float64(f.DF), float64(f.N)
	f.P, f.TLI = math.NaN(), math.NaN()
	if f.DF > 0 {
		f.P = effects.ChiSquaredSF(t, df)
		f.RMSEA = math.Sqrt(math.Max(t-df, 0) / (df * (n - 1)))
		ci, err := RMSEAInterval(ctx, t, f.DF, f.N)
		if err != nil {
			return err
		}
		f.RMSEACI = ci
		tb, dfb := f.BaselineChiSquare, float64(f.BaselineDF)
		f.TLI = (tb/dfb - t/df) / (tb/dfb - 1)
	}
	f.CFI = 1
	if den := math.Max(math.Max(f.BaselineChiSquare-float64(f.BaselineDF), t-df), 0); den > 0 {
		f.CFI = 1 - math.Max(t-df, 0)/den
	}
	sum, count := 0.0, 0
	for i := range f.Variables {
		for j := 0; j <= i; j++ {
			r := (s.At(i, j) - f.Implied.At(i, j)) / math.Sqrt(s.At(i, i)*s.At(j, j))
			sum += r * r
			count++
		}
	}
	f.SRMR = math.Sqrt(sum / float64(count))
	q := float64(f.FreeParams)
	f.AIC = t + 2*q
	f.BIC = t + q*math.Log(n)
	return nil
}
