package latent

import (
	"fmt"

	"github.com/pathvet/pathvet/checks/dag"
)

// Spec is a model over nodes 0..Nodes()−1: node v < Observed is observed
// variable v (row and column v of the sample matrix), node Observed + j is
// latent construct j. Every indicator loads on exactly one latent; the
// latents and the observed variables that are no latent's indicators are
// the structural nodes, among which Parents declares a DAG.
type Spec struct {
	// Observed is p, the order of the sample covariance matrix.
	Observed int
	// Indicators[j] lists the observed variables that measure latent j; the
	// first is its marker, whose loading is fixed at 1.
	Indicators [][]int
	// Parents[v] are the structural parents of node v (node indices). It
	// may be shorter than Nodes(); a missing entry means no parents.
	// Indicators take no part: they neither have nor are parents.
	Parents [][]int
	// ResidualCovariances are pairs of indicators whose residuals covary.
	ResidualCovariances [][2]int
	// IndependentSources fixes the covariances of the structural nodes
	// without parents at zero, so that the structural part is exactly the
	// DAG model (Markov-equivalent DAGs then imply the same covariance).
	// By default they are free, the usual convention (a correlated-factor
	// measurement model has no arrows between its latents).
	IndependentSources bool
}

// Nodes is p + k.
func (s Spec) Nodes() int { return s.Observed + len(s.Indicators) }

// Latent returns the node of latent j.
func (s Spec) Latent(j int) int { return s.Observed + j }

// parentsOf returns the declared parents of node v.
func (s Spec) parentsOf(v int) []int {
	if v < len(s.Parents) {
		return s.Parents[v]
	}
	return nil
}

// SpecError names the field of a Spec that is wrong.
type SpecError struct {
	Field string // "Indicators", "Parents" or "ResidualCovariances"
	Index int    // the entry of Field (a latent, a node or a pair)
	Msg   string
}

func (e *SpecError) Error() string {
	return fmt.Sprintf("latent: %s[%d]: %s", e.Field, e.Index, e.Msg)
}

const msgCrossLoading = "variable %d already measures latent %d (cross-loadings are not supported)"

// roles tells what each node is.
type roles struct {
	latentOf   []int  // latentOf[v] is the latent that v measures, −1 when none
	structural []bool // latents and observed non-indicators
}

// validate checks s and returns the nodes' roles.
func (s Spec) validate() (*roles, error) {
	if s.Observed < 1 || len(s.Indicators) < 1 {
		return nil, &SpecError{"Indicators", 0, "a model needs observed variables and at least one latent"}
	}
	r, err := s.indicatorRoles()
	if err != nil {
		return nil, err
	}
	if err := s.checkParents(r); err != nil {
		return nil, err
	}
	return r, s.checkResidualCovariances(r)
}

func (s Spec) indicatorRoles() (*roles, error) {
	m := s.Nodes()
	r := &roles{latentOf: make([]int, m), structural: make([]bool, m)}
	for v := range r.latentOf {
		r.latentOf[v] = -1
		r.structural[v] = v >= s.Observed
	}
	for j, items := range s.Indicators {
		if len(items) == 0 {
			return nil, &SpecError{"Indicators", j, "a latent needs at least one indicator"}
		}
		for _, v := range items {
			switch {
			case v < 0 || v >= s.Observed:
				return nil, &SpecError{"Indicators", j, fmt.Sprintf("indicator %d is not an observed variable", v)}
			case r.latentOf[v] >= 0:
				return nil, &SpecError{"Indicators", j, fmt.Sprintf(msgCrossLoading, v, r.latentOf[v])}
			}
			r.latentOf[v] = j
		}
	}
	for v := range s.Observed {
		r.structural[v] = r.latentOf[v] < 0
	}
	return r, nil
}

func (s Spec) checkParents(r *roles) error {
	m := s.Nodes()
	if len(s.Parents) > m {
		return &SpecError{"Parents", m, "more entries than nodes"}
	}
	var arcs []dag.Edge
	seen := map[dag.Edge]bool{}
	for v, pa := range s.Parents {
		for _, u := range pa {
			e := dag.Edge{From: u, To: v}
			switch {
			case u < 0 || u >= m || u == v:
				return &SpecError{"Parents", v, fmt.Sprintf("parent %d is not another node", u)}
			case !r.structural[v] || !r.structural[u]:
				return &SpecError{"Parents", v, fmt.Sprintf("the arrow %d → %d touches an indicator", u, v)}
			case seen[e] || seen[dag.Edge{From: v, To: u}]:
				return &SpecError{"Parents", v, fmt.Sprintf("the pair %d, %d is joined twice", u, v)}
			}
			seen[e] = true
			arcs = append(arcs, e)
		}
	}
	if _, ok := dag.TopoOrder(dag.FromArcs(m, arcs)); !ok {
		return &SpecError{"Parents", 0, "the structural arrows have a cycle"}
	}
	return nil
}

func (s Spec) checkResidualCovariances(r *roles) error {
	seen := map[[2]int]bool{}
	for i, pr := range s.ResidualCovariances {
		a, b := min(pr[0], pr[1]), max(pr[0], pr[1])
		switch {
		case a == b || a < 0 || b >= s.Observed:
			return &SpecError{"ResidualCovariances", i, "not a pair of two observed variables"}
		case r.latentOf[a] < 0 || r.latentOf[b] < 0:
			return &SpecError{"ResidualCovariances", i, "residual covariances join indicators only"}
		case seen[[2]int{a, b}]:
			return &SpecError{"ResidualCovariances", i, "the pair is listed twice"}
		}
		seen[[2]int{a, b}] = true
	}
	return nil
}
