package checks

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/pathvet/pathvet/checks/mediation"
)

// Indirect effects in the observed path model (README, "Checks",
// "Indirect effects"): the sum over the directed paths from the claim's
// from to its to through every mediator of the products of their
// coefficients (mediation.Effect), its SE by the multivariate delta
// method, and its significance judged by whether an interval excludes
// zero: the Monte Carlo interval of the coefficients' joint normal
// (MacKinnon, Lockwood & Williams 2004) for every estimate, and for the
// declared estimate with raw rows the percentile bootstrap (bootstrap.go).

// MethodProduct names an indirect effect estimated as a sum of products
// of path coefficients.
const MethodProduct = "product_of_coefficients"

// Interval methods of an indirect effect.
const (
	IntervalDelta      = "delta_method"
	IntervalMonteCarlo = "monte_carlo"
	IntervalBootstrap  = "bootstrap_percentile"
	// IntervalMixture mixes the Monte Carlo draws of every imputed
	// dataset (multiple imputation; Zhou & Reiter 2010).
	IntervalMixture = "monte_carlo_imputations_mixed"
)

// namedInterval is one interval of an estimate with its method.
type namedInterval struct {
	method        string
	lo, hi, level float64
	draws, failed int // Monte Carlo draws or bootstrap resamples used, and those that gave no value
}

// excludesZero reports whether the interval lies on one side of zero.
func (iv namedInterval) excludesZero() bool { return iv.lo > 0 || iv.hi < 0 }

var errIndirectNoGraph = errors.New("an indirect effect is a sum over the directed paths of a graph, and the " +
	"claim's variables are in no declared graph")

// Notes of indirect estimates.
const (
	indirectBinaryNote = "the binary %s is treated as continuous in the equations of the effect (linear " +
		"models, as the product of coefficients needs)"
	indirectScaleNote = "estimated on the standardized scale: the unstandardized scale needs the SDs"
	monteCarloNote    = "SE by the delta method; interval: Monte Carlo, %d draws from the coefficients' joint " +
		"normal (MacKinnon, Lockwood & Williams 2004); its significance is judged by whether that interval " +
		"excludes zero"
)

// indirect estimates an indirect-effect claim under the graph.
func (g observedGraph) indirect(c Claim) est {
	a, m := g.a, g.m
	if g.pa == nil {
		return est{err: errIndirectNoGraph, scale: claimScale(c), method: MethodProduct}
	}
	p := a.claimPath(c)
	parents := effectParents(g.pa, len(a.Study.Names), p.From, p.To)
	if ok, err := mediation.HasPath(parents, p); err != nil || !ok {
		if err != nil {
			return est{err: err, scale: claimScale(c), method: MethodProduct}
		}
		return structuralZero(c, nil, noPathWhy(c, "this graph"))
	}
	key := fmt.Sprint(m.Method, "indirect", p, parents, claimScale(c), claimLevel(c))
	if e, ok := a.fits[key]; ok {
		return e
	}
	e := g.fitIndirect(c, p, parents)
	if a.fits == nil {
		a.fits = map[string]est{}
	}
	a.fits[key] = e
	return e
}

// fitIndirect fits the equations of the effect from the moments (on the
// correlation matrix for the standardized scale) with OLS's n − k − 1
// divisor, and adds the delta-method and Monte Carlo intervals.
func (g observedGraph) fitIndirect(c Claim, p mediation.Path, parents [][]int) est {
	a, m := g.a, g.m
	scale, cov := "standardized", m.Cor
	if claimScale(c) == "unstandardized" && m.SD != nil {
		scale, cov = "unstandardized", m.Cov()
	}
	e := est{method: MethodProduct, scale: scale, n: m.N, note: a.indirectNote(c, m, parents), p: math.NaN()}
	model, err := mediation.FitModel(cov, m.N, parents, mediation.OLS)
	if err != nil {
		e.err = fmt.Errorf("the equations of the indirect effect could not be fitted: %w", err)
		return e
	}
	ef, err := mediation.Effect(model, p)
	if err != nil {
		e.err = err
		return e
	}
	e.value, e.additive, e.se = ef.Effect, ef.Effect, ef.StdError
	e.df = float64(m.N - len(parents[p.To]) - 1) // the outcome equation's, for pooling (pooledIndirect)
	draws := mediation.DefaultDraws
	if m.draws > 0 {
		draws = m.draws
	}
	mc, err := mediation.MonteCarlo(g.ctx, model, p, mediation.MCOptions{
		Draws: draws, Level: claimLevel(c), Seed: a.drawSeed("monte carlo", m, p)})
	if err != nil {
		e.err = fmt.Errorf("the Monte Carlo interval could not be drawn: %w", err)
		return e
	}
	e.note = joinNotes(e.note, fmt.Sprintf(monteCarloNote, draws))
	return a.withDraws(e, IntervalMonteCarlo, mc, claimLevel(c))
}

// indirectNote says how an indirect estimate's scale and variables were
// taken: the standardized scale for want of SDs, binary variables treated
// as continuous.
func (a *Analysis) indirectNote(c Claim, m *Moments, parents [][]int) string {
	note := ""
	if claimScale(c) == "unstandardized" && m.SD == nil {
		note = indirectScaleNote
	}
	return joinNotes(note, a.binaryInEffect(parents))
}

// withDraws sets e's intervals from draws of the effect: the delta
// method's symmetric interval beside the draws' percentile interval at
// the claim's level, which is e's interval, and the one at 1 − α, by which
// its significance is judged. e keeps keptDraws evenly spaced quantiles of
// the draws, for the mixture over imputations (pooledIndirect).
func (a *Analysis) withDraws(e est, method string, iv *mediation.Interval, level float64) est {
	q := distuv.UnitNormal.Quantile(0.5 + level/2)
	e.intervals = []namedInterval{{method: IntervalDelta, lo: e.value - q*e.se, hi: e.value + q*e.se, level: level}}
	drawn := namedInterval{method: method, lo: iv.Lo, hi: iv.Hi, level: level, draws: len(iv.Draws),
		failed: iv.Failed}
	e.intervals = append(e.intervals, drawn)
	e.lo, e.hi = iv.Lo, iv.Hi
	judge := drawn
	if math.Abs(level-(1-a.Alpha)) > 1e-12 {
		judge.lo, judge.hi = mediation.Percentile(iv.Draws, a.Alpha/2), mediation.Percentile(iv.Draws, 1-a.Alpha/2)
		judge.level = 1 - a.Alpha
	}
	e.judge, e.draws = &judge, thinDraws(iv.Draws, keptDraws)
	return e
}

// keptDraws is how many quantiles of its draws an indirect estimate keeps.
const keptDraws = 1000

// thinDraws returns k evenly spaced order statistics of the sorted draws,
// the (i + ½)/k quantiles (all of them when there are at most k).
func thinDraws(sorted []float64, k int) []float64 {
	if len(sorted) <= k {
		return slices.Clone(sorted)
	}
	out := make([]float64, k)
	for i := range k {
		out[i] = sorted[int((float64(i)+0.5)*float64(len(sorted))/float64(k))]
	}
	return out
}

// claimPath is claim c as a mediation path.
func (a *Analysis) claimPath(c Claim) mediation.Path {
	s := a.Study
	p := mediation.Path{From: s.Index[c.From], To: s.Index[c.To]}
	for _, v := range c.Through {
		p.Through = append(p.Through, s.Index[v])
	}
	return p
}

// effectParents lists the parents pa gives each of n nodes, kept only for
// the nodes on a directed path from x to y (other than x): the equations
// an effect of x on y depends on. Every arc of such a path ends at one of
// them, so the effect is that of the whole graph, and an equation the
// effect does not use cannot keep it from being estimated.
func effectParents(pa parentsFunc, n, x, y int) [][]int {
	all := make([][]int, n)
	children := make([][]int, n)
	for v := range n {
		all[v] = pa(v)
		for _, u := range all[v] {
			children[u] = append(children[u], v)
		}
	}
	from, into := reach(children, x), reach(all, y)
	out := make([][]int, n)
	for v := range n {
		if v != x && from[v] && into[v] { // into[y] holds: reach marks its start
			out[v] = all[v]
		}
	}
	return out
}

// reach marks the nodes reachable from s along next (s itself included).
func reach(next [][]int, s int) []bool {
	seen := make([]bool, len(next))
	stack := []int{s}
	seen[s] = true
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, w := range next[v] {
			if !seen[w] {
				seen[w] = true
				stack = append(stack, w)
			}
		}
	}
	return seen
}

// binaryInEffect notes the binary variables whose equations the effect
// uses, which its linear model treats as continuous.
func (a *Analysis) binaryInEffect(parents [][]int) string {
	var names []string
	for v, pa := range parents {
		if len(pa) > 0 && a.Study.Package.Variables[v].Scale == ScaleBinary {
			names = append(names, a.Study.Names[v])
		}
	}
	if names == nil {
		return ""
	}
	return fmt.Sprintf(indirectBinaryNote, joinAnd(names))
}

// noPathWhy says why a graph gives an indirect-effect claim no effect.
func noPathWhy(c Claim, graph string) string {
	if len(c.Through) == 0 {
		return fmt.Sprintf("no directed path of two arrows or more from %s to %s in %s", c.From, c.To, graph)
	}
	return fmt.Sprintf("no directed path from %s to %s through %s in %s", c.From, c.To, joinAnd(c.Through), graph)
}

// throughText names the mediators of an indirect-effect claim in words.
func throughText(c Claim) string {
	if len(c.Through) == 0 {
		return "through its mediators"
	}
	return "through " + joinAnd(c.Through)
}

// isIndirect reports whether e is an indirect effect's estimate, judged
// by an interval rather than a p-value.
func (e est) isIndirect() bool { return e.judge != nil }

// judgedText says by which interval an indirect estimate is judged.
func (e est) judgedText() string {
	if e.judge == nil {
		return ""
	}
	return fmt.Sprintf("%g%% %s interval %s to %s", 100*e.judge.level, intervalName(e.judge.method),
		estText(e.judge.lo), estText(e.judge.hi))
}

// intervalName names an interval method in sentences.
func intervalName(method string) string {
	switch method {
	case IntervalDelta:
		return "delta-method"
	case IntervalMonteCarlo:
		return "Monte Carlo"
	case IntervalBootstrap:
		return "percentile bootstrap"
	case IntervalMixture:
		return "Monte Carlo (imputations mixed)"
	}
	return method
}

// Sentences of graph-declared about an indirect claim.
const (
	pathsFormat    = "%s: the declared graph carries the indirect effect of %s on %s %s, along %s: %s%s."
	maxListedPaths = 3
	maxPaths       = 1000 // paths counted, at most
)

// indirectAgainstGraph says which directed paths of the declared graph
// carry an indirect claim (the loader has refused a claim with none).
func indirectAgainstGraph(s *Study, c Claim) []Finding {
	through := map[int]bool{}
	for _, v := range c.Through {
		through[s.Index[v]] = true
	}
	paths := directedPaths(s.Declared.Children, s.Index[c.From], s.Index[c.To], maxPaths)
	var shown []string
	n := 0
	for _, p := range paths {
		if !carries(p, through) {
			continue
		}
		n++
		if len(shown) < maxListedPaths {
			names := make([]string, len(p))
			for k, v := range p {
				names[k] = s.Names[v]
			}
			shown = append(shown, strings.Join(names, " → "))
		}
	}
	more := ""
	if n > len(shown) {
		more = fmt.Sprintf(" and %d more", n-len(shown))
	}
	if len(paths) >= maxPaths {
		more += fmt.Sprintf(" (of the first %d paths counted)", maxPaths)
	}
	return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "indirect-paths", Message: fmt.Sprintf(pathsFormat,
		c.ID, c.From, c.To,
		throughText(c), count(n, "directed path", "directed paths"), strings.Join(shown, "; "), more)}}
}

// carries reports whether path p (from, …, to) is one an indirect effect
// sums: through every mediator, or for the total indirect effect, of two
// arrows or more.
func carries(p []int, through map[int]bool) bool {
	if len(through) == 0 {
		return len(p) > 2
	}
	seen := 0
	for _, v := range p[1 : len(p)-1] {
		if through[v] {
			seen++
		}
	}
	return seen == len(through)
}

// directedPaths lists the directed paths from x to y, at most limit.
func directedPaths(children func(int) []int, x, y, limit int) [][]int {
	var out [][]int
	var walk func(path []int)
	walk = func(path []int) {
		v := path[len(path)-1]
		if v == y {
			out = append(out, slices.Clone(path))
			return
		}
		for _, w := range children(v) {
			if len(out) >= limit {
				return
			}
			walk(append(path, w))
		}
	}
	walk([]int{x})
	return out
}
