package missing

import (
	"context"
	"errors"
	"fmt"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// Bounds on the observed information: it is a D × D matrix, D = p +
// p(p+1)/2, and each pattern costs about 2 v² floating-point operations,
// v = p(p+1)/2 (see infoAcc).
const (
	// MaxInformationVariables bounds p: D = 860 at 40 variables, 6 MB.
	MaxInformationVariables = 40
	// MaxInformationWork bounds the operations over all patterns: 2·10¹¹,
	// about a minute of one core of the development machine, holds 30
	// variables with a pattern in nearly every one of 460,000 rows, past
	// the default limits (README, "Limits").
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
// inverse of the observed information at θ̂ (ObservedInformation). em must
// be the converged EM estimate of cols.
func EstimateCovariance(ctx context.Context, cols [][]float64, em *EMResult) (*mat.SymDense, error) {
	info, err := ObservedInformation(ctx, cols, em)
	if err != nil {
		return nil, err
	}
	var ch mat.Cholesky
	if ok := ch.Factorize(info); !ok {
		return nil, errors.New("missing: the observed information is not positive definite " +
			"(the EM estimate is not a maximum of the likelihood)")
	}
	var v mat.SymDense
	if err := ch.InverseTo(&v); err != nil {
		return nil, fmt.Errorf("missing: inverting the observed information: %w", err)
	}
	return &v, nil
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
// has one entry, not two) and 1 off it. It stops with ctx's error when
// ctx is done, and returns ErrInformationTooLarge past the bounds above.
func ObservedInformation(ctx context.Context, cols [][]float64, em *EMResult) (*mat.SymDense, error) {
	p := len(cols)
	if p > MaxInformationVariables {
		return nil, fmt.Errorf("%w: %d variables, past %d", ErrInformationTooLarge, p, MaxInformationVariables)
	}
	ps := Patterns(cols)
	v := float64(p * (p + 1) / 2)
	if w := 2 * v * v * float64(len(ps)); w > MaxInformationWork {
		return nil, fmt.Errorf("%w: %d missingness patterns of %d variables, about %.2g operations, past %.2g",
			ErrInformationTooLarge, len(ps), p, w, float64(MaxInformationWork))
	}
	acc := newInfoAcc(p)
	for k, pat := range ps {
		if k%64 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		if err := acc.add(cols, pat, em); err != nil {
			return nil, err
		}
	}
	acc.flush()
	return acc.information(), nil
}

// infoChunk is how many patterns infoAcc gathers before it adds them.
const infoChunk = 128

// infoAcc sums the patterns' information in three products, so that the
// sum over patterns runs as matrix multiplication (BLAS dgemm): with Ã
// and C̃ the pattern's A and C set into p × p matrices (zero outside O)
// and ã its a set into p,
//
//	mm  = Σ n Ã,  mix = Σ vec(Ã) ãᵀ (p² × p),  m = Σ vech(Ã) vech(C̃)ᵀ (v × v)
//
// from which every entry of the information is read (information). The
// patterns are gathered infoChunk at a time, a pattern a row of va, vc
// (vech(Ã), vech(C̃)), ua (vec(Ã)) and wa (ã).
type infoAcc struct {
	p, v, rows     int
	mm, mix, m     []float64
	va, vc, ua, wa []float64
}

func newInfoAcc(p int) *infoAcc {
	v := p * (p + 1) / 2
	return &infoAcc{p: p, v: v, mm: make([]float64, p*p), mix: make([]float64, p*p*p), m: make([]float64, v*v),
		va: make([]float64, infoChunk*v), vc: make([]float64, infoChunk*v),
		ua: make([]float64, infoChunk*p*p), wa: make([]float64, infoChunk*p)}
}

// vech is the index of (i, j) in the lower triangle, row by row.
func vech(i, j int) int {
	if i < j {
		i, j = j, i
	}
	return i*(i+1)/2 + j
}

// add gathers pattern pat (see ObservedInformation).
func (acc *infoAcc) add(cols [][]float64, pat Pattern, em *EMResult) error {
	obs, p := pat.obs, acc.p
	q := len(obs)
	if q == 0 {
		return nil
	}
	n := float64(len(pat.Rows))
	d, s := centredSums(cols, pat, em.Mean)
	a, err := subInverse(em.Cov, obs)
	if err != nil {
		return err
	}
	ad := mat.NewVecDense(q, nil)
	ad.MulVec(a, mat.NewVecDense(q, d))
	var c mat.Dense
	c.Mul(a, s)
	c.Mul(&c, a)
	c.Add(&c, scaled(-n/2, a))
	r := acc.rows
	va, vc, ua, wa := acc.va[r*acc.v:(r+1)*acc.v], acc.vc[r*acc.v:(r+1)*acc.v], acc.ua[r*p*p:(r+1)*p*p],
		acc.wa[r*p:(r+1)*p]
	for b, i := range obs {
		wa[i] = ad.AtVec(b)
		for e, j := range obs {
			acc.mm[i*p+j] += n * a.At(b, e)
			ua[i*p+j] = a.At(b, e)
			if j <= i {
				va[vech(i, j)], vc[vech(i, j)] = a.At(b, e), c.At(b, e)
			}
		}
	}
	if acc.rows++; acc.rows == infoChunk {
		acc.flush()
	}
	return nil
}

func scaled(f float64, a *mat.Dense) *mat.Dense {
	var s mat.Dense
	s.Scale(f, a)
	return &s
}

// flush adds the gathered patterns to mix and m and clears the chunk.
func (acc *infoAcc) flush() {
	k, p, v := acc.rows, acc.p, acc.v
	if k == 0 {
		return
	}
	gen := func(rows, cols int, data []float64) blas64.General {
		return blas64.General{Rows: rows, Cols: cols, Stride: cols, Data: data[:rows*cols]}
	}
	blas64.Gemm(blas.Trans, blas.NoTrans, 1, gen(k, v, acc.va), gen(k, v, acc.vc), 1, gen(v, v, acc.m))
	blas64.Gemm(blas.Trans, blas.NoTrans, 1, gen(k, p*p, acc.ua), gen(k, p, acc.wa), 1, gen(p*p, p, acc.mix))
	clear(acc.va[:k*v])
	clear(acc.vc[:k*v])
	clear(acc.ua[:k*p*p])
	clear(acc.wa[:k*p])
	acc.rows = 0
}

// information reads the information from the sums (see infoAcc and
// ObservedInformation).
func (acc *infoAcc) information() *mat.SymDense {
	p, v := acc.p, acc.v
	info := mat.NewSymDense(ParamCount(p), nil)
	m := func(x, y int) float64 { return acc.m[x*v+y] }
	weight := func(i, j int) float64 {
		if i == j {
			return 0.5
		}
		return 1
	}
	for r := range p {
		for s := 0; s <= r; s++ {
			info.SetSym(MeanParam(r), MeanParam(s), acc.mm[r*p+s])
		}
	}
	for i := range p {
		for j := 0; j <= i; j++ {
			wij, gij := weight(i, j), CovParam(p, i, j)
			for r := range p {
				info.SetSym(gij, MeanParam(r), wij*(acc.mix[(r*p+i)*p+j]+acc.mix[(r*p+j)*p+i]))
			}
			for k := range p {
				for l := 0; l <= k; l++ {
					if CovParam(p, k, l) > gij {
						continue
					}
					t := m(vech(i, k), vech(j, l)) + m(vech(i, l), vech(j, k)) + m(vech(j, k), vech(i, l)) +
						m(vech(j, l), vech(i, k))
					info.SetSym(gij, CovParam(p, k, l), wij*weight(k, l)*t)
				}
			}
		}
	}
	return info
}

// centredSums are d = Σ (x_O − μ_O) and S = Σ (x_O − μ_O)(x_O − μ_O)ᵀ over
// the rows of pat.
func centredSums(cols [][]float64, pat Pattern, mean []float64) ([]float64, *mat.Dense) {
	q := len(pat.obs)
	d, x := make([]float64, q), make([]float64, q)
	s := mat.NewDense(q, q, nil)
	raw := s.RawMatrix().Data
	for _, i := range pat.Rows {
		for b, j := range pat.obs {
			x[b] = cols[j][i] - mean[j]
			d[b] += x[b]
		}
		for b := range q {
			row := raw[b*q : (b+1)*q]
			for c := 0; c <= b; c++ {
				row[c] += x[b] * x[c]
			}
		}
	}
	for b := range q {
		for c := 0; c < b; c++ {
			raw[c*q+b] = raw[b*q+c]
		}
	}
	return d, s
}

// subInverse is Σ_OO⁻¹ as a dense matrix.
func subInverse(cov *mat.SymDense, obs []int) (*mat.Dense, error) {
	q := len(obs)
	sub := mat.NewSymDense(q, nil)
	for b, i := range obs {
		for c := 0; c <= b; c++ {
			sub.SetSym(b, c, cov.At(i, obs[c]))
		}
	}
	var ch mat.Cholesky
	if ok := ch.Factorize(sub); !ok {
		return nil, errors.New("missing: the EM covariance is not positive definite")
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return nil, err
	}
	return mat.DenseCopyOf(&inv), nil
}
