package render

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// Cell is one cell of the claims table: lines of text, and a mark in
// words where the claim's sign or significance differs from its estimate
// under the declared graph.
type Cell struct {
	Lines []Line
}

// Line is one line of a cell.
type Line struct {
	Text string
	Mark string
}

// Marked reports whether any line of the cell is marked.
func (c Cell) Marked() bool {
	for _, l := range c.Lines {
		if l.Mark != "" {
			return true
		}
	}
	return false
}

// ClaimRow is one claim in the claims table.
type ClaimRow struct {
	ID, Text, Arrow, Kind string
	Headline              bool
	Reported, Declared    Cell
	Equivalents           Cell
	Alternatives          Cell
	MissingData           Cell
	EValue                Cell
}

// claimRows builds the claims table.
func claimRows(r *checks.Report) []ClaimRow {
	out := make([]ClaimRow, len(r.Claims))
	for i, c := range r.Claims {
		ref := fromEstimate(c.Declared)
		out[i] = ClaimRow{
			ID: c.ID, Text: c.Text, Arrow: claimArrow(c), Kind: Words(c.Kind), Headline: c.Headline,
			Reported:     reportedCell(c.Reported),
			Declared:     declaredCell(c.Declared),
			Equivalents:  equivalentsCell(c.AcrossEquivalents),
			Alternatives: alternativesCell(c, ref, r.SignificanceLevel),
			MissingData:  missingCell(c, ref, r.SignificanceLevel),
			EValue:       eValueCell(c),
		}
	}
	return out
}

// estimateLine is "estimate (interval), p".
func estimateLine(est *float64, ci []float64, p *float64, rel string) string {
	parts := []string{numPtr(est, 2)}
	if len(ci) == 2 {
		parts[0] += " (" + interval(ci) + ")"
	}
	if s := pText(p, rel); s != "" {
		parts = append(parts, s)
	}
	return strings.Join(parts, ", ")
}

func reportedCell(r checks.Reported) Cell {
	if r.Estimate == nil && r.PValue == nil {
		return Cell{Lines: []Line{{Text: "not reported"}}}
	}
	l := []Line{{Text: estimateLine(r.Estimate, r.CI, r.PValue, r.PRelation)}}
	if r.EstimateScale != "" {
		l = append(l, Line{Text: Words(r.EstimateScale)})
	}
	return Cell{Lines: l}
}

func declaredCell(e *checks.Estimate) Cell {
	if e == nil {
		return Cell{Lines: []Line{{Text: notAvailable}}}
	}
	if e.Error != "" {
		return Cell{Lines: []Line{{Text: notAvailable + ": " + e.Error}}}
	}
	l := []Line{{Text: estimateLine(e.Estimate, e.CI, e.PValue, "")}}
	if len(e.AdjustedFor) > 0 {
		l = append(l, Line{Text: "adjusted for " + strings.Join(e.AdjustedFor, ", ")})
	}
	return Cell{Lines: append(l, intervalLines(e)...)}
}

// claimArrow is a claim's path: "x → y", or for an indirect effect
// "x → m → y" (the mediators in the claim's order) or "x → … → y" for the
// total indirect effect.
func claimArrow(c checks.ClaimReport) string {
	switch {
	case c.Kind != checks.KindIndirect:
		return c.From + " → " + c.To
	case len(c.Through) == 0:
		return c.From + " → … → " + c.To
	}
	return c.From + " → " + strings.Join(c.Through, " → ") + " → " + c.To
}

// intervalLines say by which interval an indirect effect is judged, and
// list its other intervals.
func intervalLines(e *checks.Estimate) []Line {
	if e.Significance == nil {
		return nil
	}
	verdict := "includes zero"
	if x := e.Significance.ExcludesZero; x != nil && *x {
		verdict = "excludes zero"
	}
	l := []Line{{Text: fmt.Sprintf("judged by its %s interval, which %s", intervalWords(e.Significance.Method),
		verdict)}}
	for _, iv := range e.Intervals {
		if iv.Method != e.Significance.Method && len(iv.CI) == 2 {
			l = append(l, Line{Text: intervalWords(iv.Method) + ": " + interval(iv.CI)})
		}
	}
	return l
}

// intervalWords names an interval method in words.
func intervalWords(method string) string {
	switch method {
	case checks.IntervalDelta:
		return "delta-method"
	case checks.IntervalMonteCarlo:
		return "Monte Carlo"
	case checks.IntervalBootstrap:
		return "percentile bootstrap"
	case checks.IntervalMixture:
		return "Monte Carlo (imputations mixed)"
	}
	return Words(method)
}

func equivalentsCell(a *checks.AcrossEquivalents) Cell {
	if a == nil {
		return Cell{Lines: []Line{{Text: "not applicable"}}}
	}
	l := Line{Text: fmt.Sprintf("%s to %s over %s", numPtr(a.Min, 2), numPtr(a.Max, 2), acrossWhat(a))}
	if a.Unstable {
		l.Mark = fmt.Sprintf("sign or significance differs in %d of %d", a.Differing, a.Estimates)
	}
	return Cell{Lines: []Line{l}}
}

func alternativesCell(c checks.ClaimReport, ref point, alpha float64) Cell {
	var ls []Line
	for _, a := range c.UnderAlternatives {
		p := altPoint(a, ref)
		text := a.Name + ": " + estimateLine(a.Estimate, a.CI, a.PValue, "")
		switch {
		case a.Error != "":
			text = a.Name + ": " + notAvailable + " (" + a.Error + ")"
		case p.Zero && a.StructuralZero != "":
			text = a.Name + ": 0, because " + a.StructuralZero
		case p.Zero:
			text = a.Name + ": 0, no path for the effect in this graph"
		}
		ls = append(ls, Line{Text: text, Mark: altShift(ref, p, a, alpha)})
	}
	if len(ls) == 0 {
		ls = []Line{{Text: "none stated"}}
	}
	return Cell{Lines: ls}
}

func missingCell(c checks.ClaimReport, ref point, alpha float64) Cell {
	var ls []Line
	for _, m := range methodOrder(c.MissingData) {
		e := c.MissingData[m]
		p := fromEstimate(e)
		ls = append(ls, Line{Text: Words(m) + ": " + estimateLine(p.Est, p.CI, p.P, ""), Mark: shift(ref, p, alpha)})
	}
	if len(ls) == 0 {
		ls = []Line{{Text: "not applicable"}}
	}
	return Cell{Lines: ls}
}

func eValueCell(c checks.ClaimReport) Cell {
	e := c.EValue
	if mc := c.MediatorConfounding; mc != nil && mc.RhoAtZero != nil {
		return Cell{Lines: []Line{{Text: "no E-value for an indirect effect"},
			{Text: "mediator–outcome error correlation that would explain it away: " + numPtr(mc.RhoAtZero, 2)}}}
	}
	if c.Kind == checks.KindIndirect && c.Absence == nil { // a claim of no effect has nothing to explain away
		return Cell{Lines: []Line{{Text: "no E-value for an indirect effect"},
			{Text: "no mediator–outcome figure (see confounding-sensitivity)"}}}
	}
	if e == nil {
		return Cell{Lines: []Line{{Text: "not applicable"}}}
	}
	return Cell{Lines: []Line{
		{Text: numPtr(e.Estimate, 2) + "; interval limit " + numPtr(e.CILimit, 2)},
		{Text: "from the " + Words(e.Source) + " estimate"},
	}}
}
