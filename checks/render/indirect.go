package render

import (
	"fmt"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// writeIndirect lists the indirect-effect claims of the text report, one
// block each: the path, the estimate under the declared graph with every
// interval and the one that judges it, the mediator–outcome error
// correlation that would explain it away, and the proportion mediated.
func writeIndirect(b *strings.Builder, r *checks.Report) {
	var lines []string
	for _, c := range r.Claims {
		if c.Kind != checks.KindIndirect || c.Declared == nil {
			continue
		}
		lines = append(lines, indirectText(c))
	}
	if len(lines) == 0 {
		return
	}
	b.WriteString("\nIndirect effects under the declared graph:\n")
	for _, l := range lines {
		wrapHanging(b, "  ", "", l)
	}
}

// indirectText is one indirect claim in a sentence or two.
func indirectText(c checks.ClaimReport) string {
	e := c.Declared
	head := fmt.Sprintf("%s %s:", c.ID, claimArrow(c))
	if e.Error != "" {
		return head + " " + notAvailable + ": " + e.Error + "."
	}
	if e.Estimate == nil || e.Significance == nil {
		return head + " zero in the declared graph."
	}
	var parts []string
	for _, iv := range e.Intervals {
		if len(iv.CI) == 2 {
			parts = append(parts, intervalWords(iv.Method)+" "+interval(iv.CI))
		}
	}
	verdict := "includes zero"
	if x := e.Significance.ExcludesZero; x != nil && *x {
		verdict = "excludes zero"
	}
	out := fmt.Sprintf("%s %s (%s; %g%% intervals); judged by the %s interval, which %s.", head,
		Num(*e.Estimate, 2), strings.Join(parts, ", "), 100*e.Significance.Level,
		intervalWords(e.Significance.Method), verdict)
	if mc := c.MediatorConfounding; mc != nil && mc.RhoAtZero != nil {
		out += fmt.Sprintf(" An error correlation of %s between %s and %s would explain it away.",
			Num(*mc.RhoAtZero, 2), mc.Mediator, c.To)
	}
	if pm := c.ProportionMediated; pm != nil && pm.Proportion != nil {
		out += fmt.Sprintf(" Proportion mediated %s%% (unstable).", Num(100**pm.Proportion, 0))
	}
	return out
}
