package checks

import (
	"fmt"
	"math"
	"strings"

	"github.com/pathvet/pathvet/checks/effects"
	"github.com/pathvet/pathvet/checks/missing"
)

// Notes of the maximum-likelihood estimates (see mlInference).
const (
	mlNoteFormat = "point estimate from the EM mean and covariance of all %d rows; SE by the delta method " +
		"from the observed information of the saturated normal model, as full-information maximum likelihood " +
		"gives it; %s under the normal"
	mlNoteCoefficient  = "p-value and interval"
	mlNoteCorrelation  = "p-value and interval on Fisher's z scale (SE / (1 − r²))"
	mlNotConvergedNote = "; EM stopped after %d steps without meeting its tolerance, so the information may " +
		"not be taken at the maximum"
	mlNoSEFormat = "no standard error: %v"
)

// mlMoments are what maximum-likelihood moments under missing data (EM)
// carry for their standard errors: the EM estimate, and the covariance of
// its (μ̂, vech Σ̂), the inverse of the observed information of the
// saturated normal model, held as the information's factor (missing.EstimateCovariance, computed once in
// missingData), or why it could not be had.
type mlMoments struct {
	em      *missing.EMResult
	acov    *missing.Covariance
	acovErr error
}

// mlInference gives a maximum-likelihood estimate e of claim c (the
// estimator run on the EM mean and covariance) its SE, p-value and
// interval from the observed information, carried to the coefficient by
// the delta method (missing.DeltaSE), under the normal. Where the
// information could not be had, e becomes an error that says why, so that
// no comparison rests on a complete-data SE.
func (a *Analysis) mlInference(c Claim, e est, r *mlMoments) est {
	if !e.ok() || e.method == MethodZero {
		return e
	}
	kind, ok := mlCoefficient(e)
	if !ok {
		return e.failed(fmt.Errorf(mlNoSEFormat, "the delta method is carried to linear coefficients and "+
			"partial correlations only"))
	}
	if r.acovErr != nil {
		return e.failed(fmt.Errorf(mlNoSEFormat, strings.TrimPrefix(r.acovErr.Error(), "missing: ")))
	}
	y, x := a.Study.Index[c.To], append([]int{a.Study.Index[c.From]}, e.adjusted...)
	_, se, err := missing.DeltaSE(r.em.Cov, r.acov, y, x, kind)
	if err != nil {
		return e.failed(fmt.Errorf(mlNoSEFormat, strings.TrimPrefix(err.Error(), "missing: ")))
	}
	q := effects.TQuantile(0.5+claimLevel(c)/2, effects.Normal)
	e.se, e.df = se, effects.Normal
	what := mlNoteCoefficient
	if kind == missing.PartialCorrelation {
		z, sez := math.Atanh(e.value), se/(1-e.value*e.value)
		e.lo, e.hi, e.p = math.Tanh(z-q*sez), math.Tanh(z+q*sez), effects.PFromZ(z, sez)
		what = mlNoteCorrelation
	} else {
		e.lo, e.hi, e.p = e.value-q*se, e.value+q*se, effects.PFromZ(e.value, se)
	}
	note := fmt.Sprintf(mlNoteFormat, e.n, what)
	if !r.em.Converged {
		note += fmt.Sprintf(mlNotConvergedNote, r.em.Iterations)
	}
	e.note = joinNotes(e.note, note)
	return e
}

// failed is e without its figures, failed with err.
func (e est) failed(err error) est {
	return est{err: err, method: e.method, scale: e.scale, n: e.n, adjusted: e.adjusted}
}

// mlCoefficient is the function of Σ that estimate e is.
func mlCoefficient(e est) (missing.Coefficient, bool) {
	switch {
	case e.method == MethodPartial:
		return missing.PartialCorrelation, true
	case e.method == MethodOLS && e.scale == "unstandardized":
		return missing.Unstandardized, true
	case e.method == MethodOLS && e.scale == "standardized":
		return missing.Standardized, true
	}
	return 0, false
}

// joinNotes joins two notes with a semicolon, either of them possibly
// empty.
func joinNotes(a, b string) string {
	switch {
	case a == "":
		return b
	case b == "":
		return a
	}
	return a + "; " + b
}
