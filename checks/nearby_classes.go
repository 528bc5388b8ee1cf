package checks

import (
	"context"
	"errors"
	"math/big"
	"slices"

	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/nearby"
)

// nearClass is one class near the declared graph, resolved for the report.
type nearClass struct {
	edits       []nearby.Edit
	delta       float64
	g, cpdag    *dag.PDAG
	key         string // cpdag.Key()
	bg          []dag.Edge
	size        *big.Int
	plausible   *big.Int // nil when it could not be counted
	alternative string
	claims      map[int]*AcrossEquivalents // by claim index; nil when not examined
	// unlisted are the claims (indices, in order) not re-estimated in an
	// examined class: the node they rest on has more than
	// dag.MaxParentSets locally valid parent sets there.
	unlisted []int
	// approximate: every way into the class changes the equation of a
	// binary variable, which the linear score treats as continuous.
	approximate bool
}

// nearbyInput is the declared graph as package nearby takes it.
func (a *Analysis) nearbyInput(m *Moments) (nearby.Model, [][]int, nearby.Knowledge) {
	s := a.Study
	parents := make([][]int, len(s.Names))
	k := nearby.Knowledge{Exogenous: make([]bool, len(s.Names))}
	for v := range parents {
		parents[v] = s.Declared.Parents(v)
		k.Exogenous[v] = s.Package.Variables[v].Exogenous && s.InGraph[v]
	}
	for _, e := range s.Package.Graph.FixedEdges {
		k.Fixed = append(k.Fixed, [2]int{s.Index[e.From], s.Index[e.To]})
	}
	if s.Tiers != nil {
		k.Tier, _ = s.Tiers.Index(len(s.Names)) // checked by the loader
	}
	return nearby.Model{S: m.Cor, N: m.N, In: s.InGraph}, parents, k
}

// resolveClass builds the class of the declared graph with edits made (or
// of the DAG given by parents): its DAG, CPDAG, background arcs, sizes,
// and the stated alternative in it.
func (a *Analysis) resolveClass(parents [][]int, edits []nearby.Edit, delta float64,
	alts map[string]string) *nearClass {
	s := a.Study
	var arcs []dag.Edge
	for v, ps := range parents {
		for _, u := range ps {
			arcs = append(arcs, dag.Edge{From: u, To: v})
		}
	}
	c := &nearClass{edits: edits, delta: delta, g: dag.FromArcs(len(s.Names), arcs)}
	c.cpdag = dag.CPDAG(c.g)
	c.size = dag.ClassSize(c.cpdag)
	for _, e := range s.Package.Graph.FixedEdges {
		c.bg = append(c.bg, dag.Edge{From: s.Index[e.From], To: s.Index[e.To]})
	}
	for v, in := range s.InGraph {
		if in && s.Package.Variables[v].Exogenous {
			c.bg = append(c.bg, dag.ExogenousArcs(c.g, v)...)
		}
	}
	if s.Tiers != nil {
		arcs, _ := dag.TierArcs(c.cpdag, s.Tiers) // checked by the loader
		c.bg = append(c.bg, arcs...)
	}
	if len(c.bg) == 0 { // no background knowledge: every member is plausible
		c.plausible = new(big.Int).Set(c.size)
	} else if n, err := dag.PlausibleSize(c.cpdag, c.bg); err == nil {
		c.plausible = n
	}
	c.key = c.cpdag.Key()
	c.alternative = alts[c.key]
	return c
}

// alternativeClasses maps the CPDAG key of each stated alternative over
// the declared graph's variables to its name.
func (a *Analysis) alternativeClasses() map[string]string {
	out := map[string]string{}
	for j, alt := range a.Study.Alternatives {
		if slices.Equal(graphNodes(alt), a.Study.InGraph) {
			if key := dag.CPDAG(alt).Key(); out[key] == "" {
				out[key] = a.Study.Package.Alternatives[j].Name
			}
		}
	}
	return out
}

// examine re-estimates every causal claim in the declared graph across
// the class's plausible members (all of them up to
// MaxMembersForEstimation, else IDA's locally valid parent sets), as the
// equivalence check does for the declared class.
func (a *Analysis) examine(ctx context.Context, c *nearClass) error {
	var members []alternativeGraph
	if c.plausible != nil && c.plausible.Cmp(bigInt(MaxMembersForEstimation)) <= 0 {
		ms, _, err := dag.Members(c.cpdag, c.bg, MaxMembersForEstimation)
		if err != nil {
			return err
		}
		for _, m := range ms {
			members = append(members, alternativeGraph{pa: m.Parents, reversed: reversedArcs(a.Study.Declared, m)})
		}
	}
	c.claims = map[int]*AcrossEquivalents{}
	for i, cl := range a.Study.Package.Claims {
		if !Causal(cl.Kind) || !a.claimInGraph(cl) || !a.declaredEstimate(i).ok() {
			continue
		}
		across, err := a.acrossClass(c, i, members)
		if errors.Is(err, dag.ErrTooManyParentSets) {
			c.unlisted = append(c.unlisted, i)
			continue
		}
		if err != nil {
			return err
		}
		c.claims[i] = across
		if err := ctx.Err(); err != nil {
			return err
		}
	}
	return nil
}

func (a *Analysis) acrossClass(c *nearClass, i int, members []alternativeGraph) (*AcrossEquivalents, error) {
	cl, decl := a.Study.Package.Claims[i], a.declaredEstimate(i)
	if members != nil {
		return a.summarizeAcross(cl, decl, members, AcrossMembers, a.memberEstimator(cl)), nil
	}
	if cl.Kind == KindIndirect {
		return notComputedAcross(c.plausible), nil
	}
	node := a.parentsNode(cl)
	graphs, err := a.localGraphsOf(c.cpdag, c.bg, node)
	if err != nil {
		return nil, err
	}
	return a.summarizeAcross(cl, decl, graphs, AcrossParentSets, a.setEstimator(cl, c.cpdag, node)), nil
}

// nearbyReport is the class as the report's graph section shows it.
func (a *Analysis) nearbyReport(c *nearClass) NearbyGraph {
	s := a.Study
	r := NearbyGraph{Edits: []GraphEdit{}, DeltaBIC: finite(c.delta), Evidence: nearby.Evidence(c.delta),
		Favours: favours(c.delta), Alternative: c.alternative}
	for _, e := range c.edits {
		r.Edits = append(r.Edits, GraphEdit{Op: string(e.Op), From: s.Names[e.From], To: s.Names[e.To]})
	}
	r.EquivalenceClassSize, _ = exactCount(c.size)
	if c.plausible != nil {
		r.PlausibleClassSize, _ = exactCount(c.plausible)
	}
	if c.claims != nil {
		r.Claims = map[string]NearbyClaim{}
		for i, ae := range c.claims {
			r.Claims[s.Package.Claims[i].ID] = NearbyClaim{Min: ae.Min, Max: ae.Max,
				ShareSignificantSameSign: ae.ShareSignificantSameSign, Graphs: ae.Estimates, Method: ae.Method,
				Changed: ae.Unstable, NotComputed: ae.NotComputed}
		}
	}
	for _, i := range c.unlisted {
		if r.ClaimsNotExamined == nil {
			r.ClaimsNotExamined = map[string]string{}
		}
		cl := s.Package.Claims[i]
		r.ClaimsNotExamined[cl.ID] = a.tooManySetsText(a.parentsNode(cl), "this class")
	}
	return r
}

func favours(delta float64) string {
	switch nearby.Evidence(delta) {
	case "indistinguishable":
		return "neither"
	case "":
		return ""
	}
	if delta < 0 {
		return "nearby"
	}
	return "declared"
}

// binaryEquation reports whether every one of the edits (each leading
// into the same class) changes the parents of a binary variable: then no
// member of the class is scored by equations that are all linear models of
// continuous outcomes, and its ΔBIC is only approximate.
func (a *Analysis) binaryEquation(edits []nearby.Edit) bool {
	binary := func(v int) bool { return a.Study.Package.Variables[v].Scale == ScaleBinary }
	for _, e := range edits {
		if !binary(e.To) && !(e.Op == nearby.Reverse && binary(e.From)) {
			return false
		}
	}
	return len(edits) > 0
}

// binaryChanged reports whether a binary variable's parents differ
// between the declared graph and the DAG given by parents.
func (a *Analysis) binaryChanged(parents [][]int) bool {
	for v, ps := range parents {
		if a.Study.Package.Variables[v].Scale == ScaleBinary && !slices.Equal(ps, a.Study.Declared.Parents(v)) {
			return true
		}
	}
	return false
}
