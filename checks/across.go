package checks

import (
	"fmt"
	"math"
	"math/big"
	"slices"
	"strconv"

	"github.com/pathvet/pathvet/checks/dag"
)

// MaxMembersForEstimation is the largest plausible class whose members
// are all listed to re-estimate the claims; a larger class is covered by
// IDA's locally valid parent sets instead.
const MaxMembersForEstimation = 2000

// Methods of claims[].across_equivalents.
const (
	AcrossMembers    = "all_plausible_members"
	AcrossParentSets = "local_parent_sets"
)

// AcrossEquivalents is a causal claim's value over the plausible members
// of the declared graph's equivalence class.
type AcrossEquivalents struct {
	Min *float64 `json:"min"`
	Max *float64 `json:"max"`
	// Estimates counts what the claim was estimated in: plausible members
	// (all_plausible_members) or locally valid parent sets
	// (local_parent_sets), which are not graphs.
	Estimates int `json:"estimates"`
	// ShareSignificantSameSign is the share of those estimates in which
	// the claim is significant with the sign of its declared estimate.
	ShareSignificantSameSign *float64 `json:"share_significant_same_sign"`
	Method                   string   `json:"method"`
	// Unstable: the claim's sign or significance differs in some graph.
	Unstable  bool      `json:"unstable"`
	Differing int       `json:"estimates_differing"`
	Failed    int       `json:"estimates_failed,omitempty"`
	Contrast  *Contrast `json:"contrast,omitempty"`
	// NotComputed says why the claim was not re-estimated across the
	// class (an indirect effect in a class too large to list).
	NotComputed string `json:"not_computed,omitempty"`
	// zero counts the estimates in which the graph gives the claim no
	// effect (the arrow reversed, no path left).
	zero int
}

// Contrast is the graph in which the claim differs most from its declared
// value: the one nearest zero among those that differ.
type Contrast struct {
	Estimate *Estimate `json:"estimate"`
	// ReversedArrows are the declared arrows that point the other way in
	// that graph (all plausible members listed), or the parent set used
	// (local parent sets).
	ReversedArrows [][2]string `json:"reversed_arrows,omitempty"`
	ParentSet      []string    `json:"parent_set,omitempty"`
}

// alternativeGraph is one graph in which a claim was estimated.
type alternativeGraph struct {
	pa       parentsFunc
	reversed []dag.Edge // declared arrows reversed in it
	parents  []int      // the parent set, for local parent sets
}

// plausibleGraphs returns the graphs over which causal claims are
// re-estimated: every plausible member when there are at most
// MaxMembersForEstimation, else nil.
func (a *Analysis) plausibleGraphs() ([]alternativeGraph, error) {
	if a.plausible != nil || a.plausibleErr != nil {
		return a.plausible, a.plausibleErr
	}
	eq := a.equivalenceClass()
	if eq.plausible == nil || eq.plausible.Cmp(bigInt(MaxMembersForEstimation)) > 0 {
		return nil, nil
	}
	ms, _, err := dag.Members(eq.cpdag, a.Study.Background, MaxMembersForEstimation)
	if err != nil {
		a.plausibleErr = err
		return nil, err
	}
	for _, m := range ms {
		a.plausible = append(a.plausible, alternativeGraph{pa: m.Parents, reversed: reversedArcs(a.Study.Declared, m)})
	}
	return a.plausible, nil
}

func reversedArcs(declared, m *dag.PDAG) []dag.Edge {
	var out []dag.Edge
	for _, e := range declared.Arcs() {
		if m.HasArc(e.To, e.From) {
			out = append(out, e)
		}
	}
	return out
}

// parentsNode is the node whose parents a causal claim's estimate uses:
// the outcome of a direct effect, the cause of a total effect.
func (a *Analysis) parentsNode(c Claim) int {
	if c.Kind == KindTotal {
		return a.Study.Index[c.From]
	}
	return a.Study.Index[c.To]
}

// tooManySetsText says why a claim resting on node could not be
// re-estimated over IDA's parent sets in a class (dag.ErrTooManyParentSets).
func (a *Analysis) tooManySetsText(node int, class string) string {
	return fmt.Sprintf("%s has more than %s locally valid parent sets (IDA) in %s, too many to list",
		a.Study.Names[node], thousands(dag.MaxParentSets), class)
}

// localGraphs covers a large class by the locally valid parent sets of
// the node whose parents the claim's estimate uses (IDA, Maathuis, Kalisch
// & Bühlmann 2009). With background knowledge, a set is kept only when
// some plausible member gives the node exactly those parents: the
// background arcs plus the set's arcs into the node and the node's arcs to
// its other undirected neighbours must leave a positive count. Sets that
// cannot be counted exactly are kept if they agree with the background
// knowledge at the node.
func (a *Analysis) localGraphs(node int) ([]alternativeGraph, error) {
	return a.localGraphsOf(a.equivalenceClass().cpdag, a.Study.Background, node)
}

// localGraphsOf is localGraphs for the class of the CPDAG c under the
// background arcs bg.
func (a *Analysis) localGraphsOf(c *dag.PDAG, bg []dag.Edge, node int) ([]alternativeGraph, error) {
	sets, err := dag.LocalParentSets(c, node)
	if err != nil {
		return nil, err
	}
	var out []alternativeGraph
	for _, set := range sets {
		if len(bg) > 0 && !plausibleParents(c, bg, node, set) {
			continue
		}
		out = append(out, alternativeGraph{parents: set, pa: func(int) []int { return set }})
	}
	return out, nil
}

// plausibleParents reports whether some member of the class of c that
// respects bg gives node exactly the parents set.
func plausibleParents(c *dag.PDAG, bg []dag.Edge, node int, set []int) bool {
	if !respectsBackground(bg, node, set) {
		return false
	}
	req := append([]dag.Edge(nil), bg...)
	for _, v := range c.Siblings(node) {
		if slices.Contains(set, v) {
			req = append(req, dag.Edge{From: v, To: node})
		} else {
			req = append(req, dag.Edge{From: node, To: v})
		}
	}
	n, err := dag.PlausibleSize(c, req)
	return err != nil || n.Sign() > 0
}

func respectsBackground(bg []dag.Edge, node int, set []int) bool {
	for _, e := range bg {
		if (e.To == node && !slices.Contains(set, e.From)) || (e.From == node && slices.Contains(set, e.To)) {
			return false
		}
	}
	return true
}

// acrossEquivalents estimates a causal claim in every plausible graph.
func (a *Analysis) acrossEquivalents(c Claim, declared est) (*AcrossEquivalents, error) {
	graphs, err := a.plausibleGraphs()
	method := AcrossMembers
	if err != nil {
		return nil, err
	}
	if graphs == nil && c.Kind == KindIndirect {
		return notComputedAcross(a.equivalenceClass().plausible), nil
	}
	if graphs == nil {
		node := a.parentsNode(c)
		if graphs, err = a.localGraphs(node); err != nil {
			return nil, err
		}
		estimate := a.setEstimator(c, a.equivalenceClass().cpdag, node)
		return a.summarizeAcross(c, declared, graphs, AcrossParentSets, estimate), nil
	}
	return a.summarizeAcross(c, declared, graphs, method, a.memberEstimator(c)), nil
}

func (a *Analysis) summarizeAcross(c Claim, declared est, graphs []alternativeGraph, method string,
	estimate graphEstimator) *AcrossEquivalents {
	r := &AcrossEquivalents{Method: method}
	lo, hi, same := math.Inf(1), math.Inf(-1), 0
	want := declared.category(a.Alpha)
	sign := 1
	if declared.additive < 0 {
		sign = -1
	}
	var best *alternativeGraph
	var bestEst est
	for i := range graphs {
		e := estimate(graphs[i])
		if !e.ok() {
			r.Failed++
			continue
		}
		r.Estimates++
		v := e.value
		if e.method == MethodZero {
			v = zeroOnScale(e.scale)
			r.zero++
		}
		lo, hi = math.Min(lo, v), math.Max(hi, v)
		cat := e.category(a.Alpha)
		if cat == sign && cat != 0 {
			same++
		}
		if cat != want {
			r.Differing++
			if best == nil || math.Abs(e.additive) < math.Abs(bestEst.additive) ||
				e.method == MethodZero && bestEst.method != MethodZero {
				best, bestEst = &graphs[i], e
			}
		}
	}
	if r.Estimates > 0 {
		r.Min, r.Max = finite(lo), finite(hi)
		r.ShareSignificantSameSign = finite(float64(same) / float64(r.Estimates))
	}
	r.Unstable = r.Differing > 0
	if best != nil {
		r.Contrast = a.contrast(*best, bestEst)
	}
	return r
}

// notComputedFormat says why an indirect effect is not re-estimated in a
// class past the listing limit.
const notComputedFormat = "the class has %s plausible members, more than the %d in which claims are re-estimated " +
	"one by one, and an indirect effect needs whole graphs, which IDA's locally valid parent sets (the parents " +
	"of one variable) are not; it was not computed"

// notComputedAcross is an indirect claim's summary over a class too large
// to list.
func notComputedAcross(plausible *big.Int) *AcrossEquivalents {
	n := "more than " + fmt.Sprint(MaxMembersForEstimation)
	if plausible != nil {
		n = plausible.String()
	}
	return &AcrossEquivalents{Method: AcrossMembers,
		NotComputed: fmt.Sprintf(notComputedFormat, n, MaxMembersForEstimation)}
}

// zeroOnScale is the value of "no effect" on a scale: 1 for odds ratios.
func zeroOnScale(scale string) float64 {
	if scale == "odds_ratio" {
		return 1
	}
	return 0
}

func (a *Analysis) contrast(g alternativeGraph, e est) *Contrast {
	ct := &Contrast{Estimate: a.report(e)}
	for _, r := range g.reversed {
		ct.ReversedArrows = append(ct.ReversedArrows, [2]string{a.Study.Names[r.To], a.Study.Names[r.From]})
	}
	for _, v := range g.parents {
		ct.ParentSet = append(ct.ParentSet, a.Study.Names[v])
	}
	if g.parents != nil && ct.ParentSet == nil {
		ct.ParentSet = []string{}
	}
	return ct
}

// thousands writes a non-negative n with commas between groups of three
// digits: 4096 as "4,096".
func thousands(n int) string {
	s := strconv.Itoa(n)
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + "," + s[i:]
	}
	return s
}
