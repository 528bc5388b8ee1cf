package missing

import (
	"fmt"
	"math"

	"github.com/pathvet/pathvet/checks/effects"
	"gonum.org/v1/gonum/stat/distuv"
)

func errorf(format string, args ...any) error { return fmt.Errorf("missing: "+format, args...) }

func normalQuantile(p float64) float64 { return distuv.UnitNormal.Quantile(p) }

// Pooled is a scalar estimate pooled over m imputations by Rubin's rules.
type Pooled struct {
	M        int
	Estimate float64 // Q̄
	Within   float64 // Ū
	Between  float64 // B
	Total    float64 // T = Ū + (1 + 1/m) B
	StdError float64 // sqrt(T)
	// RelativeIncrease r = (1 + 1/m) B / Ū; Lambda λ = (1 + 1/m) B / T;
	// FMI the fraction of missing information (Rubin 1987, eq. 3.1.10).
	RelativeIncrease, Lambda, FMI float64
	// DFRubin ν_m = (m − 1)(1 + 1/r)² (Rubin 1987); DF the Barnard & Rubin
	// (1999) small-sample degrees of freedom, used for the interval and p.
	DFRubin, DF float64
	CI          [2]float64
	P           float64
}

// Pool combines m estimates q and their squared standard errors u by
// Rubin's (1987) rules, with the Barnard & Rubin (1999) degrees of freedom
// for complete-data degrees of freedom dfCom:
//
//	ν_obs = (ν_com + 1)/(ν_com + 3) · ν_com · (1 − λ),  ν_BR = (1/ν_m + 1/ν_obs)⁻¹
//
// The interval is Q̄ ± t_{ν_BR} sqrt(T) at the level; p is two-sided. The
// t tail and quantile are the effects package's, which keep their digits
// for very large ν_BR (a small fraction of missing information), where
// the incomplete-beta forms lose them.
func Pool(q, u []float64, dfCom, level float64) (Pooled, error) {
	m := len(q)
	if m < 2 || len(u) != m {
		return Pooled{}, errorf("pooling needs at least two imputations, each with an estimate and a variance")
	}
	r := Pooled{M: m}
	for i := range q {
		r.Estimate += q[i] / float64(m)
		r.Within += u[i] / float64(m)
	}
	for _, x := range q {
		r.Between += (x - r.Estimate) * (x - r.Estimate) / float64(m-1)
	}
	inflate := (1 + 1/float64(m)) * r.Between
	r.Total = r.Within + inflate
	r.StdError = math.Sqrt(r.Total)
	r.RelativeIncrease = inflate / r.Within
	r.Lambda = inflate / r.Total
	r.DFRubin = math.Inf(1)
	if r.Lambda > 0 {
		r.DFRubin = float64(m-1) / (r.Lambda * r.Lambda)
	}
	obs := (dfCom + 1) / (dfCom + 3) * dfCom * (1 - r.Lambda)
	r.DF = 1 / (1/r.DFRubin + 1/obs)
	r.FMI = (r.RelativeIncrease + 2/(r.DFRubin+3)) / (r.RelativeIncrease + 1)
	half := effects.TQuantile(0.5+level/2, r.DF) * r.StdError
	r.CI = [2]float64{r.Estimate - half, r.Estimate + half}
	r.P = effects.PFromT(r.Estimate, r.StdError, r.DF)
	return r, nil
}
