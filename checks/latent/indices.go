package latent

import (
	"context"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
	"github.com/pathvet/pathvet/checks/sem"
)

// Indices are the test of exact fit and the usual fit indices, with the
// same definitions as checks/sem: n* is N − 1 (Wishart) or N (Normal).
type Indices struct {
	FML        float64 // the minimum of F_ML
	FreeParams int     // q
	// ChiSquare is T = n* F_ML on DF = p(p + 1)/2 − q; P is NaN when DF = 0.
	ChiSquare, P float64
	DF           int
	// RMSEA = sqrt(max(T − df, 0)/(df n*)) (Steiger 1990) and its 90%
	// interval (Browne & Cudeck 1993) from checks/sem's noncentral χ².
	RMSEA   float64
	RMSEACI [2]float64
	// CFI (Bentler 1990) and TLI (Tucker & Lewis 1973) against the
	// baseline model, every observed variable on its own:
	// T_B = n* (Σ ln s_ii − ln|S|) on p(p − 1)/2 df. TLI is NaN when DF = 0.
	CFI, TLI          float64
	BaselineChiSquare float64
	BaselineDF        int
	// SRMR is the root mean square of (s_ij − σ̂_ij)/sqrt(s_ii s_jj) over
	// i ≥ j (Bentler 1995).
	SRMR float64
	// AIC = T + 2q and BIC = T + q ln N, as checks/sem.
	AIC, BIC float64
}

func (l *layout) indices(ctx context.Context, r *Result, ev *evaluator, st *state, nstar float64) error {
	f := &r.Fit
	f.FML, f.FreeParams, f.DF = st.f, len(l.params), l.df()
	f.ChiSquare = math.Max(nstar*st.f, 0)
	f.BaselineChiSquare = nstar * (sumLogDiag(ev.s) - ev.logDetS)
	f.BaselineDF = l.p * (l.p - 1) / 2
	f.SRMR = srmr(ev.s, r.Implied)
	q := float64(f.FreeParams)
	f.AIC = f.ChiSquare + 2*q
	f.BIC = f.ChiSquare + q*math.Log(float64(r.N))
	return f.againstBaseline(ctx, nstar)
}

// againstBaseline fills p, RMSEA and its interval, TLI and CFI.
func (f *Indices) againstBaseline(ctx context.Context, nstar float64) error {
	t, df, tb, dfb := f.ChiSquare, float64(f.DF), f.BaselineChiSquare, float64(f.BaselineDF)
	f.P, f.TLI, f.CFI = math.NaN(), math.NaN(), 1
	if den := math.Max(math.Max(tb-dfb, t-df), 0); den > 0 {
		f.CFI = 1 - math.Max(t-df, 0)/den
	}
	if f.DF <= 0 {
		return nil
	}
	f.P = effects.ChiSquaredSF(t, df)
	f.RMSEA = math.Sqrt(math.Max(t-df, 0) / (df * nstar))
	f.TLI = (tb/dfb - t/df) / (tb/dfb - 1)
	// RMSEAInterval scales by df (n − 1); n = n* + 1 makes it df n*.
	ci, err := sem.RMSEAInterval(ctx, t, f.DF, int(nstar)+1)
	f.RMSEACI = ci
	return err
}

func sumLogDiag(s *mat.SymDense) float64 {
	sum := 0.0
	for i := range s.SymmetricDim() {
		sum += math.Log(s.At(i, i))
	}
	return sum
}

func srmr(s, implied *mat.SymDense) float64 {
	p := s.SymmetricDim()
	sum := 0.0
	for i := range p {
		for j := 0; j <= i; j++ {
			e := (s.At(i, j) - implied.At(i, j)) / math.Sqrt(s.At(i, i)*s.At(j, j))
			sum += e * e
		}
	}
	return math.Sqrt(sum / float64(p*(p+1)/2))
}

// reliability fills each construct's standardized loadings, McDonald's
// ω (McDonald 1999, Test Theory: A Unified Treatment, ch. 6; with the
// residual covariances among the construct's own items in the error part,
// Raykov 2001) and the average variance extracted (Fornell & Larcker
// 1981, J. Marketing Research 18(1):39–50), with φ the latent's implied
// variance and θ the items' residual (co)variances:
//
//	ω   = (Σ λ_i)² φ / ((Σ λ_i)² φ + Σ θ_ii + 2 Σ_{i<k} θ_ik)
//	AVE = Σ λ_i² φ / (Σ λ_i² φ + Σ θ_ii)
func (l *layout) reliability(r *Result) {
	r.Constructs = make([]Construct, len(l.spec.Indicators))
	for j, items := range l.spec.Indicators {
		lat := l.spec.Latent(j)
		phi := r.ImpliedAll.At(lat, lat)
		var sum, sumSq, errVar, errCov float64
		c := Construct{StdLoadings: make([]float64, len(items))}
		for i, v := range items {
			lam := r.Coef.At(v, lat)
			c.StdLoadings[i] = r.StdCoef.At(v, lat)
			sum += lam
			sumSq += lam * lam
			errVar += r.Cov.At(v, v)
			for _, w := range items[:i] {
				errCov += r.Cov.At(v, w)
			}
		}
		c.Omega = sum * sum * phi / (sum*sum*phi + errVar + 2*errCov)
		c.AVE = sumSq * phi / (sumSq*phi + errVar)
		r.Constructs[j] = c
	}
}
