package load

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/mediation"
)

// Problems of tiers and of indirect-effect claims (package-format.md,
// "Graph and alternatives", "Claims").
const (
	tierTwice    = "%s is already in /graph/tiers/%d"
	tierEmpty    = "is an empty tier: list its variables, or drop it"
	tierBackward = "the arrow %s → %s points from tier %d (%s) back to tier %d (%s): tiers run earliest first, " +
		"so nothing in a later tier can cause anything in an earlier one"
	throughNotIndirect = "only an indirect_effect claim has mediators; this claim is a %s"
	throughEnd         = "%s is the claim's own from or to variable"
	throughTwice       = "%s is listed twice"
	noPathThrough      = "the declared graph has no directed path from %s to %s through %s"
	noIndirectPath     = "the declared graph has no directed path of two arrows or more from %s to %s, so %s " +
		"has no indirect effect on %s"
	indirectScale = "an indirect effect is a product of path coefficients: its scale is standardized or " +
		"unstandardized, not %s"
	maxTierNames = 3 // names quoted per tier in a problem
)

// resolveTiers checks graph.tiers (declared names, each in one tier, no
// empty tier) and returns them as node indices, nil when any is bad.
func (s *study) resolveTiers(ps *problems) dag.Tiers {
	g := s.Package.Graph
	if g == nil || len(g.Tiers) == 0 {
		return nil
	}
	tiers, in, bad := make(dag.Tiers, len(g.Tiers)), map[int]int{}, false
	for k, tier := range g.Tiers {
		if len(tier) == 0 {
			ps.at(pointer("graph", "tiers", k), tierEmpty)
			bad = true
		}
		for p, name := range tier {
			at := pointer("graph", "tiers", k, p)
			v, ok := s.Index[name]
			switch j, twice := in[v]; {
			case !ok:
				ps.unknown(at, name, s.Index)
				bad = true
			case twice:
				ps.at(at, tierTwice, quoted(name), j)
				bad = true
			default:
				in[v] = k
				tiers[k] = append(tiers[k], v)
			}
		}
	}
	if bad {
		return nil
	}
	return tiers
}

// checkTierOrder reports every arrow of edges (at base) that points from
// a later tier to an earlier one.
func (s *study) checkTierOrder(base string, edges []dag.Edge, tiers dag.Tiers, ps *problems) {
	if tiers == nil || edges == nil {
		return
	}
	of, err := tiers.Index(len(s.Names))
	if err != nil {
		return // reported by resolveTiers
	}
	for i, e := range edges {
		if a, b := of[e.From], of[e.To]; a != dag.NoTier && b != dag.NoTier && a > b {
			ps.at(base+pointer(i), tierBackward, s.Names[e.From], s.Names[e.To],
				a+1, s.tierText(tiers[a]), b+1, s.tierText(tiers[b]))
		}
	}
}

// tierText names a tier by its first few variables.
func (s *study) tierText(tier []int) string {
	var names []string
	for _, v := range tier[:min(len(tier), maxTierNames)] {
		names = append(names, s.Names[v])
	}
	if len(tier) > maxTierNames {
		names = append(names, fmt.Sprintf("and %d more", len(tier)-maxTierNames))
	}
	return strings.Join(names, ", ")
}

// checkThrough checks the mediators of claim c at at: only an indirect
// effect has them, each names a declared variable other than from and
// to, once; and an indirect effect is on a linear scale.
func checkThrough(at string, c checks.Claim, index map[string]int, ps *problems) {
	if len(c.Through) > 0 && c.Kind != checks.KindIndirect && c.Kind != "" {
		ps.at(at+"/through", throughNotIndirect, c.Kind)
		return
	}
	seen := map[string]bool{}
	for k, m := range c.Through {
		p := at + pointer("through", k)
		switch _, ok := index[m]; {
		case !ok:
			ps.unknown(p, m, index)
		case m == c.From || m == c.To:
			ps.at(p, throughEnd, quoted(m))
		case seen[m]:
			ps.at(p, throughTwice, quoted(m))
		}
		seen[m] = true
	}
	if c.Kind == checks.KindIndirect && c.EstimateScale != "" && c.EstimateScale != "standardized" &&
		c.EstimateScale != "unstandardized" {
		ps.at(at+"/estimate_scale", indirectScale, c.EstimateScale)
	}
}

// checkIndirectPaths reports each indirect-effect claim for which the
// declared graph has no directed path from from to to through every
// mediator (for through empty, no path of two arrows or more).
func (s *study) checkIndirectPaths(ps *problems) {
	if s.Declared == nil {
		return
	}
	parents := make([][]int, len(s.Names))
	for v := range parents {
		parents[v] = s.Declared.Parents(v)
	}
	for i, c := range s.Package.Claims {
		p, ok := s.path(c)
		if !ok || ps.covered(pointer("claims", i)) {
			continue
		}
		if has, err := mediation.HasPath(parents, p); err == nil && !has {
			ps.at(pointer("claims", i, "through"), "%s", s.noPathText(c))
		}
	}
}

// path is claim c as a mediation path, false when it is no indirect
// effect or names a variable that is not declared.
func (s *study) path(c checks.Claim) (mediation.Path, bool) {
	if c.Kind != checks.KindIndirect {
		return mediation.Path{}, false
	}
	from, okF := s.Index[c.From]
	to, okT := s.Index[c.To]
	p := mediation.Path{From: from, To: to}
	seen := map[int]bool{from: true, to: true}
	for _, m := range c.Through {
		v, ok := s.Index[m]
		if !ok || seen[v] {
			return p, false
		}
		seen[v] = true
		p.Through = append(p.Through, v)
	}
	return p, okF && okT && from != to
}

func (s *study) noPathText(c checks.Claim) string {
	if len(c.Through) == 0 {
		return fmt.Sprintf(noIndirectPath, c.From, c.To, c.From, c.To)
	}
	return fmt.Sprintf(noPathThrough, c.From, c.To, joinAnd(c.Through))
}

// joinAnd joins names as a list in words: "a", "a and b", "a, b and c".
func joinAnd(names []string) string {
	if len(names) < 2 {
		return strings.Join(names, "")
	}
	return strings.Join(names[:len(names)-1], ", ") + " and " + names[len(names)-1]
}
