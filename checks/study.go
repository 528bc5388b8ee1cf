package checks

import "github.com/pathvet/pathvet/checks/dag"

// DefaultAlpha is the significance level used unless one is configured.
const DefaultAlpha = 0.05

// DefaultSmallestEffect is the smallest effect of interest on the
// standardized scale when a package gives none (package-format.md).
const DefaultSmallestEffect = 0.1

// Study is a package that passed every check of the format (package load
// builds it), resolved for the pipeline: variables by index, graphs as DAGs, data as numbers.
type Study struct {
	Package *Package
	Names   []string
	Index   map[string]int
	// Declared is the declared graph over all variables (nil when none is
	// declared); InGraph marks the variables that some edge names.
	Declared *dag.PDAG
	InGraph  []bool
	// Alternatives are the stated alternative graphs, in package order.
	Alternatives []*dag.PDAG
	// Background are the arcs that background knowledge requires of the
	// declared graph's equivalents: out of every exogenous variable, every
	// fixed edge, and every adjacent pair across tiers, from the earlier
	// tier to the later one (dag.TierArcs).
	Background []dag.Edge
	// Tiers is graph.tiers by variable index, earliest first; nil when
	// none are given.
	Tiers dag.Tiers
	Data  *Dataset
	// SHA256 is the hash of the canonical package bytes, data included.
	SHA256 string
	// Printed holds each claim's numbers as the package document prints
	// them, for the rounding they carry.
	Printed []Printed
}

// SmallestEffect returns the package's smallest effect of interest, or
// the default.
func (s *Study) SmallestEffect() float64 {
	if p := s.Package.SmallestEffectOfInterest; p != nil {
		return *p
	}
	return DefaultSmallestEffect
}
