package checks

import (
	"context"
	"fmt"
	"math"
	"slices"
	"sync"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/mediation"
	"github.com/pathvet/pathvet/checks/missing"
)

// missing-data: is the method stated and sound; with raw data, do the
// claims survive a principled method? (README, "Checks")
var missingDataCheck = Check{
	ID:    "missing-data",
	Title: "Missing data",
	Run:   withDataQuality(runMissingData),
	Summaries: map[string]string{
		StatusPass:          "No claim changes its conclusion once missing values are handled by a principled method.",
		StatusWarn:          "The way missing values were handled or reported needs attention; see the findings.",
		StatusFail:          "A headline claim changes sign or significance once missing values are handled by a principled method; the conclusion rests on the missing-data method, not on the data.",
		StatusNotApplicable: "No value is missing in the data, so there is nothing to re-analyse.",
	},
}

// Imputations is m, the number of imputed datasets; MaxImputations the m
// it is raised to where the Monte Carlo error of a pooled estimate could
// move it across the significance line.
const (
	Imputations    = missing.DefaultImputations
	MaxImputations = 100
)

// unsoundMethods bias coefficients and understate uncertainty (Little &
// Rubin, Statistical Analysis with Missing Data, ch. 4).
var unsoundMethods = map[string]string{
	MissingMeanSubstitution: "Mean substitution",
	MissingSingleRegression: "Single regression imputation",
	MissingCarryForward:     "Carrying the last value forward",
}

// missingResult is the missing-data analysis of raw rows, computed once.
type missingResult struct {
	summary missing.Summary
	em      *missing.EMResult
	mcar    *missing.MCARTest
	// moments by method key: complete_cases, maximum_likelihood, the
	// declared single imputation; and one per imputed dataset.
	moments map[string]*Moments
	// imputed are the moments of each imputed dataset (without its rows),
	// imputedEst[i][k] claim i's estimate in imputed dataset k.
	imputed     []*Moments
	imputedEst  [][]est
	pairwiseErr string
	err         error
	// raised lists the claims whose pooled estimate, with Imputations,
	// lay within Monte Carlo error of the significance line, so that m
	// was raised to MaxImputations; stillNear those for which it still
	// does; raiseErr why raising failed.
	raised, stillNear []string
	raiseErr          error
}

func (a *Analysis) missingData(ctx context.Context) *missingResult {
	if a.miss != nil {
		return a.miss
	}
	d := a.Study.Data
	r := &missingResult{summary: missing.Summarize(d.Columns), moments: map[string]*Moments{}}
	a.miss = r
	if m, err := a.moments(); err == nil {
		r.moments[MissingCompleteCases] = m
	}
	if r.summary.MissingCells == 0 {
		return r
	}
	em, err := missing.EM(ctx, d.Columns, missing.Options{})
	if err != nil {
		r.err = err
		return r
	}
	r.em = em
	if t, err := missing.LittleMCAR(d.Columns, em); err == nil {
		r.mcar = &t
	}
	ml := emMoments(em, d.N)
	ml.ml = &mlMoments{em: em}
	ml.ml.acov, ml.ml.acovErr = missing.EstimateCovariance(ctx, d.Columns, em)
	r.moments[MissingMaximumLikelihood] = ml
	a.declaredMethodMoments(r)
	if err := a.imputeClaims(ctx, r, Imputations); err != nil {
		r.err = err
	}
	a.raiseImputations(ctx, r)
	return r
}

// imputeClaims draws the imputed datasets one by one and keeps of each
// only its moments and the claims' estimates in it, so that memory does
// not grow with the number of imputations. Without binary variables the
// claims need only moments, which missing.ImputeMoments gives without
// laying a dataset out; the rows are kept (missing.ImputeEach) where a
// binary variable has missing values, whose draws are rounded row by row,
// or is a claim's outcome, which a logistic regression of the rows
// estimates.
func (a *Analysis) imputeClaims(ctx context.Context, r *missingResult, m int) error {
	claims, binary := a.Study.Package.Claims, a.binaryVariables()
	imputed, ests := make([]*Moments, m), make([][]est, len(claims))
	for i := range ests {
		ests[i] = make([]est, m)
	}
	var mu sync.Mutex
	done := 0
	// keep estimates the claims in imputation k's moments. The method
	// names the run (k of m), so estimates cached for one set of
	// imputations are never read for another.
	keep := func(k int, mean []float64, cov *mat.SymDense, rows *mat.Dense) error {
		mo, err := momentsFrom(a.Study.Data.N, mean, cov, rows, fmt.Sprintf("imputation_%d_of_%d", k+1, m))
		if err != nil {
			return err
		}
		mo.draws = max(1, mediation.DefaultDraws/m)
		mu.Lock()
		defer mu.Unlock()
		for i, c := range claims {
			ests[i][k] = a.estimateUnder(mo, a.declaredParentsFor(c), c)
		}
		mo.Rows, imputed[k] = nil, mo
		done++
		a.reportProgress("missing data: imputations", done, m)
		return nil
	}
	cols := a.Study.Data.Columns
	opt := missing.ImputeOptions{M: m, Seed: dataSeed(cols, binary), Binary: binary}
	var err error
	if a.imputationsNeedRows(binary) {
		err = missing.ImputeEach(ctx, cols, r.em, opt, func(k int, data *mat.Dense) error {
			mean, cov := missing.RowMoments(data)
			return keep(k, mean, cov, data)
		})
	} else {
		err = missing.ImputeMoments(ctx, cols, r.em, opt, func(k int, mean []float64, cov *mat.SymDense) error {
			return keep(k, mean, cov, nil)
		})
	}
	if err == nil {
		r.imputed, r.imputedEst = imputed, ests
	}
	return err
}

// imputationsNeedRows says whether the imputed datasets must be laid out
// as rows (see imputeClaims).
func (a *Analysis) imputationsNeedRows(binary []bool) bool {
	for j, isBin := range binary {
		if isBin && slices.ContainsFunc(a.Study.Data.Columns[j], math.IsNaN) {
			return true
		}
	}
	for _, c := range a.Study.Package.Claims {
		if binary[a.Study.Index[c.To]] {
			return true
		}
	}
	return false
}

func emMoments(em *missing.EMResult, n int) *Moments {
	p := len(em.Mean)
	m := &Moments{
		N:      n,
		Cor:    mat.NewSymDense(p, nil),
		SD:     make([]float64, p),
		Means:  em.Mean,
		Method: MissingMaximumLikelihood,
	}
	for i := range p {
		m.SD[i] = math.Sqrt(em.Cov.At(i, i) * float64(n) / float64(n-1)) // on the n − 1 scale of the estimators
	}
	for i := range p {
		for j := 0; j <= i; j++ {
			m.Cor.SetSym(i, j, em.Cov.At(i, j)/math.Sqrt(em.Cov.At(i, i)*em.Cov.At(j, j)))
		}
	}
	return m
}

func columnsMatrix(cols [][]float64) *mat.Dense {
	n := len(cols[0])
	m := mat.NewDense(n, len(cols), nil)
	for j, c := range cols {
		m.SetCol(j, c)
	}
	return m
}

// declaredMethodMoments re-runs the package's own single imputation, or
// its pairwise deletion, so that its effect shows.
func (a *Analysis) declaredMethodMoments(r *missingResult) {
	d := a.Study.Data
	method := declaredMethod(a.Study.Package)
	var cols [][]float64
	switch method {
	case MissingMeanSubstitution:
		cols = missing.MeanSubstitute(d.Columns)
	case MissingSingleRegression:
		filled, err := missing.RegressionImpute(d.Columns, r.em)
		if err != nil {
			return
		}
		cols = filled
	case MissingAvailableCases:
		cor, n := missing.Pairwise(d.Columns)
		var eig mat.EigenSym
		if ok := eig.Factorize(cor, false); !ok || eig.Values(nil)[0] <= minEigen {
			low := math.NaN()
			if ok {
				low = eig.Values(nil)[0]
			}
			r.pairwiseErr = fmt.Sprintf(
				"the available-case (pairwise) correlation matrix is not positive definite (smallest eigenvalue %.4g), so no regression can be fitted to it",
				low,
			)
			return
		}
		r.moments[method] = &Moments{N: n, Cor: cor, Method: method}
		return
	default:
		return
	}
	if m, err := rowMoments(columnsMatrix(cols), method); err == nil {
		r.moments[method] = m
	}
}

func declaredMethod(p *Package) string {
	if p.MissingData == nil {
		return ""
	}
	return p.MissingData.Method
}

func runMissingData(ctx context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	method := declaredMethod(s.Package)
	if s.Data.Kind == DataSummary {
		return summaryMissing(method), nil
	}
	r := a.missingData(ctx)
	if err := ctx.Err(); err != nil {
		return CheckResult{}, err
	}
	res := CheckResult{Metrics: a.missingMetrics(r)}
	if r.summary.MissingCells == 0 {
		return completeRows(method, res), nil
	}
	res.Findings = append(methodFindings(method, r, a.Alpha), raisedFindings(r)...)
	if r.err != nil {
		res.Findings = append(
			res.Findings,
			Finding{
				Severity: StatusWarn,
				Topic:    "principled-failed",
				Message: "The claims could not be re-estimated by " + principledMissing(
					r,
				) + ": " + r.err.Error() + ".",
			},
		)
	}
	changed, uncompared := 0, 0
	for i, c := range s.Package.Claims {
		f, ch := a.claimMissing(i, c, method, r)
		res.Findings = append(res.Findings, f...)
		if ch {
			changed++
		}
		if len(f) > 0 && f[0].Severity == StatusWarn && !ch {
			uncompared++
		}
	}
	res.Metrics["claims_changed"] = changed
	res.Metrics["claims_not_compared"] = uncompared
	res.Status = statusOf(res.Findings)
	res.Summary = missingSummary(res.Status, changed, uncompared, method, r)
	return res, nil
}

func summaryMissing(method string) CheckResult {
	res := CheckResult{Metrics: map[string]any{"rows": nil}}
	if name, bad := unsoundMethods[method]; bad {
		res.Findings = []Finding{
			{
				Severity: StatusWarn,
				Topic:    "method",
				ask:      "method-unsound-summary",
				Message:  name + " biases coefficients and understates their uncertainty (Little & Rubin, Statistical Analysis with Missing Data). With summary statistics only, the screen cannot re-estimate the claims by maximum likelihood or multiple imputation.",
			},
		}
		res.Status = StatusWarn
		res.Summary = "The paper handles missing values by a method that biases coefficients, and the summary statistics do not allow a re-analysis; ask for the raw rows or a principled re-analysis."
		return res
	}
	res.Status = StatusNotApplicable
	res.Summary = "With summary statistics only, the missingness cannot be examined and the claims cannot be re-estimated by maximum likelihood or multiple imputation; raw rows would allow it."
	if method == "" {
		res.Summary = "The package does not say how missing values were handled, and with summary statistics only the claims cannot be re-analysed; ask the authors how many values were missing and what they did about them."
	}
	return res
}

func completeRows(method string, res CheckResult) CheckResult {
	if name, bad := unsoundMethods[method]; bad || method == MissingMultipleImputation ||
		method == MissingMaximumLikelihood {
		if !bad {
			name = map[string]string{MissingMultipleImputation: "Multiple imputation", MissingMaximumLikelihood: "Maximum likelihood"}[method]
		}
		res.Status = StatusWarn
		res.Findings = []Finding{
			{
				Severity: StatusWarn,
				Topic:    "completed-data",
				Message: fmt.Sprintf(
					"The rows have no missing value although the package says missing values were handled by %s: the uploaded data may be the completed data.",
					lowerFirst(name),
				),
			},
		}
		res.Summary = "The data show no missing value, yet the package says values were filled in; the uploaded rows may already be imputed."
		return res
	}
	res.Status = StatusNotApplicable
	// Said here, not left to the declared summary: withDataQuality may
	// append to it.
	res.Summary = "No value is missing in the data, so there is nothing to re-analyse."
	return res
}

func lowerFirst(s string) string {
	if s == "" {
		return s
	}
	return string(s[0]+'a'-'A') + s[1:]
}

func (a *Analysis) missingMetrics(r *missingResult) map[string]any {
	s := r.summary
	cells := 0
	if len(s.MissingByVariable) > 0 {
		cells = s.Rows * len(s.MissingByVariable)
	}
	m := map[string]any{
		"rows": s.Rows, "rows_complete": s.CompleteRows, "patterns": s.Patterns,
		"missing_cells": s.MissingCells, "share_missing_cells": num(float64(s.MissingCells) / float64(max(cells, 1))),
		"missing_by_variable": a.byName(
			s.MissingByVariable,
		), "rows_by_missing_count": s.RowsByMissing, "mcar_chi_square": nil, "mcar_df": nil, "mcar_p_value": nil,
		"imputations": 0,
	}
	if r.mcar != nil {
		m["mcar_chi_square"], m["mcar_df"], m["mcar_p_value"] = num(r.mcar.ChiSquare), r.mcar.DF, num(r.mcar.P)
	}
	if r.em != nil {
		m["em_iterations"], m["em_converged"], m["em_tolerance"] = r.em.Iterations, r.em.Converged, r.em.Tolerance
		m["em_max_iterations"] = missing.DefaultMaxIter
	}
	if len(r.raised) > 0 {
		m["imputations_raised_for"] = r.raised
	}
	if len(r.imputed) > 0 {
		m["imputations"] = len(r.imputed)
		m["imputation_method"] = "EM on bootstrap resamples, conditional normal draws; binary variables rounded adaptively"
	}
	if r.pairwiseErr != "" {
		m["available_cases_error"] = r.pairwiseErr
	}
	return m
}

func (a *Analysis) byName(counts []int) map[string]int {
	out := map[string]int{}
	for i, n := range counts {
		out[a.Study.Names[i]] = n
	}
	return out
}
