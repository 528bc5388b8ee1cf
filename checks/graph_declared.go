package checks

import (
	"context"
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks/dag"
)

// graph-declared: is a causal graph declared, acyclic, and does it cover
// the claims and the data? (README, "Checks")
var graphDeclaredCheck = Check{
	ID:    "graph-declared",
	Title: "Declared causal graph",
	Run:   runGraphDeclared,
	Summaries: map[string]string{
		StatusPass:          "A causal graph is declared, it is acyclic, it respects the stated background knowledge, and every claim's variables are in it.",
		StatusWarn:          "A causal graph is declared and acyclic, but it does not fully carry some claims; see the findings.",
		StatusFail:          "Causal claims are made without a declared graph, or are not arrows or paths of it; see the findings.",
		StatusNotApplicable: "No causal graph is declared, and none is needed: every claim is an association.",
	},
}

func runGraphDeclared(_ context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	if s.Declared == nil {
		return noGraph(s), nil
	}
	var fs []Finding
	for _, c := range s.Package.Claims {
		fs = append(fs, claimAgainstGraph(s, c)...)
	}
	var outside []string
	for i, name := range s.Names {
		if !s.InGraph[i] {
			outside = append(outside, name)
		}
	}
	if len(outside) > 0 {
		fs = append(fs, Finding{Severity: SeverityInfo, Topic: "outside-graph", Message: fmt.Sprintf(
			"Measured but not in the graph: %s. The graph says nothing about %s, and no check tests %s.",
			strings.Join(outside, ", "), them(len(outside)), them(len(outside)))})
	}
	if ign := ignoredColumns(s); len(ign) > 0 {
		fs = append(
			fs,
			Finding{
				Severity: SeverityInfo,
				Topic:    "skipped-columns",
				Message:  "Data columns skipped as the package asks: " + strings.Join(ign, ", ") + ".",
			},
		)
	}
	res := CheckResult{Status: statusOf(fs), Findings: fs, Metrics: graphMetrics(s, outside)}
	if res.Status == StatusFail {
		res.Summary = "A causal graph is declared, but some causal claims are not arrows or paths of it; see the findings."
	}
	return res, nil
}

func them(n int) string {
	if n == 1 {
		return "it"
	}
	return "them"
}

func ignoredColumns(s *Study) []string {
	if s.Data == nil {
		return nil
	}
	return s.Data.Ignored
}

func noGraph(s *Study) CheckResult {
	var fs []Finding
	for _, c := range s.Package.Claims {
		if Causal(c.Kind) {
			fs = append(fs, Finding{Severity: StatusFail, Claim: c.ID, Topic: "no-graph", Message: fmt.Sprintf(
				"%s is a causal claim (%s of %s on %s), but the package declares no causal graph, so nothing says which variables it was adjusted for or why.",
				c.ID,
				kindText(c.Kind),
				c.From,
				c.To,
			)})
		}
	}
	metrics := map[string]any{"graph_declared": false}
	if len(fs) == 0 {
		return CheckResult{Status: StatusNotApplicable, Metrics: metrics}
	}
	return CheckResult{Status: StatusFail, Findings: fs, Metrics: metrics,
		Summary: fmt.Sprintf(
			"The paper makes %s without declaring a causal graph; ask the authors for the graph their analysis assumes.",
			count(len(fs), "causal claim", "causal claims"),
		)}
}

func kindText(kind string) string {
	return strings.ReplaceAll(kind, "_", " ")
}

// claimAgainstGraph checks that the claim's variables are in the graph and
// that a direct effect is an arrow and a total effect a directed path.
func claimAgainstGraph(s *Study, c Claim) []Finding {
	var missing []string
	for _, v := range append(append([]string{c.From, c.To}, c.AdjustFor...), c.Through...) {
		if !s.InGraph[s.Index[v]] {
			missing = append(missing, v)
		}
	}
	sev := StatusWarn
	if Causal(c.Kind) {
		sev = StatusFail
	}
	if len(missing) > 0 {
		return []Finding{{Severity: sev, Claim: c.ID, Topic: "claim-outside-graph", Message: fmt.Sprintf(
			"%s names %s, which no arrow of the declared graph touches.", c.ID, strings.Join(missing, ", "))}}
	}
	from, to := s.Index[c.From], s.Index[c.To]
	switch c.Kind {
	case KindDirect:
		return directAgainstGraph(s.Declared, c, from, to)
	case KindIndirect:
		return indirectAgainstGraph(s, c)
	case KindTotal:
		if !dag.HasDirectedPath(s.Declared, from, to) {
			return []Finding{{Severity: StatusWarn, Claim: c.ID, Topic: "no-path", Message: fmt.Sprintf(
				"%s claims a total effect of %s on %s, but the declared graph has no directed path from %s to %s, "+
					"so by the graph itself that effect %s.",
				c.ID,
				c.From,
				c.To,
				c.From,
				c.To,
				isNoEffect(claimScale(c)),
			)}}
		}
	}
	return nil
}

// graphContradiction says why the declared graph itself gives a causal
// claim no effect (a direct effect that is no arrow of it, a total effect
// without a directed path), or "" when it does not. Such a claim fails
// graph-declared; the other checks do not weigh it as if it held.
func (a *Analysis) graphContradiction(c Claim) string {
	s := a.Study
	if !Causal(c.Kind) || !a.claimInGraph(c) {
		return ""
	}
	from, to := s.Index[c.From], s.Index[c.To]
	switch {
	case c.Kind == KindDirect && !s.Declared.HasArc(from, to):
		return directZeroWhy(c, s.Declared.Parents(from), to, "the declared graph")
	case c.Kind == KindTotal && !dag.HasDirectedPath(s.Declared, from, to):
		return fmt.Sprintf("no directed path from %s to %s in the declared graph", c.From, c.To)
	}
	return ""
}

func directAgainstGraph(g *dag.PDAG, c Claim, from, to int) []Finding {
	switch {
	case g.HasArc(from, to):
		return nil
	case g.HasArc(to, from):
		return []Finding{{Severity: StatusFail, Claim: c.ID, Topic: "arrow-reversed", Message: fmt.Sprintf(
			"%s claims a direct effect of %s on %s, but the declared graph has the arrow the other way, %s → %s.",
			c.ID, c.From, c.To, c.To, c.From)}}
	}
	return []Finding{{Severity: StatusFail, Claim: c.ID, Topic: "no-arrow", Message: fmt.Sprintf(
		"%s claims a direct effect of %s on %s, but the declared graph has no arrow %s → %s.",
		c.ID, c.From, c.To, c.From, c.To)}}
}

func graphMetrics(s *Study, outside []string) map[string]any {
	exo := 0
	for i, v := range s.Package.Variables {
		if v.Exogenous && s.InGraph[i] {
			exo++
		}
	}
	nodes := 0
	for _, in := range s.InGraph {
		if in {
			nodes++
		}
	}
	if outside == nil {
		outside = []string{}
	}
	return map[string]any{
		"graph_declared":         true,
		"acyclic":                true,
		"nodes":                  nodes,
		"edges":                  len(s.Declared.Arcs()),
		"exogenous_variables":    exo,
		"fixed_edges":            len(s.Package.Graph.FixedEdges),
		"variables_not_in_graph": outside,
	}
}
