package review

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// The parts of a package a change is in, in the order a comparison tells
// them: what the paper claims, the graphs it declares, the data, and how
// it analyses them.
const (
	PartClaims = "claims"
	PartArrows = "arrows"
	PartData   = "data"
	PartMethod = "method"
)

// PackageChange is one thing the authors changed, in one sentence.
type PackageChange struct {
	Part, Text string
}

// DataFacts are what a comparison knows of a version's data besides the
// package: a digest of the raw rows as uploaded (or of the summary
// statistics) and how many rows (or n) they hold, −1 where not known.
type DataFacts struct {
	Digest string
	Rows   int
}

// PackageChanges lists what changed from the earlier package to the new
// one: claims, then arrows, then data, then method.
func PackageChanges(prev, cur *checks.Package, prevData, curData DataFacts) []PackageChange {
	var out []PackageChange
	add := func(part string, texts []string) {
		for _, t := range texts {
			out = append(out, PackageChange{Part: part, Text: t})
		}
	}
	add(PartClaims, claimChanges(prev.Claims, cur.Claims))
	add(PartArrows, arrowChanges(prev, cur))
	add(PartData, dataChanges(prev, cur, prevData, curData))
	add(PartMethod, methodChanges(prev, cur))
	return out
}

func claimChanges(prev, cur []checks.Claim) []string {
	var out []string
	before := map[string]checks.Claim{}
	for _, c := range prev {
		before[c.ID] = c
	}
	for _, c := range cur {
		old, ok := before[c.ID]
		if !ok {
			out = append(out, fmt.Sprintf("Claim %s “%s” is new.", c.ID, c.Text))
			continue
		}
		out = append(out, claimDiff(old, c)...)
	}
	for _, c := range prev {
		if !slices.ContainsFunc(cur, func(n checks.Claim) bool { return n.ID == c.ID }) {
			out = append(out, fmt.Sprintf("Claim %s “%s” is no longer made.", c.ID, c.Text))
		}
	}
	return out
}

func claimDiff(old, c checks.Claim) []string {
	var out []string
	if old.Text != c.Text {
		out = append(out, fmt.Sprintf("Claim %s is reworded: “%s” then, “%s” now.", c.ID, old.Text, c.Text))
	}
	if shape(old) != shape(c) {
		out = append(out, fmt.Sprintf("Claim %s now claims %s (then %s).", c.ID, shape(c), shape(old)))
	}
	if old.Headline != c.Headline {
		out = append(out, fmt.Sprintf("Claim %s is %s a headline claim.", c.ID,
			map[bool]string{true: "now", false: "no longer"}[c.Headline]))
	}
	if old.AssertsAbsence != c.AssertsAbsence {
		out = append(out, fmt.Sprintf("Claim %s %s that there is no effect.", c.ID,
			map[bool]string{true: "now says", false: "no longer says"}[c.AssertsAbsence]))
	}
	if f := figureChanges(old, c); len(f) > 0 {
		out = append(out, fmt.Sprintf("The reported figures of claim %s changed: %s.", c.ID, strings.Join(f, "; ")))
	}
	return out
}

// shape is what a claim claims, in words.
func shape(c checks.Claim) string {
	adj := ""
	if len(c.AdjustFor) > 0 {
		adj = ", adjusted for " + strings.Join(c.AdjustFor, ", ")
	}
	switch c.Kind {
	case checks.KindAssociation:
		return "an association of " + c.From + " with " + c.To + adj
	case checks.KindDirect:
		return "a direct effect of " + c.From + " on " + c.To + adj
	case checks.KindTotal:
		return "a total effect of " + c.From + " on " + c.To + adj
	}
	return "a claim of kind " + strings.ReplaceAll(c.Kind, "_", " ") + " of " + c.From + " on " + c.To + adj
}

func figureChanges(old, c checks.Claim) []string {
	var out []string
	pair := func(name, a, b string) {
		if a != b {
			out = append(out, fmt.Sprintf("%s %s then, %s now", name, a, b))
		}
	}
	pair("estimate", numText(old.Estimate)+scaleText(old), numText(c.Estimate)+scaleText(c))
	pair("standard error", numText(old.StdError), numText(c.StdError))
	pair("interval", ciText(old), ciText(c))
	pair("p-value", pText(old), pText(c))
	return out
}

func numText(x *float64) string {
	if x == nil {
		return "none"
	}
	return strconv.FormatFloat(*x, 'g', -1, 64)
}

func scaleText(c checks.Claim) string {
	if c.Estimate == nil || c.EstimateScale == "" {
		return ""
	}
	return " (" + strings.ReplaceAll(c.EstimateScale, "_", " ") + ")"
}

func ciText(c checks.Claim) string {
	if len(c.CI) != 2 {
		return "none"
	}
	lvl := ""
	if c.CILevel != nil {
		lvl = " at " + strconv.FormatFloat(100**c.CILevel, 'g', -1, 64) + "%"
	}
	return numText(&c.CI[0]) + " to " + numText(&c.CI[1]) + lvl
}

func pText(c checks.Claim) string {
	if c.PValue == nil {
		return "none"
	}
	rel := c.PRelation
	if rel == "" {
		rel = "="
	}
	return "p " + rel + " " + numText(c.PValue)
}
