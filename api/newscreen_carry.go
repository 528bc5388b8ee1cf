package api

import (
	"fmt"
	"slices"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// A new version carries over from the earlier one what the form has no
// field for, matched by variable name and claim ID, and says what it
// carried. Left unchanged, the form gives the earlier package again.

// carryVariables keeps the earlier version's labels, scales,
// reliabilities and exogeneity of the variables the form kept, in the
// earlier order when the form has the same variables; with the earlier
// version's own rows, its variables and data section as they were.
func (b *built) carryVariables(e *earlierVersion) {
	if b.rows != nil && b.rowsEarlier && e.pkg.Data.Kind == checks.DataRows {
		b.pkg.Variables = slices.Clone(e.pkg.Variables)
		b.pkg.Data.MissingCodes, b.pkg.Data.IgnoreColumns = e.pkg.Data.MissingCodes, e.pkg.Data.IgnoreColumns
		b.carryWords("with the earlier version's rows, its variables, missing codes and ignored columns as it " +
			"declared them")
		return
	}
	old := map[string]checks.Variable{}
	for _, v := range e.pkg.Variables {
		old[v.Name] = v
	}
	n := noted{}
	for i := range b.pkg.Variables {
		if o, ok := old[b.pkg.Variables[i].Name]; ok {
			carryVariable(&b.pkg.Variables[i], o, n)
		}
	}
	b.reorder(e.pkg.Variables)
	b.carryWords(n.words(variableNotes)...)
}

// variableNotes word what was carried for variables: {key, for one, for
// many}.
var variableNotes = [][3]string{{"label", "the label of ", "the labels of "},
	{"scale", "the scale of ", "the scales of "}, {"reliability", "the reliability of ", "the reliabilities of "},
	{"exogenous", "that nothing causes ", "that nothing causes "}}

func carryVariable(v *checks.Variable, o checks.Variable, n noted) {
	if v.Label == "" && o.Label != "" {
		v.Label = o.Label
		n.add("label", v.Name)
	}
	if o.Scale != "" && o.Scale != v.Scale {
		v.Scale = o.Scale
		n.add("scale", v.Name)
	}
	if v.Reliability == nil && o.Reliability != nil {
		r := *o.Reliability
		v.Reliability = &r
		n.add("reliability", v.Name)
	}
	if o.Exogenous && !v.Exogenous {
		v.Exogenous = true
		n.add("exogenous", v.Name)
	}
}

// noted lists, by what was carried, the variables or claims it was
// carried for.
type noted map[string][]string

func (n noted) add(what, name string) { n[what] = append(n[what], name) }

// words are the notes in the order given, each naming its variables or
// claims.
func (n noted) words(order [][3]string) []string {
	var out []string
	for _, o := range order {
		if w := ofNames(o[1], o[2], n[o[0]]); w != "" {
			out = append(out, w)
		}
	}
	return out
}

// reorder puts the variables in the earlier version's order when they
// are the same variables.
func (b *built) reorder(old []checks.Variable) {
	at := map[string]int{}
	for i, v := range old {
		at[v.Name] = i
	}
	for _, v := range b.pkg.Variables {
		if _, ok := at[v.Name]; !ok || len(old) != len(b.pkg.Variables) {
			return
		}
	}
	slices.SortStableFunc(b.pkg.Variables, func(x, y checks.Variable) int { return at[x.Name] - at[y.Name] })
}

// carryRest keeps the parts of the earlier package the form has no field
// for: alternatives, the target trial, the smallest effect of interest,
// the graph's other parts, the missing-data details and the claims'
// other figures.
func (b *built) carryRest(e *earlierVersion) {
	old := e.pkg
	if len(old.Alternatives) > 0 {
		b.pkg.Alternatives = old.Alternatives
		var names []string
		for _, a := range old.Alternatives {
			names = append(names, a.Name)
		}
		b.carryWords(plural(len(names), "alternative graph", "alternative graphs") + ": " + andList(names))
	}
	if old.TargetTrial != nil {
		b.pkg.TargetTrial = old.TargetTrial
		b.carryWords("the target trial")
	}
	if x := old.SmallestEffectOfInterest; x != nil {
		b.pkg.SmallestEffectOfInterest = x
		b.carryWords(fmt.Sprintf("the smallest effect of interest, %g", *x))
	}
	b.carryGraph(old.Graph)
	b.carryMissing(old.MissingData)
	b.carryClaims(old.Claims)
}

func (b *built) carryGraph(old *checks.Graph) {
	g := b.pkg.Graph
	if old == nil || g == nil {
		return
	}
	if old.Justification != "" {
		g.Justification = old.Justification
		b.carryWords("the graph's justification")
	}
	if old.EquivalentsDiscussed {
		g.EquivalentsDiscussed = true
		b.carryWords("that the paper discusses the graphs that fit equally well")
	}
	b.carryFixed(old.FixedEdges)
}

// carryFixed keeps the arrows whose direction the paper fixes that are
// still in the graph.
func (b *built) carryFixed(fixed []checks.Edge) {
	g := b.pkg.Graph
	var dropped []string
	for _, f := range fixed {
		if slices.Contains(g.Edges, f) {
			g.FixedEdges = append(g.FixedEdges, f)
			continue
		}
		dropped = append(dropped, f.From+" → "+f.To)
	}
	if len(g.FixedEdges) > 0 {
		b.carryWords(plural(len(g.FixedEdges), "arrow", "arrows") + " whose direction the paper fixes")
	}
	if len(dropped) > 0 {
		b.carryWords("not carried: " + plural(len(dropped), "fixed arrow", "fixed arrows") +
			" no longer in the graph (" + andList(dropped) + ")")
	}
}

func (b *built) carryMissing(old *checks.MissingData) {
	m := b.pkg.MissingData
	if old == nil || m == nil || m.Method != old.Method {
		return
	}
	if old.Imputations > 0 {
		m.Imputations = old.Imputations
		b.carryWords(fmt.Sprintf("the number of imputations, %d", old.Imputations))
	}
	if old.Description != "" {
		m.Description = old.Description
		b.carryWords("the missing-data description")
	}
}

// carryClaims keeps, claim by claim ID, the figures the form has no field
// for.
func (b *built) carryClaims(old []checks.Claim) {
	by := map[string]checks.Claim{}
	for _, c := range old {
		by[c.ID] = c
	}
	n := noted{}
	for i := range b.pkg.Claims {
		if o, ok := by[b.pkg.Claims[i].ID]; ok {
			carryClaim(&b.pkg.Claims[i], o, n)
		}
	}
	b.carryWords(n.words(claimNotes)...)
}

// claimNotes word what was carried for claims.
var claimNotes = [][3]string{{"scale", "the estimate scale of ", "the estimate scales of "},
	{"se", "the standard error of ", "the standard errors of "},
	{"adjust", "the adjustment set of ", "the adjustment sets of "},
	{"level", "the interval level of ", "the interval levels of "},
	{"absence", "that the paper says there is no effect, for ", "that the paper says there is no effect, for "}}

func carryClaim(c *checks.Claim, o checks.Claim, n noted) {
	if c.EstimateScale == "" && o.EstimateScale != "" {
		c.EstimateScale = o.EstimateScale
		n.add("scale", c.ID)
	}
	if c.StdError == nil && o.StdError != nil {
		c.StdError = o.StdError
		n.add("se", c.ID)
	}
	if len(o.AdjustFor) > 0 && len(c.AdjustFor) == 0 {
		c.AdjustFor = o.AdjustFor
		n.add("adjust", c.ID)
	}
	if c.CILevel == nil && o.CILevel != nil && c.CI != nil {
		c.CILevel = o.CILevel
		n.add("level", c.ID)
	}
	if o.AssertsAbsence && !c.AssertsAbsence {
		c.AssertsAbsence = true
		n.add("absence", c.ID)
	}
	if o.PRelation == "=" && c.PRelation == "" && c.PValue != nil {
		c.PRelation = "=" // the default written out, as the earlier version did
	}
}

func (b *built) carryWords(words ...string) {
	for _, w := range words {
		if w != "" {
			b.carried = append(b.carried, w)
		}
	}
}

// ofNames words a list of names after its prefix (one or many), or "".
func ofNames(one, many string, names []string) string {
	switch len(names) {
	case 0:
		return ""
	case 1:
		return one + names[0]
	}
	return many + andList(names)
}

// andList joins words: "a", "a and b", "a, b and c".
func andList(s []string) string {
	if len(s) <= 1 {
		return strings.Join(s, "")
	}
	return strings.Join(s[:len(s)-1], ", ") + " and " + s[len(s)-1]
}

// plural is a count with its noun: "1 arrow", "2 arrows".
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}
