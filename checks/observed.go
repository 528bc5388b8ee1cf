package checks

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/linmod"
	"github.com/pathvet/pathvet/checks/sem"
)

// The observed path model, the first implementation of the estimation
// seam (estimator.go): every variable is a measured column, a graph's fit
// is the ML fit of its node regressions (sem.FitDAG), and a claim is the
// coefficient of one regression of the moments (README, "Checks",
// "Estimation conventions").

// observedEstimator estimates claims by regressions of the moments.
type observedEstimator struct{ a *Analysis }

func (o observedEstimator) under(ctx context.Context, m *Moments, pa parentsFunc) fittedGraph {
	return observedGraph{a: o.a, m: m, pa: pa, ctx: ctx}
}

// observedGraph is a graph over measured variables fitted to moments m.
// Nothing is fitted until a claim asks: each claim needs one regression,
// which Analysis.regress caches by its outcome, predictors and scale.
type observedGraph struct {
	a   *Analysis
	m   *Moments
	pa  parentsFunc
	ctx context.Context // watched by the Monte Carlo draws
}

// claim estimates claim c with parents pa (README, "Checks",
// "equivalence"): a direct effect is the coefficient of from when to is
// regressed on its parents, zero where from is not one of them; a total
// effect is the coefficient of from when to is regressed on from and the
// parents of from, zero where to is a parent of from; an association is
// the coefficient of from when to is regressed on from and adjust_for, as
// is any claim when pa is nil (no graph declared).
//
// Maximum-likelihood moments under missing data give each estimate its SE
// from the observed information (mlInference).
func (g observedGraph) claim(c Claim) est {
	e := g.estimate(c)
	switch {
	case g.m.ml != nil && c.Kind == KindIndirect:
		e = g.mlIndirect(c, e)
	case g.m.ml != nil:
		e = g.a.mlInference(c, e, g.m.ml)
	}
	return e
}

func (g observedGraph) estimate(c Claim) est {
	a, m, pa := g.a, g.m, g.pa
	s := a.Study
	from, to := s.Index[c.From], s.Index[c.To]
	switch {
	case c.Kind == KindIndirect:
		return g.indirect(c)
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

// fitGraph fits g over the variables marked in by the path model's ML
// fit of the correlation matrix (sem.FitDAG), one equation per node.
func (o observedEstimator) fitGraph(ctx context.Context, g *dag.PDAG, in []bool) (*modelFit, error) {
	a := o.a
	m, err := a.moments()
	if err != nil {
		return nil, err
	}
	var nodes []int
	pos := map[int]int{}
	for v, ok := range in {
		if ok {
			pos[v] = len(nodes)
			nodes = append(nodes, v)
		}
	}
	sub := mat.NewSymDense(len(nodes), nil)
	parents := make([][]int, len(nodes))
	for i, v := range nodes {
		for j, w := range nodes[:i+1] {
			sub.SetSym(i, j, m.Cor.At(v, w))
		}
		for _, p := range g.Parents(v) {
			parents[i] = append(parents[i], pos[p])
		}
	}
	f, err := sem.FitDAG(ctx, sub, m.N, parents)
	var ee *sem.EquationError
	if errors.As(err, &ee) && errors.Is(ee.Err, linmod.ErrTooFewCases) {
		k := len(parents[ee.Variable])
		return nil, fmt.Errorf("the equation of %s has %s and the data %s; it needs at least %d (%w)",
			a.Study.Names[nodes[ee.Variable]], count(k, "parent", "parents"), count(m.N, "case", "cases"), k+2, ee.Err)
	}
	if errors.As(err, &ee) {
		return nil, fmt.Errorf("the equation of %s: %w", a.Study.Names[nodes[ee.Variable]], ee.Err)
	}
	if err != nil {
		return nil, err
	}
	return &modelFit{fit: f, nodes: nodes}, nil
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
