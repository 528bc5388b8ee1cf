package checks

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/pathvet/pathvet/checks/effects"
	"github.com/pathvet/pathvet/checks/missing"
)

// Multiple imputation at the call site: pooling by Rubin's rules, the
// Monte Carlo error of the pooled estimates, and raising m where that
// error could change a conclusion.

// pooled estimates a claim in every imputed dataset and pools them by
// Rubin's rules with the Barnard–Rubin degrees of freedom. Correlations
// are pooled on Fisher's z scale, odds ratios on the log scale.
func (a *Analysis) pooled(c Claim, ests []est, imputed []*Moments) est {
	var q, u []float64
	var first est
	for k, m := range imputed {
		e := ests[k]
		if !e.ok() {
			return est{err: fmt.Errorf("imputation %d: %w", k+1, e.err), scale: e.scale}
		}
		if e.method == MethodZero {
			return e
		}
		if k == 0 {
			first = e
		}
		qk, uk := pooledScale(e, m.N, claimLevel(c))
		q, u = append(q, qk), append(u, uk)
	}
	if first.method == MethodProduct {
		return a.pooledIndirect(c, ests)
	}
	dfCom := float64(first.n - len(first.adjusted) - 2)
	level := claimLevel(c)
	pr, err := missing.Pool(q, u, dfCom, level)
	if err != nil {
		return est{err: err, scale: first.scale}
	}
	e := est{method: "multiple_imputation", scale: first.scale, n: first.n, adjusted: first.adjusted, p: pr.P,
		value: pr.Estimate, additive: pr.Estimate, se: pr.StdError, lo: pr.CI[0], hi: pr.CI[1],
		note: fmt.Sprintf("%d imputations pooled by Rubin's rules; Barnard–Rubin df %.1f; fraction of missing "+
			"information %.2f; "+
			"Monte Carlo error of the pooled estimate "+
			"%.2g%s", pr.M, pr.DF, pr.FMI, monteCarloError(pr), poolScaleNote(first))}
	e.mcse, e.nearLine, e.df = monteCarloError(pr), nearLine(pr, a.Alpha), pr.DF
	switch {
	case first.method == MethodPartial:
		e.value, e.lo, e.hi, e.se = math.Tanh(pr.Estimate), math.Tanh(pr.CI[0]), math.Tanh(pr.CI[1]), math.NaN()
		e.additive = e.value
	case first.scale == "odds_ratio":
		e.value, e.lo, e.hi, e.se = math.Exp(pr.Estimate), math.Exp(pr.CI[0]), math.Exp(pr.CI[1]), math.NaN()
	}
	return e
}

// MaxRaiseCells bounds the data (rows × variables) for which m is raised:
// the check needs about a minute per 10 million cells at m = 20 on the
// development machine (README, Limits), so MaxImputations at 2 million
// cells stays within the default job deadline; past it m stays and the
// report says so.
const MaxRaiseCells = 2_000_000

// raiseImputations raises m to MaxImputations where the Monte Carlo error
// of some claim's pooled estimate could carry it across the significance
// line (White, Royston & Wood 2011 advise m large enough that it cannot).
func (a *Analysis) raiseImputations(ctx context.Context, r *missingResult) {
	if r.err != nil || len(r.imputed) == 0 || len(r.imputed) >= MaxImputations {
		return
	}
	if r.raised = a.claimsNearLine(r); len(r.raised) == 0 {
		return
	}
	if cells := r.summary.Rows * len(a.Study.Names); cells > MaxRaiseCells {
		r.raiseErr = fmt.Errorf("not raised: %d rows × %d variables is past the %d cells for which %d imputations "+
			"fit in a job's time",
			r.summary.Rows, len(a.Study.Names), MaxRaiseCells, MaxImputations)
		return
	}
	if err := a.imputeClaims(ctx, r, MaxImputations); err != nil {
		r.raiseErr = err
		return
	}
	r.stillNear = a.claimsNearLine(r)
}

// claimsNearLine lists the claims whose pooled estimate lies within Monte
// Carlo error of the significance line.
func (a *Analysis) claimsNearLine(r *missingResult) []string {
	var ids []string
	for i, c := range a.Study.Package.Claims {
		if a.graphContradiction(c) != "" {
			continue
		}
		if e := a.pooled(c, r.imputedEst[i], r.imputed); e.ok() && e.nearLine {
			ids = append(ids, c.ID)
		}
	}
	return ids
}

// raisedFindings say where m was raised and whether that settled it.
func raisedFindings(r *missingResult) []Finding {
	if len(r.raised) == 0 {
		return nil
	}
	ids := strings.Join(r.raised, ", ")
	if r.raiseErr != nil {
		return []Finding{{Severity: StatusWarn, Topic: "imputations", Message: fmt.Sprintf(
			"With %d imputations the Monte Carlo error could carry the pooled estimate of %s across the significance "+
				"line, and m was not raised (%v): read %s as on the line.",
			Imputations, ids, r.raiseErr, ids)}}
	}
	msg := fmt.Sprintf("Multiple imputation was run with %d imputations, not %d: with %d, the Monte Carlo error "+
		"could have carried the pooled estimate of %s across the significance line.",
		len(r.imputed), Imputations, Imputations, ids)
	if len(r.stillNear) > 0 {
		msg += fmt.Sprintf(" With %d it still could for %s: read %s as on the "+
			"line.", len(r.imputed), strings.Join(r.stillNear, ", "), strings.Join(r.stillNear, ", "))
	}
	return []Finding{{Severity: SeverityInfo, Topic: "imputations", Message: msg}}
}

// monteCarloError is the Monte Carlo standard error of a pooled estimate,
// sqrt(B/m): how much Q̄ would move with another set of m imputations
// (Rubin 1987, sec. 3.3; White, Royston & Wood 2011, sec. 7.3).
func monteCarloError(pr missing.Pooled) float64 {
	return math.Sqrt(pr.Between / float64(pr.M))
}

// nearLine reports whether the Monte Carlo error could carry a pooled
// estimate across the significance line at alpha: |Q̄| within two Monte
// Carlo errors of t(1 − α/2, df)·SE. (The Monte Carlo error of the SE
// itself is smaller and left out.)
func nearLine(pr missing.Pooled, alpha float64) bool {
	crit := distuv.UnitNormal.Quantile(1 - alpha/2)
	if !math.IsInf(pr.DF, 1) && pr.DF > 0 {
		crit = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: pr.DF}.Quantile(1 - alpha/2)
	}
	return math.Abs(math.Abs(pr.Estimate)-crit*pr.StdError) < 2*monteCarloError(pr)
}

func poolScaleNote(first est) string {
	switch {
	case first.method == MethodPartial:
		return " (on Fisher's z scale)"
	case first.scale == "odds_ratio":
		return " (on the log-odds scale)"
	}
	return ""
}

// pooledScale gives an estimate and its variance on the scale Rubin's
// rules pool it on.
func pooledScale(e est, n int, level float64) (q, u float64) {
	switch {
	case e.method == MethodPartial:
		return math.Atanh(e.value), 1 / float64(n-len(e.adjusted)-3)
	case e.scale == "odds_ratio":
		se := effects.SEFromCI(math.Log(e.lo), math.Log(e.hi), level)
		return math.Log(e.value), se * se
	}
	return e.value, e.se * e.se
}

func (a *Analysis) binaryVariables() []bool {
	binary := make([]bool, len(a.Study.Names))
	for i, v := range a.Study.Package.Variables {
		binary[i] = v.Scale == ScaleBinary
	}
	return binary
}

// dataSeed takes the randomness of the imputations from what they depend
// on, the data and which variables are binary, and nothing else: the same
// data give the same numbers whatever the title, texts or names say.
func dataSeed(cols [][]float64, binaryVars []bool) uint64 {
	h := sha256.New()
	var b [8]byte
	for j, col := range cols {
		binary.BigEndian.PutUint64(b[:], uint64(len(col))<<1|uint64(boolInt(binaryVars[j])))
		h.Write(b[:])
		for _, v := range col {
			binary.BigEndian.PutUint64(b[:], math.Float64bits(v))
			h.Write(b[:])
		}
	}
	return binary.BigEndian.Uint64(h.Sum(nil)[:8])
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}
