package render

import (
	"fmt"

	"github.com/pathvet/pathvet/checks"
)

// point is one estimate of a claim: a value, its interval and p-value.
type point struct {
	Est *float64
	CI  []float64
	P   *float64
	// Zero: the graph has no path for the effect, so it is no effect by
	// construction and its p-value means nothing.
	Zero bool
	// Null is the value of no effect on the estimate's scale: 1 for an
	// odds ratio, else 0.
	Null float64
	// Sig is set for an estimate judged by an interval rather than a
	// p-value (an indirect effect): whether that interval excludes zero.
	Sig *bool
}

// significant says whether p is significant at alpha, by its interval or
// its p-value; ok is false when it has neither.
func (p point) significant(alpha float64) (sig, ok bool) {
	switch {
	case p.Sig != nil:
		return *p.Sig, true
	case p.P != nil:
		return *p.P < alpha, true
	}
	return false, false
}

// excludesZero is the verdict of an estimate's judging interval, nil
// without one.
func excludesZero(s *checks.NamedInterval) *bool {
	if s == nil {
		return nil
	}
	return s.ExcludesZero
}

// acrossWhat says what a claim was estimated over across the equivalents:
// plausible graphs, or locally valid adjustment sets (which are not graphs).
func acrossWhat(a *checks.AcrossEquivalents) string {
	if a.Method == "local_parent_sets" {
		return plural(a.Estimates, "adjustment set", "adjustment sets")
	}
	return plural(a.Estimates, "plausible graph", "plausible graphs")
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// altPoint is a claim's estimate under an alternative, on the scale of
// the declared estimate ref.
func altPoint(a checks.AlternativeEstimate, ref point) point {
	return point{Est: a.Estimate, CI: a.CI, P: a.PValue, Zero: a.StructuralZero != "" || a.Method == checks.MethodZero,
		Null: ref.Null, Sig: excludesZero(a.Significance)}
}

func fromEstimate(e *checks.Estimate) point {
	if e == nil {
		return point{}
	}
	p := point{Est: e.Estimate, CI: e.CI, P: e.PValue, Zero: e.StructuralZero != "" || e.Method == checks.MethodZero,
		Sig: excludesZero(e.Significance)}
	if e.Scale == "odds_ratio" {
		p.Null = 1
	}
	return p
}

// shift says, in words, how p differs from the reference ref: its sign
// on its scale (below or above an odds ratio of 1), no effect (as when a
// graph has no path: "zero here", "no effect here" for an odds ratio), or
// whether it is significant at alpha. It is empty when neither differs or
// either is missing.
func shift(ref, p point, alpha float64) string {
	if ref.Est == nil || p.Est == nil {
		return ""
	}
	switch sr, sp := sign(*ref.Est-ref.Null), sign(*p.Est-p.Null); {
	case sr != 0 && sp == 0 && p.Null == 1:
		return "no effect here"
	case sr != 0 && sp == 0:
		return "zero here"
	case sr*sp < 0:
		return "sign flips"
	}
	rs, okr := ref.significant(alpha)
	ps, okp := p.significant(alpha)
	if !okr || !okp {
		return ""
	}
	switch {
	case rs && !ps:
		return "significance lost"
	case !rs && ps:
		return "becomes significant"
	}
	return ""
}

func sign(x float64) int {
	switch {
	case x > 0:
		return 1
	case x < 0:
		return -1
	}
	return 0
}

// methodOrder lists the missing-data methods as the page shows them:
// complete cases, maximum likelihood and multiple imputation first, then
// the rest by name.
func methodOrder(m map[string]*checks.Estimate) []string {
	first := []string{checks.MissingCompleteCases, checks.MissingMaximumLikelihood, checks.MissingMultipleImputation}
	var out []string
	for _, k := range first {
		if _, ok := m[k]; ok {
			out = append(out, k)
		}
	}
	var rest []string
	for k := range m {
		if k != first[0] && k != first[1] && k != first[2] {
			rest = append(rest, k)
		}
	}
	sortStrings(rest)
	return append(out, rest...)
}
