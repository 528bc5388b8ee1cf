package review

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// methodChanges: the design, the handling of missing values, the target
// trial, the reliabilities and the smallest effect of interest.
func methodChanges(prev, cur *checks.Package) []string {
	var out []string
	if prev.Design != cur.Design {
		out = append(out, fmt.Sprintf("The design is now %s (then %s).", words(cur.Design), words(prev.Design)))
	}
	if a, b := missingText(prev.MissingData), missingText(cur.MissingData); a != b {
		out = append(out, fmt.Sprintf("Missing values: %s now, %s then.", b, a))
	}
	out = append(out, trialChanges(prev.TargetTrial, cur.TargetTrial)...)
	out = append(out, reliabilityChanges(prev, cur)...)
	if a, b := numText(prev.SmallestEffectOfInterest), numText(cur.SmallestEffectOfInterest); a != b {
		out = append(out, fmt.Sprintf("The smallest effect of interest is %s now, %s then.", orDefault(b),
			orDefault(a)))
	}
	return out
}

func words(token string) string { return strings.ReplaceAll(token, "_", " ") }

func orDefault(s string) string {
	if s == "none" {
		return "not set (the default 0.1)"
	}
	return s
}

// missingText says how a package handles missing values.
func missingText(m *checks.MissingData) string {
	switch {
	case m == nil:
		return "not stated"
	case m.Imputations > 0:
		return fmt.Sprintf("%s with %d imputations", words(m.Method), m.Imputations)
	}
	return words(m.Method)
}

func trialChanges(prev, cur *checks.TargetTrial) []string {
	switch {
	case prev == nil && cur == nil:
		return nil
	case prev == nil:
		return []string{"A target trial is now described."}
	case cur == nil:
		return []string{"The target trial is no longer described."}
	case *prev != *cur:
		return []string{"The description of the target trial changed."}
	}
	return nil
}

func reliabilityChanges(prev, cur *checks.Package) []string {
	was := map[string]*float64{}
	for _, v := range prev.Variables {
		was[v.Name] = v.Reliability
	}
	var out []string
	for _, v := range cur.Variables {
		old, ok := was[v.Name]
		if a, b := numText(old), numText(v.Reliability); ok && a != b {
			out = append(out, fmt.Sprintf("The reliability of %s is %s now, %s then.", v.Name, b, a))
		}
	}
	return out
}
