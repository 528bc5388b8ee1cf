package checks

import (
	"context"
	"fmt"
	"math"
	"math/big"
	"strings"

	"github.com/pathvet/pathvet/checks/dag"
)

// MaxListedMembers is how many members of a class the report lists.
const MaxListedMembers = 50

// equivalence: which graphs fit the data exactly as well, and did the
// authors say so? (checks.md) This is its graph half: the CPDAG, both
// class sizes, and which claimed arrows the data cannot orient.
var equivalenceCheck = Check{
	ID:    "equivalence",
	Title: "Equivalent graphs",
	Run:   runEquivalence,
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
		r.plausible, r.countErr = dag.PlausibleSize(c, a.Study.Background)
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
		return CheckResult{Status: StatusNotApplicable, Summary: "No causal graph is declared, so there is no equivalence class to report."}, nil
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
	fs = append(fs, discussionFinding(s, eq)...)
	res := CheckResult{Status: statusOf(fs), Findings: fs, Metrics: equivalenceMetrics(eq, reversible)}
	res.Metrics["claims_unstable"] = unstable
	res.Summary = equivalenceSummary(s, eq, res.Status, unstable)
	return res, nil
}

// claimAcross re-estimates a causal claim over the plausible graphs and
// words the finding; structural is the graph-only finding, kept when the
// claim cannot be estimated.
func (a *Analysis) claimAcross(i int, c Claim, structural []Finding) (*AcrossEquivalents, []Finding) {
	decl := a.declaredEstimate(i)
	if !decl.ok() {
		return nil, structural
	}
	across, err := a.acrossEquivalents(c, decl)
	if err != nil {
		return nil, append(structural, Finding{Severity: StatusWarn, Claim: c.ID, Message: fmt.Sprintf(
			"%s could not be re-estimated across the equivalent graphs: %v.", c.ID, err)})
	}
	if !across.Unstable {
		if len(structural) > 0 && structural[0].Severity != SeverityInfo {
			return across, []Finding{{Severity: SeverityInfo, Claim: c.ID, Message: fmt.Sprintf(
				"The arrow %s → %s behind %s can point the other way in an equivalent graph, but the claim's conclusion is the same in every plausible one (%s under the declared graph).",
				c.From, c.To, c.ID, valueText(decl))}}
		}
		return across, structural
	}
	sev := StatusWarn
	if c.Headline && !a.Study.Package.Graph.EquivalentsDiscussed {
		sev = StatusFail
	}
	return across, []Finding{{Severity: sev, Claim: c.ID, Message: a.unstableText(c, decl, across),
		Details: map[string]any{"graphs": across.Graphs, "graphs_differing": across.Differing, "method": across.Method}}}
}

// unstableText says in one sentence how a claim depends on the choice
// among equivalent graphs.
func (a *Analysis) unstableText(c Claim, decl est, across *AcrossEquivalents) string {
	eq := a.equivalenceClass()
	ct := across.Contrast
	other := "zero"
	if ct.Estimate.Method != MethodZero && ct.Estimate.Estimate != nil {
		p := math.NaN()
		if ct.Estimate.PValue != nil {
			p = *ct.Estimate.PValue
		}
		other = fmt.Sprintf("%.2f (%s)", *ct.Estimate.Estimate, pText(p))
	}
	where := ""
	switch {
	case len(ct.ReversedArrows) > 0:
		parts := make([]string, 0, 3)
		for _, r := range ct.ReversedArrows[:min(3, len(ct.ReversedArrows))] {
			parts = append(parts, r[0]+" → "+r[1])
		}
		where = ", for instance if " + strings.Join(parts, " and ")
	case ct.ParentSet != nil:
		node := c.To
		if c.Kind == KindTotal {
			node = c.From
		}
		where = fmt.Sprintf(", for instance if the parents of %s are {%s}", node, strings.Join(ct.ParentSet, ", "))
	}
	scope := fmt.Sprintf("in %d of the %s plausible equivalent graphs", across.Differing, countText(eq.plausible))
	if across.Method == AcrossParentSets {
		scope = fmt.Sprintf("under %d of the %d locally valid parent sets (the class is too large to list)", across.Differing, across.Graphs)
	}
	return fmt.Sprintf("%s is %s under the declared graph but %s %s%s; the data fit those graphs exactly as well, so the data do not decide this claim, the choice of graph does.",
		c.ID, valueText(decl), other, scope, where)
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
	n, err := dag.PlausibleSize(eq.cpdag, append(append([]dag.Edge(nil), s.Background...), dag.Edge{From: to, To: from}))
	if err != nil {
		return []Finding{{Severity: StatusWarn, Claim: c.ID, Message: fmt.Sprintf(
			"%s: whether background knowledge fixes the direction of %s → %s could not be counted exactly (%v).", c.ID, c.From, c.To, err)}}, rev, nil
	}
	rev.PlausibleReversed, _ = exactCount(n)
	rev.InPlausible = n.Sign() > 0
	if !rev.InPlausible {
		return []Finding{{Severity: SeverityInfo, Claim: c.ID, Message: fmt.Sprintf(
			"The data alone cannot orient the arrow %s → %s behind %s; only the stated background knowledge (exogenous variables, fixed arrows) does.",
			c.From, c.To, c.ID)}}, rev, nil
	}
	sev := StatusWarn
	if c.Headline && !s.Package.Graph.EquivalentsDiscussed {
		sev = StatusFail
	}
	return []Finding{{Severity: sev, Claim: c.ID, Message: fmt.Sprintf(
		"The arrow %s → %s behind %s can point the other way: in %s of the %s plausible equivalent graphs it does, those graphs fit the data exactly as well, and in them the direct effect of %s on %s is zero.",
		c.From, c.To, c.ID, n, countText(eq.plausible), c.From, c.To)}}, rev, nil
}

// verb picks the singular or plural form for a count.
func verb(n *big.Int, one, many string) string {
	if n != nil && n.Cmp(big.NewInt(1)) == 0 {
		return one
	}
	return many
}

func countText(n *big.Int) string {
	if n == nil {
		return "(uncounted)"
	}
	return n.String()
}

func discussionFinding(s *Study, eq *equivalenceResult) []Finding {
	if eq.size.Cmp(big.NewInt(1)) <= 0 {
		return nil
	}
	if s.Package.Graph.EquivalentsDiscussed {
		return []Finding{{Severity: SeverityInfo, Message: fmt.Sprintf(
			"The authors say they discussed the graphs equivalent to theirs (%s in the whole class).", eq.size)}}
	}
	return []Finding{{Severity: StatusWarn, Message: fmt.Sprintf(
		"%s graphs fit any data exactly as well as the declared one (%s of them %s the stated background knowledge), and the authors do not discuss them.",
		eq.size, countText(eq.plausible), verb(eq.plausible, "respects", "respect"))}}
}

func equivalenceSummary(s *Study, eq *equivalenceResult, status string, unstable int) string {
	switch {
	case status == StatusFail && unstable > 0:
		return fmt.Sprintf("A headline claim changes sign or significance among the %s plausible graphs that fit the data exactly as well, and the paper does not discuss them; ask the authors to justify the arrows it rests on or to report it under every equivalent graph.", countText(eq.plausible))
	case status == StatusFail:
		return fmt.Sprintf("A headline claim rests on an arrow the data cannot orient, among %s plausible equivalent graphs the paper does not discuss; ask the authors to justify its direction or report the claim under every equivalent graph.", countText(eq.plausible))
	case unstable > 0:
		return fmt.Sprintf("%d claim(s) change sign or significance among the equivalent graphs; the paper should justify the arrows they rest on or show them under every equivalent graph.", unstable)
	case eq.size.Cmp(big.NewInt(1)) == 0:
		return "The declared graph is the only member of its equivalence class: the data could in principle tell it from every other graph on its skeleton."
	case status == StatusWarn:
		return fmt.Sprintf("The declared graph has %s equivalent graphs that fit equally well, which the paper does not discuss, though no claimed arrow depends on them.", eq.size)
	}
	if eq.plausible != nil && eq.plausible.Cmp(big.NewInt(1)) == 0 {
		return fmt.Sprintf("The declared graph has %s equivalent graphs, and the stated background knowledge rules out all but the declared one.", eq.size)
	}
	return fmt.Sprintf("The declared graph has %s equivalent graphs; no claim changes sign or significance among the %s plausible ones.", eq.size, countText(eq.plausible))
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
		m := eq.cpdag.Clone()
		for _, e := range s.Background {
			if m.HasLine(e.From, e.To) {
				m.Orient(e.From, e.To)
			}
		}
		m.CloseUnderMeek()
		mp := edgeSets(s, m)
		g.PlausibleCPDAG = &mp
	}
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
	ms, truncated, err := dag.Members(c, required, MaxListedMembers)
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
