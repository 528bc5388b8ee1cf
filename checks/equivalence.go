package checks

import (
	"context"
	"errors"
	"fmt"
	"math/big"

	"github.com/pathvet/pathvet/checks/dag"
)

// MaxListedMembers is how many members of a class the report lists, and
// MaxListedArrows how many arrows those members may have in all: a class
// of large graphs lists fewer members (at least one), so that a report on
// a complete graph of 100 variables does not spell out 50 graphs of 4,950
// arrows twice over (30 MB of JSON, most of the time spent writing it).
const (
	MaxListedMembers = 50
	MaxListedArrows  = 10000
)

// equivalence: which graphs fit the data exactly as well, and did the
// authors say so? (README, "Checks") This is its graph half: the CPDAG, both
// class sizes, and which claimed arrows the data cannot orient.
var equivalenceCheck = Check{
	ID:    "equivalence",
	Title: "Equivalent graphs",
	Run:   runEquivalence,
	Summaries: map[string]string{
		StatusPass: "No claim changes sign or significance among the graphs that fit the data exactly as " +
			"well as the declared one.",
		StatusWarn: "Some claims or the equivalent graphs need attention; see the findings.",
		StatusFail: "A headline claim depends on a choice among equivalent graphs that the paper does not " +
			"discuss; see the findings.",
		StatusNotApplicable: "No causal graph is declared, so there is no equivalence class to report.",
	},
}

// equivalenceResult is the declared graph's class, shared by the checks.
type equivalenceResult struct {
	cpdag     *dag.PDAG
	size      *big.Int
	plausible *big.Int // nil when it could not be counted exactly
	countErr  error
}

// equivalenceClass computes the class of the declared graph once.
func (a *Analysis) equivalenceClass() *equivalenceResult {
	if a.equivalence == nil {
		c := dag.CPDAG(a.Study.Declared)
		r := &equivalenceResult{cpdag: c, size: dag.ClassSize(c)}
		r.plausible, r.countErr = new(big.Int).Set(r.size), nil // no background knowledge: all are plausible
		if len(a.Study.Background) > 0 {
			r.plausible, r.countErr = dag.PlausibleSize(c, a.Study.Background)
		}
		if r.countErr != nil {
			r.plausible = nil
		}
		a.equivalence = r
	}
	return a.equivalence
}

func runEquivalence(ctx context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	if s.Declared == nil {
		return CheckResult{Status: StatusNotApplicable}, nil
	}
	eq := a.equivalenceClass()
	graph, err := graphReport(s, eq)
	if err != nil {
		return CheckResult{}, err
	}
	a.Graph = graph
	if err := ctx.Err(); err != nil {
		return CheckResult{}, err
	}
	var fs []Finding
	reversible, unstable := 0, 0
	for i, c := range s.Package.Claims {
		f, rev, err := arrowFinding(s, eq, c)
		if err != nil {
			return CheckResult{}, err
		}
		if rev != nil {
			a.Claims[i].ArrowReversible = rev
			if rev.InPlausible {
				reversible++
			}
		}
		if !Causal(c.Kind) || !a.claimInGraph(c) {
			fs = append(fs, f...)
			continue
		}
		across, finding := a.claimAcross(i, c, f)
		a.Claims[i].AcrossEquivalents = across
		if across != nil && across.Unstable {
			unstable++
		}
		fs = append(fs, finding...)
		if err := ctx.Err(); err != nil {
			return CheckResult{}, err
		}
	}
	fs = append(fs, a.tierFinding(eq)...)
	fs = append(fs, discussionFinding(s, eq)...)
	res := CheckResult{Status: statusOf(fs), Findings: fs, Metrics: equivalenceMetrics(eq, reversible)}
	res.Metrics["claims_unstable"] = unstable
	res.Summary = equivalenceSummary(s, eq, res.Status,
		equivalenceTally{unstable: unstable, reversible: reversible, claimWarnings: claimWarnings(fs)})
	return res, nil
}

// claimAcross re-estimates a causal claim over the plausible graphs and
// words the finding; structural is the graph-only finding, kept when the
// claim cannot be estimated.
func (a *Analysis) claimAcross(i int, c Claim, structural []Finding) (*AcrossEquivalents, []Finding) {
	decl := a.declaredEstimate(i)
	if !decl.ok() {
		return nil, append(structural, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "not-estimated",
			Message: fmt.Sprintf("%s could not be estimated under the declared graph (%v), so it could not be "+
				"re-estimated across the "+
				"equivalent graphs either.", c.ID, decl.err)})
	}
	across, err := a.declaredAcross(i)
	if errors.Is(err, dag.ErrTooManyParentSets) {
		return nil, append(structural, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "across-equivalents",
			ask: "across-unestimated", Message: fmt.Sprintf(
				"%s could not be re-estimated across the equivalent graphs: %s, so whether its conclusion holds in "+
					"them is not known.", c.ID, a.tooManySetsText(a.parentsNode(c), "the declared graph's class"))})
	}
	if err != nil {
		return nil, append(structural, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "across-equivalents",
			ask: "across-unestimated",
			Message: fmt.Sprintf("%s could not be re-estimated across the equivalent graphs: "+
				"%v.", c.ID, err)})
	}
	if across.NotComputed != "" {
		return across, append(structural, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "across-equivalents",
			ask: "across-indirect-unlisted", Message: fmt.Sprintf(
				"%s could not be re-estimated across the equivalent graphs: %s.", c.ID, across.NotComputed)})
	}
	if across.Failed > 0 && !across.Unstable {
		return across, append(structural, Finding{Severity: StatusWarn, Claim: c.ID, Topic: "across-equivalents",
			ask: "across-unestimated", Message: fmt.Sprintf("%s could not be estimated in %d of the %s it was "+
				"tried in, so whether its conclusion holds in all of "+
				"them is not known.",
				c.ID, across.Failed, acrossNoun(across.Method, across.Failed+across.Estimates))})
	}
	if !across.Unstable {
		if len(structural) > 0 && structural[0].Severity != SeverityInfo {
			return across, []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "arrow-direction",
				Message: fmt.Sprintf(
					"The arrow %s → %s behind %s can point the other way in an equivalent graph, but the claim's "+
						"conclusion is the same in every plausible one (%s under the declared graph).",
					c.From, c.To, c.ID, valueText(decl))}}
		}
		return across, structural
	}
	sev := StatusWarn
	if c.Headline && !a.Study.Package.Graph.EquivalentsDiscussed {
		sev = StatusFail
	}
	return across, []Finding{{Severity: sev, Claim: c.ID, Topic: "across-equivalents",
		Message: a.unstableText(c, decl, across),
		Details: map[string]any{"estimates": across.Estimates, "estimates_differing": across.Differing,
			"method": across.Method}}}
}

// acrossNoun counts what claims were estimated in: plausible graphs, or
// locally valid parent sets.
func acrossNoun(method string, n int) string {
	if method == AcrossParentSets {
		return count(n, "locally valid parent set", "locally valid parent sets")
	}
	return count(n, "plausible graph", "plausible graphs")
}

// claimWarnings counts the claims with a warning or failure.
func claimWarnings(fs []Finding) int {
	seen := map[string]bool{}
	for _, f := range fs {
		if f.Claim != "" && (f.Severity == StatusWarn || f.Severity == StatusFail) {
			seen[f.Claim] = true
		}
	}
	return len(seen)
}

func equivalenceMetrics(eq *equivalenceResult, reversible int) map[string]any {
	m := map[string]any{
		"reversible_edges":  len(eq.cpdag.Lines()),
		"claims_reversible": reversible,
	}
	m["equivalence_class_size"], m["equivalence_class_size_log10"] = countMetric(eq.size)
	m["plausible_class_size"], m["plausible_class_size_log10"] = countMetric(eq.plausible)
	if eq.countErr != nil {
		m["plausible_class_size_error"] = eq.countErr.Error()
	}
	return m
}

func countMetric(n *big.Int) (any, any) {
	if n == nil {
		return nil, nil
	}
	v, l := exactCount(n)
	if l == nil {
		return v, nil
	}
	return v, *l
}

// arrowFinding says whether the arrow of a direct-effect claim can point
// the other way in a member of the class, and in a plausible member.
func arrowFinding(s *Study, eq *equivalenceResult, c Claim) ([]Finding, *Reversibility, error) {
	from, to := s.Index[c.From], s.Index[c.To]
	if c.Kind != KindDirect || !s.Declared.HasArc(from, to) {
		return nil, nil, nil
	}
	rev := &Reversibility{InClass: eq.cpdag.HasLine(from, to), PlausibleReversed: int64(0)}
	if !rev.InClass {
		return nil, rev, nil
	}
	n, err := dag.PlausibleSize(
		eq.cpdag,
		append(append([]dag.Edge(nil), s.Background...), dag.Edge{From: to, To: from}),
	)
	if err != nil {
		return []Finding{{Severity: StatusWarn, Claim: c.ID, Topic: "arrow-direction", Message: fmt.Sprintf(
			"%s: whether background knowledge fixes the direction of %s → %s could not be counted exactly "+
				"(%v).", c.ID, c.From, c.To, err)}}, rev, nil
	}
	rev.PlausibleReversed, _ = exactCount(n)
	rev.InPlausible = n.Sign() > 0
	if !rev.InPlausible {
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Topic: "arrow-direction", Message: fmt.Sprintf(
			"The data alone cannot orient the arrow %s → %s behind %s; only the stated background knowledge "+
				"(%s) does.",
			c.From, c.To, c.ID, knowledgeKinds(s))}}, rev, nil
	}
	sev := StatusWarn
	if c.Headline && !s.Package.Graph.EquivalentsDiscussed {
		sev = StatusFail
	}
	return []Finding{{Severity: sev, Claim: c.ID, Topic: "arrow-direction", Message: fmt.Sprintf(
		"The arrow %s → %s behind %s can point the other way: in %s of the %s plausible members of the declared "+
			"graph's class it does, those graphs fit the data exactly as well, and in them the direct effect of %s "+
			"on %s %s.",
		c.From, c.To, c.ID, n, countText(eq.plausible), c.From, c.To, isNoEffect(claimScale(c)))}}, rev, nil
}

// graphReport fills the report's graph section: the CPDAG, both class
// sizes and the first members of each.
func graphReport(s *Study, eq *equivalenceResult) (*GraphReport, error) {
	g := &GraphReport{Acyclic: true}
	for i, in := range s.InGraph {
		if in {
			g.Nodes = append(g.Nodes, s.Names[i])
		}
	}
	g.Declared = namedArcs(s, s.Declared.Arcs())
	g.Background, g.Exogenous = backgroundNames(s)
	g.CPDAG = edgeSets(s, eq.cpdag)
	if eq.plausible != nil && eq.plausible.Sign() > 0 {
		if m, ok, err := dag.MaximallyOriented(eq.cpdag, s.Background); err == nil && ok {
			mp := edgeSets(s, m)
			g.PlausibleCPDAG = &mp
		}
	}
	g.Tiers = tierNames(s)
	g.EquivalenceClassSize, g.EquivalenceClassSizeLog10 = exactCount(eq.size)
	if eq.plausible != nil {
		g.PlausibleClassSize, g.PlausibleClassSizeLog10 = exactCount(eq.plausible)
	}
	var err error
	g.EquivalentDAGs, g.EquivalentDAGsTruncated, err = listMembers(s, eq.cpdag, nil)
	if err != nil {
		return nil, err
	}
	if eq.plausible != nil {
		g.PlausibleDAGs, g.PlausibleDAGsTruncated, err = listMembers(s, eq.cpdag, s.Background)
	}
	return g, err
}

func edgeSets(s *Study, g *dag.PDAG) EdgeSets {
	es := EdgeSets{Directed: namedArcs(s, g.Arcs()), Undirected: [][2]string{}}
	for _, l := range g.Lines() {
		es.Undirected = append(es.Undirected, [2]string{s.Names[l[0]], s.Names[l[1]]})
	}
	return es
}

// backgroundNames returns the background arcs and the exogenous variables
// of the declared graph by name.
func backgroundNames(s *Study) ([][2]string, []string) {
	var exo []string
	for i, v := range s.Package.Variables {
		if v.Exogenous && s.InGraph[i] {
			exo = append(exo, v.Name)
		}
	}
	return namedArcs(s, s.Background), exo
}

func listMembers(s *Study, c *dag.PDAG, required []dag.Edge) ([][][2]string, bool, error) {
	arrows := len(c.Arcs()) + len(c.Lines()) // every member has them all, oriented
	ms, truncated, err := dag.Members(c, required, min(MaxListedMembers, max(1, MaxListedArrows/max(arrows, 1))))
	out := make([][][2]string, len(ms))
	for i, m := range ms {
		out[i] = namedArcs(s, m.Arcs())
	}
	return out, truncated, err
}

func namedArcs(s *Study, arcs []dag.Edge) [][2]string {
	out := make([][2]string, len(arcs))
	for i, e := range arcs {
		out[i] = [2]string{s.Names[e.From], s.Names[e.To]}
	}
	return out
}
