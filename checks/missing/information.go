package missing

import (
	"context"
	"errors"
	"fmt"

	"gonum.org/v1/gonum/mat"
)

// Bounds on the observed information, a D × D matrix, D = p + v, v =
// p(p+1)/2 (see informationWork for its cost).
const (
	// MaxInformationVariables bounds p, for memory: at 45 variables the
	// information (D = 1,080) and the sums it is read from (v × v) take
	// 18 MB, and the whole screening of 500 rows peaked at 58 MB, within
	// the working-memory model's base of 64 MiB (as the earlier code did
	// at 40 variables, 57 MB); at 50 variables it peaked at 74 MB.
	MaxInformationVariables = 45
	// MaxInformationWork bounds the operations (informationWork): 2·10¹¹,
	// a minute or two of one core of the development machine. Within the
	// default limits it does not bind: at 45 variables the memory budget
	// holds about 216,000 rows, which with a pattern in every row and 20%
	// of the cells missing cost about 2.8·10¹⁰ (README, "Limits").
	MaxInformationWork = 2e11
)

// ErrInformationTooLarge is returned when the observed information would
// pass MaxInformationVariables or MaxInformationWork.
var ErrInformationTooLarge = errors.New("missing: the observed information is too large to compute")

// ParamCount is the number of parameters of the saturated normal model of
// p variables, the means and the distinct covariances: p + p(p+1)/2.
func ParamCount(p int) int { return p + p*(p+1)/2 }

// MeanParam is the index of μ_i among the parameters (μ, vech Σ).
func MeanParam(i int) int { return i }

// CovParam is the index of σ_ij = σ_ji among the parameters (μ, vech Σ):
// after the p means, the lower triangle row by row.
func CovParam(p, i, j int) int {
	if i < j {
		i, j = j, i
	}
	return p + i*(i+1)/2 + j
}

// EstimateCovariance is the large-sample covariance of the ML estimates
// θ̂ = (μ̂, vech Σ̂) of the saturated normal model from incomplete data, the
// inverse of the observed information at θ̂ (ObservedInformation), kept as
// the information's Cholesky factor (see Covariance). em must be the
// converged EM estimate of cols.
func EstimateCovariance(ctx context.Context, cols [][]float64, em *EMResult) (*Covariance, error) {
	info, err := ObservedInformation(ctx, cols, em)
	if err != nil {
		return nil, err
	}
	return factorInformation(info)
}

// ObservedInformation is the observed information of the saturated
// multivariate normal model for (μ, vech Σ) at (μ̂, Σ̂) = em, from the
// observed-data log-likelihood (Little & Rubin, Statistical Analysis
// with Missing Data, 2nd ed., sec. 9.1 and 11.2; Savalei 2010, Struct.
// Equ. Modeling 17:241), summed pattern by pattern. A pattern with
// observed set O and n rows has
//
//	ℓ = −n/2 ln|Σ_OO| − ½ tr(A S),  A = Σ_OO⁻¹,
//	d = Σ_rows (x_O − μ_O),  S = Σ_rows (x_O − μ_O)(x_O − μ_O)ᵀ,
//
// and adds, with a = A d, B = A S A, C = B − (n/2) A, E_ij the symmetric
// unit matrix of σ_ij (1 at (i, j) and (j, i)):
//
//	I(μ, μ)       = n A
//	I(μ_r, σ_kl)  = (A E_kl a)_r = w_kl (A_rk a_l + A_rl a_k)
//	I(σ_ij, σ_kl) = tr(A E_ij C E_kl) = w_ij w_kl (A_ik C_jl + A_il C_jk + A_jk C_il + A_jl C_ik)
//
// the negative second derivatives of ℓ, with w ½ on the diagonal (E_kk
// has one entry, not two) and 1 off it. The sums over patterns of A ⊗ C
// and A ⊗ a are taken in the coordinates of the precision matrix P = Σ⁻¹,
// where a pattern differs from Σ only in its missing block (infoAcc), and
// carried back by P on every index at the end (infoAcc.information). It
// stops with ctx's error when ctx is done, and returns
// ErrInformationTooLarge past the bounds above.
func ObservedInformation(ctx context.Context, cols [][]float64, em *EMResult) (*mat.SymDense, error) {
	p := len(cols)
	if p > MaxInformationVariables {
		return nil, fmt.Errorf("%w: %d variables, past %d", ErrInformationTooLarge, p, MaxInformationVariables)
	}
	ps := Patterns(cols)
	if w := informationWork(ps, p); w > MaxInformationWork {
		return nil, fmt.Errorf("%w: %d missingness patterns of %d variables, about %.2g operations, past %.2g",
			ErrInformationTooLarge, len(ps), p, w, float64(MaxInformationWork))
	}
	acc, err := newInfoAcc(em)
	if err != nil {
		return nil, err
	}
	for k, pat := range ps {
		if k%64 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		if err := acc.add(cols, pat); err != nil {
			return nil, err
		}
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return acc.information(), nil
}

// informationWork is about the floating-point operations of the observed
// information and its factor: a pattern with m missing of its p variables
// and q = p − m observed costs about (m(m+1) + 4) v, its missing block's
// sums of rows of v, and 2 m q (q + m) to complete its sums of rows; P on
// every index of the sums at the end costs 8 v p³, the factor D³/3.
func informationWork(ps []Pattern, p int) float64 {
	v, d := float64(p*(p+1)/2), float64(ParamCount(p))
	w := 8*v*float64(p*p*p) + d*d*d/3
	for _, pat := range ps {
		m, q := float64(len(pat.mis)), float64(len(pat.obs))
		w += (m*(m+1)+4)*v + 2*m*q*(q+m) + float64(len(pat.Rows))*q*q/2
	}
	return w
}
