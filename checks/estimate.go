package checks

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/pathvet/pathvet/checks/linmod"
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
}

func (e est) ok() bool { return e.err == nil }

// category is +1 or −1 for an estimate significant at alpha with that
// sign, 0 otherwise.
func (e est) category(alpha float64) int {
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
	return r
}

// parentsFunc gives the parents of a node in some graph.
type parentsFunc func(v int) []int

// estimateClaim estimates claim c with parents pa (README, "Checks",
// "equivalence"): a direct effect is the coefficient of from when to is
// regressed on its parents, zero where from is not one of them; a total
// effect is the coefficient of from when to is regressed on from and the
// parents of from, zero where to is a parent of from; an association is
// the coefficient of from when to is regressed on from and adjust_for, as
// is any claim when pa is nil (no graph declared).
func (a *Analysis) estimateClaim(c Claim, pa parentsFunc) est {
	m, err := a.moments()
	if err != nil {
		return est{err: a.dataError(), scale: claimScale(c)}
	}
	return a.estimateWith(m, c, pa)
}

// estimateWith estimates claim c with parents pa from the moments m (the
// study's own, or those of one way of handling missing data).
func (a *Analysis) estimateWith(m *Moments, c Claim, pa parentsFunc) est {
	s := a.Study
	from, to := s.Index[c.From], s.Index[c.To]
	switch {
	case pa == nil: // no graph: the authors' own adjustment set
	case c.Kind == KindDirect:
		parents := pa(to)
		if !slices.Contains(parents, from) {
			return structuralZero(c, parents, directZeroWhy(c, pa(from), to, "this graph"))
		}
		return a.regress(m, c, to, from, parents)
	case c.Kind == KindTotal:
		parents := pa(from)
		if slices.Contains(parents, to) {
			return structuralZero(c, parents, fmt.Sprintf(
				"no directed path from %s to %s in this graph (%s is a parent of %s)", c.From, c.To, c.To, c.From))
		}
		return a.regress(m, c, to, from, parents)
	}
	var adj []int
	for _, v := range c.AdjustFor {
		adj = append(adj, s.Index[v])
	}
	return a.regress(m, c, to, from, adj)
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

// regress estimates the coefficient of focal for outcome y adjusted for
// others, on the claim's scale, from m, caching the result.
func (a *Analysis) regress(m *Moments, c Claim, y, focal int, others []int) est {
	var adj []int
	for _, v := range others {
		if v != focal && v != y && !slices.Contains(adj, v) {
			adj = append(adj, v)
		}
	}
	slices.Sort(adj)
	scale, level := claimScale(c), claimLevel(c)
	key := fmt.Sprint(m.Method, y, focal, adj, scale, level)
	if e, ok := a.fits[key]; ok {
		return e
	}
	e := a.fitRegression(m, y, focal, adj, scale, level)
	e.adjusted = adj
	if a.fits == nil {
		a.fits = map[string]est{}
	}
	a.fits[key] = e
	return e
}

func (a *Analysis) fitRegression(m *Moments, y, focal int, adj []int, scale string, level float64) est {
	x := append([]int{focal}, adj...)
	if o, ok := a.olsInput(m, y, scale); ok {
		return olsEstimate(o.cov, o.means, m.N, y, x, o.scale, level, o.note)
	}
	if a.Study.Package.Variables[y].Scale == ScaleBinary && m.Rows != nil {
		return logisticEstimate(m, y, x, scale, level)
	}
	return partialEstimate(m, y, focal, adj, level)
}

func scaleName(s string) string { return strings.ReplaceAll(s, "_", " ") }

func needs(scale string) string {
	if scale == "unstandardized" {
		return "the SDs"
	}
	return "raw rows and a binary outcome"
}

func olsEstimate(cov mat.Symmetric, means []float64, n, y int, x []int, scale string, level float64, note string) est {
	fit, err := linmod.FromMoments(cov, means, n, y, x, level)
	if errors.Is(err, linmod.ErrTooFewCases) {
		err = fmt.Errorf("%s for a regression with %d parameters besides its intercept: it needs at least %d (%w)",
			count(n, "case", "cases"), len(x), len(x)+2, err)
	}
	if err != nil {
		return est{err: err, scale: scale, method: MethodOLS, n: n}
	}
	c := fit.Coefs[0]
	return est{value: c.Estimate, additive: c.Estimate, se: c.StdError, lo: c.CI[0], hi: c.CI[1], p: c.P,
		method: MethodOLS, scale: scale, n: n, df: float64(fit.DF), note: note}
}

func partialEstimate(m *Moments, y, focal int, adj []int, level float64) est {
	r, err := linmod.PartialCorrelation(m.Cor, focal, y, adj)
	e := est{method: MethodPartial, scale: "correlation", n: m.N}
	if err != nil {
		e.err = err
		return e
	}
	_, p, ok := linmod.FisherZ(r, m.N, len(adj))
	if !ok {
		e.err = errors.New("too few cases for Fisher's z")
		return e
	}
	half := distuv.UnitNormal.Quantile(0.5+level/2) / math.Sqrt(float64(m.N-len(adj)-3))
	e.value, e.additive, e.p = r, r, p
	e.lo, e.hi = math.Tanh(math.Atanh(r)-half), math.Tanh(math.Atanh(r)+half)
	e.se = math.NaN() // intervals for correlations come from Fisher's z, not an SE
	return e
}

func logisticEstimate(m *Moments, y int, x []int, scale string, level float64) est {
	n, _ := m.Rows.Dims()
	xs := mat.NewDense(n, len(x), nil)
	for j, v := range x {
		xs.SetCol(j, mat.Col(nil, v, m.Rows))
	}
	fit, err := linmod.Logistic(xs, mat.Col(nil, y, m.Rows), level)
	e := est{method: MethodLogit, scale: "log_odds", n: n}
	if err != nil {
		e.err = err
		return e
	}
	c := fit.Coefs[0]
	e.value, e.additive, e.se, e.lo, e.hi, e.p = c.Estimate, c.Estimate, c.StdError, c.CI[0], c.CI[1], c.P
	if scale == "odds_ratio" {
		e.scale = "odds_ratio"
		e.value, e.lo, e.hi = math.Exp(c.Estimate), math.Exp(c.CI[0]), math.Exp(c.CI[1])
		e.se = math.NaN()
		e.note = "odds ratio per unit of the predictor; its interval is the exponentiated Wald interval of the log-odds"
	} else if scale != "log_odds" {
		e.note = "the outcome is binary, so its equation is a logistic regression: the estimate is in log-odds"
	}
	return e
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
	for _, v := range append([]string{c.From, c.To}, c.AdjustFor...) {
		if !s.InGraph[s.Index[v]] {
			return false
		}
	}
	return true
}
