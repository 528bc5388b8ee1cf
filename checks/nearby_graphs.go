package checks

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks/nearby"
)

// MaxNearbyListed bounds the classes within ΔBIC 2 that
// graph.nearby_graphs lists (best first); beside them it lists the
// maxBetterListed best classes that fit better by 2 or more, and at least
// minNearbyListed classes in all, however far. The claims are re-estimated
// in the listed classes within 2 and better by 2, not in those worse by 2.
const (
	MaxNearbyListed = 20
	maxBetterListed = 5
	minNearbyListed = 3
)

// listedClasses counts the classes within 2 and better by 2 or more, and
// returns the indices (best first) of those graph.nearby_graphs lists.
func listedClasses(cs []nearby.Class, run *nearbyRun) []int {
	var out []int
	near := 0
	for i, c := range cs {
		switch {
		case math.Abs(c.DeltaBIC) < weakBIC:
			run.near++
			if near < MaxNearbyListed {
				out, near = append(out, i), near+1
			}
		case c.DeltaBIC <= -weakBIC:
			if run.better++; run.better <= maxBetterListed {
				out = append(out, i)
			}
		case len(out) < minNearbyListed:
			out = append(out, i)
		}
	}
	return out
}

// clearlyBetterBIC is the ΔBIC below which the search's graph fits
// clearly better: "strong" evidence or more (Raftery 1995).
const clearlyBetterBIC = -6

// nearby-graphs: which graphs one edit from the declared one fit the data
// about as well, and what do they do to the claims?
var nearbyGraphsCheck = Check{
	ID:    "nearby-graphs",
	Title: "Graphs one edit away",
	Run:   runNearbyGraphs,
	Summaries: map[string]string{
		StatusPass: "No graph one edit from the declared one that fits the data about as well changes a claim's " +
			"sign or significance.",
		StatusWarn: "The graphs near the declared one need a look; see the findings.",
		StatusFail: "A headline claim changes sign or significance in a graph one edit from the declared one " +
			"that fits the data about as well; see the findings.",
		StatusNotApplicable: "There are no graphs near the declared one to weigh.",
	},
}

// nearbyRun is what the check found, for its findings and metrics.
type nearbyRun struct {
	nb           *nearby.Neighbourhood
	sr           *nearby.SearchResult
	listed       []*nearClass
	best         *nearClass
	near, better int // classes within 2, and better by 2 or more
	// examined, examinedBetter: the listed classes within 2, and better by
	// 2 or more, whose claims were re-estimated.
	examined, examinedBetter int
}

func runNearbyGraphs(ctx context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	if s.Declared == nil {
		return CheckResult{Status: StatusNotApplicable,
			Summary: "No causal graph is declared, so there are no graphs near it to weigh."}, nil
	}
	m, err := a.moments()
	if err != nil {
		return CheckResult{}, fmt.Errorf("the graphs near the declared one could not be scored: %w", a.dataError())
	}
	declFit, err := a.fitGraph(ctx, s.Declared, s.InGraph)
	if ctxErr := ctx.Err(); ctxErr != nil {
		return CheckResult{}, ctxErr
	}
	if err != nil {
		return CheckResult{}, fmt.Errorf("the graphs near the declared one could not be scored: "+
			"the declared graph could not be fitted to the data (%w)", err)
	}
	run, err := a.nearbyRun(ctx, m)
	if err != nil {
		return CheckResult{}, err
	}
	a.fillNearbyReport(run)
	fs := a.nearbyFindings(run)
	res := CheckResult{Status: statusOf(fs), Findings: fs, Metrics: nearbyMetrics(run, declFit.fit.BIC)}
	res.Summary = nearbySummary(res.Status, run, fs)
	return res, nil
}

// nearbyRun scores the neighbourhood and runs the search, then resolves
// and examines the classes the report shows.
func (a *Analysis) nearbyRun(ctx context.Context, m *Moments) (*nearbyRun, error) {
	model, parents, k := a.nearbyInput(m)
	nb, err := nearby.Neighbours(ctx, model, parents, k)
	if err != nil {
		return nil, err
	}
	sr, err := nearby.Search(ctx, model, parents, k)
	if err != nil {
		return nil, err
	}
	run := &nearbyRun{nb: nb, sr: sr}
	alts := a.alternativeClasses()
	for _, i := range listedClasses(nb.Classes, run) {
		c := nb.Classes[i]
		nc := a.resolveClass(nearby.Apply(parents, c.Edits[0]), c.Edits[:1], c.DeltaBIC, alts)
		nc.approximate = a.binaryEquation(c.Edits)
		if c.DeltaBIC < weakBIC { // within 2, or among the maxBetterListed better by 2 or more
			if err := a.examine(ctx, nc); err != nil {
				return nil, err
			}
			if c.DeltaBIC > -weakBIC {
				run.examined++
			} else {
				run.examinedBetter++
			}
		}
		run.listed = append(run.listed, nc)
	}
	if sr.Steps > 0 {
		run.best = a.resolveClass(sr.Parents, sr.Edits, sr.DeltaBIC, alts)
		run.best.approximate = a.binaryChanged(sr.Parents)
		if err := a.examine(ctx, run.best); err != nil {
			return nil, err
		}
	}
	return run, ctx.Err()
}

func (a *Analysis) fillNearbyReport(run *nearbyRun) {
	if a.Graph == nil {
		a.Graph = &GraphReport{} // this check's part; the pipeline merges it with equivalence's
	}
	for _, c := range run.listed {
		a.Graph.NearbyGraphs = append(a.Graph.NearbyGraphs, a.nearbyReport(c))
	}
	if run.best != nil {
		r := a.nearbyReport(run.best)
		a.Graph.SearchBest = &r
	}
}

func nearbyMetrics(run *nearbyRun, declaredBIC float64) map[string]any {
	m := map[string]any{
		"neighbours": run.nb.DAGs, "neighbours_equivalent_to_declared": run.nb.Equivalent,
		"classes": len(run.nb.Classes), "classes_within_2": run.near, "classes_better_by_2": run.better,
		"classes_listed": len(run.listed), "classes_examined": run.examined,
		"classes_better_examined": run.examinedBetter,
		"declared_bic":            num(declaredBIC), "search_steps": run.sr.Steps, "search_delta_bic": num(run.sr.DeltaBIC),
		"search_edits": len(run.sr.Edits), "search_stopped_at_step_limit": run.sr.Stopped,
		"score": "graph-fit's BIC = χ² + free parameters · ln N, by refitting only the equations whose parents change",
	}
	if len(run.nb.Classes) > 0 {
		m["best_delta_bic"] = num(run.nb.Classes[0].DeltaBIC)
	}
	if t := run.unlisted(); len(t.claims) > 0 {
		m["claims_not_examined"], m["classes_with_claims_not_examined"] = len(t.claims), t.classes
	}
	return m
}

// editsText names edits of the declared graph: "without the arrow a → b",
// "with an added arrow a → b", "with the arrow a → b reversed".
func (a *Analysis) editsText(edits []nearby.Edit) string {
	const shown = 4
	var parts []string
	for _, e := range edits[:min(shown, len(edits))] {
		from, to := a.Study.Names[e.From], a.Study.Names[e.To]
		parts = append(parts, map[nearby.Op]string{
			nearby.Add:     "with an added arrow " + from + " → " + to,
			nearby.Remove:  "without the arrow " + from + " → " + to,
			nearby.Reverse: "with the arrow " + from + " → " + to + " reversed",
		}[e.Op])
	}
	if len(edits) > shown {
		parts = append(parts, fmt.Sprintf("%d more edits", len(edits)-shown))
	}
	return strings.Join(parts, " and ")
}

// editsSubject names edits in a finding's key: "drop-a-b", "add-a-b",
// "reverse-a-b", sorted and joined by "+" (a class is the same class
// whichever order its edits were found in).
func (a *Analysis) editsSubject(edits []nearby.Edit) string {
	parts := make([]string, len(edits))
	for i, e := range edits {
		op := map[nearby.Op]string{nearby.Add: "add", nearby.Remove: "drop", nearby.Reverse: "reverse"}[e.Op]
		parts[i] = op + "-" + a.Study.Names[e.From] + "-" + a.Study.Names[e.To]
	}
	slices.Sort(parts)
	return strings.Join(parts, "+")
}

// deltaText gives ΔBIC with Raftery's band and the graph it favours.
func deltaText(d float64) string {
	band := strings.ReplaceAll(nearby.Evidence(d), "_", " ")
	switch favours(d) {
	case "neither":
		return fmt.Sprintf("ΔBIC = %s: the data do not tell the two apart", bicText(d))
	case "nearby":
		return fmt.Sprintf("ΔBIC = %s: %s evidence for the edited graph over the declared one", bicText(d), band)
	case "declared":
		return fmt.Sprintf("ΔBIC = %s: %s evidence for the declared graph over the edited one", bicText(d), band)
	}
	return "ΔBIC not available"
}

// bicText writes ΔBIC with two decimals, or more where two would round it
// across a band's edge (−1.996 is not "−2.00").
func bicText(d float64) string {
	for k := 2; ; k++ {
		t := strconv.FormatFloat(d, 'f', k, 64)
		if x, _ := strconv.ParseFloat(t, 64); nearby.Evidence(x) == nearby.Evidence(d) || k == 8 {
			if d >= 0 {
				t = "+" + t
			}
			return t
		}
	}
}
