package checks

import (
	"fmt"
	"math"
	"slices"
)

// Estimation methods named in reports.
const (
	MethodOLS     = "ols"
	MethodLogit   = "logistic"
	MethodPartial = "partial_correlation"
	// MethodZero: the graph itself makes the effect zero (the arrow points
	// the other way, or the outcome is a parent of the cause).
	MethodZero = "zero_by_graph"
)

// est is one claim estimated one way, before it goes into a report.
type est struct {
	value, se, lo, hi, p float64
	// additive is the estimate on a scale where 0 means no effect (the
	// log-odds for an odds ratio), for signs.
	additive float64
	method   string
	scale    string
	n        int
	df       float64 // residual df of an OLS fit, for its t tests; 0 otherwise
	adjusted []int
	note     string
	// zero says why the graph makes the estimate zero (MethodZero).
	zero string
	// mcse is the Monte Carlo error of a pooled estimate, on its pooling
	// scale; nearLine that it could carry it across the significance line.
	mcse     float64
	nearLine bool
	err      error
	// An indirect effect has no p-value (p is NaN): intervals are its
	// intervals by method (indirect.go), judge the one at level 1 − α by
	// which its significance is judged, and draws the sorted draws behind
	// it (Monte Carlo or bootstrap), for pooling over imputations.
	intervals []namedInterval
	judge     *namedInterval
	draws     []float64
}

func (e est) ok() bool { return e.err == nil }

// category is +1 or −1 for an estimate significant at alpha with that
// sign, 0 otherwise.
func (e est) category(alpha float64) int {
	if e.judge != nil && e.method != MethodZero && e.judge.excludesZero() {
		return int(math.Copysign(1, e.judge.lo))
	}
	if e.method == MethodZero || !(e.p < alpha) {
		return 0
	}
	if e.additive > 0 {
		return 1
	}
	return -1
}

// Estimate is a claim's value estimated one way, as a report shows it.
type Estimate struct {
	Estimate    *float64  `json:"estimate"`
	StdError    *float64  `json:"std_error"`
	CI          []float64 `json:"ci"`
	PValue      *float64  `json:"p_value"`
	Method      string    `json:"method"`
	Scale       string    `json:"scale"`
	N           int       `json:"n,omitempty"`
	AdjustedFor []string  `json:"adjusted_for"`
	Note        string    `json:"note,omitempty"`
	// StructuralZero says why the graph itself makes the estimate "no
	// effect"; its SE, interval and p-value are then null, not 0.
	StructuralZero string `json:"structural_zero,omitempty"`
	// MonteCarloError is the Monte Carlo error of a pooled
	// multiple-imputation estimate, sqrt(B/m), on its pooling scale.
	MonteCarloError *float64 `json:"monte_carlo_error,omitempty"`
	Error           string   `json:"error,omitempty"`
	// Distribution is what the p-value and interval are taken under:
	// "t(df)" for OLS, "normal" for a logistic Wald test or Fisher's z.
	Distribution string `json:"distribution,omitempty"`
	// Intervals are an indirect effect's intervals at the claim's level,
	// each with its method (delta_method, monte_carlo,
	// bootstrap_percentile, monte_carlo_imputations_mixed); CI is the one
	// named by Significance.
	Intervals []NamedInterval `json:"intervals,omitempty"`
	// Significance is the interval, at level 1 − α, by whose exclusion of
	// zero an indirect effect is judged significant (it has no p-value).
	Significance *NamedInterval `json:"significance,omitempty"`
}

// NamedInterval is one interval of an estimate, with its method.
type NamedInterval struct {
	Method string    `json:"method"`
	CI     []float64 `json:"ci"`
	Level  float64   `json:"level"`
	// Draws counts the Monte Carlo draws or bootstrap resamples that gave
	// a value, Failed those that did not (a singular resample).
	Draws        int   `json:"draws,omitempty"`
	Failed       int   `json:"failed,omitempty"`
	ExcludesZero *bool `json:"excludes_zero,omitempty"`
}

func (iv namedInterval) report(judged bool) NamedInterval {
	r := NamedInterval{Method: iv.method, Level: iv.level, Draws: iv.draws, Failed: iv.failed, CI: []float64{}}
	if lo, hi := finite(iv.lo), finite(iv.hi); lo != nil && hi != nil {
		r.CI = []float64{*lo, *hi}
	}
	if judged {
		x := iv.excludesZero()
		r.ExcludesZero = &x
	}
	return r
}

// finite returns a pointer to x rounded for a report, or nil where x is
// not a finite number.
func finite(x float64) *float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	r := round(x)
	return &r
}

func (a *Analysis) report(e est) *Estimate {
	r := &Estimate{Method: e.method, Scale: e.scale, N: e.n, Note: e.note, AdjustedFor: []string{}}
	for _, v := range e.adjusted {
		r.AdjustedFor = append(r.AdjustedFor, a.Study.Names[v])
	}
	if e.err != nil {
		r.Error = e.err.Error()
		return r
	}
	if e.method == MethodZero {
		v := zeroOnScale(e.scale)
		r.Estimate, r.StructuralZero = &v, e.zero
		return r
	}
	r.Estimate, r.StdError, r.PValue = finite(e.value), finite(e.se), finite(e.p)
	if e.method == "multiple_imputation" {
		r.MonteCarloError = finite(e.mcse)
	}
	r.Distribution = e.distribution()
	if lo, hi := finite(e.lo), finite(e.hi); lo != nil && hi != nil {
		r.CI = []float64{*lo, *hi}
	}
	for _, iv := range e.intervals {
		r.Intervals = append(r.Intervals, iv.report(false))
	}
	if e.judge != nil {
		j := e.judge.report(true)
		r.Significance = &j
	}
	return r
}

func structuralZero(c Claim, adjusted []int, why string) est {
	return est{method: MethodZero, scale: claimScale(c), adjusted: adjusted, zero: why}
}

// directZeroWhy says why a graph gives a direct effect of c.From on c.To
// no arrow: it points the other way, or there is none.
func directZeroWhy(c Claim, parentsOfFrom []int, to int, graph string) string {
	if slices.Contains(parentsOfFrom, to) {
		return fmt.Sprintf("the arrow points the other way (%s → %s) in %s", c.To, c.From, graph)
	}
	return fmt.Sprintf("no arrow %s → %s in %s", c.From, c.To, graph)
}

func claimScale(c Claim) string {
	if c.EstimateScale == "" {
		return "standardized"
	}
	return c.EstimateScale
}

func claimLevel(c Claim) float64 {
	if c.CILevel != nil {
		return *c.CILevel
	}
	return 0.95
}

// declaredEstimate is claim i under the declared graph (or, with none, its
// own adjustment set), computed once.
func (a *Analysis) declaredEstimate(i int) est {
	if a.declared == nil {
		a.declared = make([]*est, len(a.Study.Package.Claims))
	}
	if a.declared[i] == nil {
		var pa parentsFunc
		if a.Study.Declared != nil && a.claimInGraph(a.Study.Package.Claims[i]) {
			pa = a.Study.Declared.Parents
		}
		c := a.Study.Package.Claims[i]
		e := a.estimateClaim(c, pa)
		if m, err := a.moments(); err == nil {
			e = a.estimator().under(a.context(), m, pa).resampled(c, e)
		}
		if why := a.graphContradiction(c); why != "" && e.ok() {
			e = structuralZero(c, e.adjusted, why) // a total effect with no directed path, too
		}
		a.declared[i] = &e
	}
	return *a.declared[i]
}

// claimInGraph reports whether every variable of the claim is a node of
// the declared graph.
func (a *Analysis) claimInGraph(c Claim) bool {
	s := a.Study
	if s.Declared == nil {
		return false
	}
	for _, v := range append(append([]string{c.From, c.To}, c.AdjustFor...), c.Through...) {
		if !s.InGraph[s.Index[v]] {
			return false
		}
	}
	return true
}
