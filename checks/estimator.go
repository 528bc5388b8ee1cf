package checks

import (
	"context"

	"github.com/pathvet/pathvet/checks/dag"
)

// The estimation seam (DEVELOPERS.md, "Estimation"). Every check that
// estimates a claim does it through the study's estimator: under the
// declared graph, a plausible equivalent, a stated alternative or a nearby
// graph; on the study's own moments, on those of a missing-data method, an
// imputed dataset, corrected correlations or recoded data. It fits a graph
// to the data and gives each claim's estimate under the fitted graph, so
// that no check needs to know what kind of model stands behind the
// figures: the observed path model (observed.go) is the first
// implementation, and a model with latent variables plugs in here beside
// it.

// estimator fits graphs to data and estimates claims under them.
// Implementations cache what they fit: the checks ask for the same graph
// and moments many times (once per claim, and again in other checks).
type estimator interface {
	// fitGraph fits the graph g over the variables marked in to the
	// study's own data (its complete cases, or its summary statistics)
	// and gives its global fit: χ², df, p, the fit indices and the
	// χ²-based BIC that graph-fit, alternatives and nearby-graphs report.
	fitGraph(ctx context.Context, g *dag.PDAG, in []bool) (*modelFit, error)
	// under is the graph whose parents pa gives, fitted to the moments m.
	// A nil pa means no graph: the claim is not in the declared graph, or
	// none is declared, and each claim is then estimated with its own
	// adjustment set (an association's). A fit that fails shows in the
	// estimates, each with its error.
	under(ctx context.Context, m *Moments, pa parentsFunc) fittedGraph
}

// fittedGraph is one graph fitted to one set of moments.
type fittedGraph interface {
	// claim is claim c's estimate under the graph, on the claim's scale:
	// MethodZero, with the reason, where the graph itself gives the claim
	// no effect (an arrow the other way, no directed path); an est with
	// err where it cannot be estimated.
	claim(c Claim) est
	// resampled is claim c's estimate e (from claim) with an interval
	// from resampling the raw rows behind the moments, where the claim's
	// kind has one and there are rows (an indirect effect's percentile
	// bootstrap, which then judges its significance); e as it is
	// otherwise. The declared estimate asks for it.
	resampled(c Claim, e est) est
}

// parentsFunc gives the parents of a node in some graph.
type parentsFunc func(v int) []int

// estimator returns the study's estimator: the observed path model.
func (a *Analysis) estimator() estimator {
	if a.estimation == nil {
		a.estimation = observedEstimator{a: a}
	}
	return a.estimation
}

// estimateUnder is claim c under the graph pa fitted to the moments m,
// through the study's estimator.
func (a *Analysis) estimateUnder(m *Moments, pa parentsFunc, c Claim) est {
	return a.estimator().under(a.context(), m, pa).claim(c)
}

// estimateClaim is claim c under the graph pa fitted to the study's own
// moments (its complete cases or summary statistics).
func (a *Analysis) estimateClaim(c Claim, pa parentsFunc) est {
	m, err := a.moments()
	if err != nil {
		return est{err: a.dataError(), scale: claimScale(c)}
	}
	return a.estimateUnder(m, pa, c)
}

// fitGraph fits g over the variables marked in, through the study's
// estimator.
func (a *Analysis) fitGraph(ctx context.Context, g *dag.PDAG, in []bool) (*modelFit, error) {
	return a.estimator().fitGraph(ctx, g, in)
}

// context is the run's context, for estimates that shared results start
// lazily (Run sets it; an Analysis made elsewhere, as in tests, has none).
func (a *Analysis) context() context.Context {
	if a.ctx == nil {
		return context.Background()
	}
	return a.ctx
}
