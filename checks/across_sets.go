package checks

import (
	"slices"

	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/linmod"
)

// graphEstimator estimates a claim in one of the graphs it is re-estimated
// in.
type graphEstimator func(g alternativeGraph) est

// memberEstimator estimates claim c in a graph from its parents, the one
// way for every graph (estimateClaim).
func (a *Analysis) memberEstimator(c Claim) graphEstimator {
	return func(g alternativeGraph) est { return a.estimateClaim(c, g.pa) }
}

// parentSetEstimator is what an estimator (estimator.go) may offer beside
// the seam's two methods: a claim estimated over many locally valid
// parent sets of one node at once, each the same estimate that under and
// claim would give. The observed path model offers it; an estimator
// without it is asked set by set.
type parentSetEstimator interface {
	overParentSets(c Claim, cpdag *dag.PDAG, node int) graphEstimator
}

// setEstimator estimates claim c over the locally valid parent sets of
// node in the class of cpdag, through the study's estimator.
func (a *Analysis) setEstimator(c Claim, cpdag *dag.PDAG, node int) graphEstimator {
	if p, ok := a.estimator().(parentSetEstimator); ok {
		return p.overParentSets(c, cpdag, node)
	}
	return a.memberEstimator(c)
}

// overParentSets estimates claim c over the locally valid parent sets of
// node (parentsNode) in the class of cpdag. Every such set is the node's
// arcs in the CPDAG plus some of its undirected neighbours, so the OLS fits
// share the compelled parents (a total effect: the cause and its
// compelled parents), and linmod.Bordered fits each set at the cost of its
// few undirected neighbours rather than refitting the whole regression.
// Where that does not apply (a logistic or partial-correlation estimate, a
// matrix that might fail FromMoments' condition check, a structural zero,
// a fit that fails) a set is estimated by estimateClaim, so the estimates
// are the same either way (TestSetEstimator_AgreesWithEstimateClaim).
func (obs observedEstimator) overParentSets(c Claim, cpdag *dag.PDAG, node int) graphEstimator {
	a := obs.a
	slow := a.memberEstimator(c)
	m, err := a.moments()
	if err != nil || !(c.Kind == KindDirect || c.Kind == KindTotal) {
		return slow
	}
	y, from := a.Study.Index[c.To], a.Study.Index[c.From]
	o, ok := a.olsInput(m, y, claimScale(c))
	if !ok || !a.wellConditioned(m) {
		return slow
	}
	base, extra := cpdag.Parents(node), cpdag.Siblings(node)
	if c.Kind == KindTotal {
		base = append([]int{from}, base...)
		extra = slices.DeleteFunc(extra, func(v int) bool { return v == y })
	}
	b, err := linmod.NewBordered(o.cov, m.N, y, base, extra, claimLevel(c))
	if err != nil {
		return slow
	}
	inBase := make([]bool, len(a.Study.Names))
	for _, v := range base {
		inBase[v] = true
	}
	return func(g alternativeGraph) est {
		e, ok := a.borderedEstimate(c, b, o, m.N, g.parents, inBase)
		if !ok {
			return slow(g)
		}
		return e
	}
}

// borderedEstimate fits claim c with the parent set set from b; ok is
// false where estimateClaim must: the graph gives the claim no effect, or
// the fit fails (estimateClaim then says why).
// The sets are sorted and hold each node once (dag.LocalParentSets), so
// the adjustment set is the set less the cause and outcome, in order, as
// regress makes it.
func (a *Analysis) borderedEstimate(c Claim, b *linmod.Bordered, o olsFit, n int, set []int, inBase []bool) (est,
	bool) {
	y, from := a.Study.Index[c.To], a.Study.Index[c.From]
	if c.Kind == KindDirect && !slices.Contains(set, from) || c.Kind == KindTotal && slices.Contains(set, y) {
		return est{}, false
	}
	var extra []int
	adj := set // a total effect's set of the cause's parents holds neither the cause nor the outcome
	if c.Kind == KindDirect {
		adj = make([]int, 0, len(set)-1)
	}
	for _, v := range set {
		if !inBase[v] {
			extra = append(extra, v)
		}
		if c.Kind == KindDirect && v != from {
			adj = append(adj, v)
		}
	}
	fit, df, err := b.Coef(extra, from)
	if err != nil {
		return est{}, false
	}
	return est{value: fit.Estimate, additive: fit.Estimate, se: fit.StdError, lo: fit.CI[0], hi: fit.CI[1],
		p: fit.P, method: MethodOLS, scale: o.scale, n: n, df: float64(df), note: o.note, adjusted: adj}, true
}

// wellConditioned reports, once per moments, whether no regression on
// them can fail FromMoments' condition check (linmod.WellConditioned).
func (a *Analysis) wellConditioned(m *Moments) bool {
	if a.condChecked != m {
		a.condChecked, a.condOK = m, linmod.WellConditioned(m.Cor)
	}
	return a.condOK
}
