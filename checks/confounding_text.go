package checks

import (
	"fmt"
	"strings"
)

// The confounding check's summary: which causal claims its E-values
// cover, and which have none and why.

// eValueGroups are the causal claims by what became of their E-values:
// computed (weak: those whose interval-limit E-value is below
// weakEValue), missing (none could be computed), contradicted (the
// declared graph gives the claim no effect) and absent (the claim asserts
// no effect, which nothing need explain away).
type eValueGroups struct {
	computed, weak, missing, contradicted, absent []string
	// rho and noRho are the indirect-effect claims with and without the
	// error correlation of mediator and outcome that would explain them
	// away (mediator_confounding.go).
	rho, noRho []string
}

// confoundingSummary says what the E-values show, in each case only what
// they show, naming the claims each part is about and why a causal claim
// has none.
func confoundingSummary(g eValueGroups) string {
	var parts []string
	if len(g.weak) > 0 {
		parts = append(parts, fmt.Sprintf("For %s, an unmeasured confounder associated with both cause and outcome "+
			"by a risk ratio under %.1f could move the interval to include no effect, and the design does not rule "+
			"one out", plural(len(g.weak), "the causal claim ", "the causal claims ")+joinAnd(g.weak), weakEValue))
	}
	if len(g.missing) > 0 {
		parts = append(parts, fmt.Sprintf("%s no E-value, so how much confounding would explain %s away is not known",
			plural(len(g.missing), joinAnd(g.missing)+" has", joinAnd(g.missing)+" have"), them(len(g.missing))))
	}
	if len(g.noRho) > 0 {
		parts = append(parts, fmt.Sprintf("%s no figure for confounding of %s mediator and outcome, so how much "+
			"such confounding would explain %s away is not known",
			plural(len(g.noRho), joinAnd(g.noRho)+" has", joinAnd(g.noRho)+" have"),
			plural(len(g.noRho), "its", "their"), them(len(g.noRho))))
	}
	switch {
	case len(parts) > 0:
		return strings.Join(parts, "; ") + "; see the findings." + g.rhoText() + g.contradictedText() + g.absentText()
	case len(g.computed) == 0:
		return strings.TrimPrefix(g.rhoText(), " ") + g.contradictedText() + g.absentText()
	}
	which := "each causal claim (" + joinAnd(g.computed) + ")"
	if len(g.computed) == 1 {
		which = "the causal claim " + g.computed[0]
	}
	if len(g.rho) > 0 {
		which = plural(len(g.computed), "the causal claim ", "the causal claims ") + joinAnd(g.computed)
	}
	return fmt.Sprintf("For %s, an unmeasured confounder would need a risk-ratio association of at least %.1f "+
		"with both cause and outcome to move the interval to include no effect; see the E-values.%s%s%s", which,
		weakEValue, g.rhoText(), g.contradictedText(), g.absentText())
}

// rhoText says which indirect-effect claims have the error correlation of
// mediator and outcome that would explain them away ("" when none).
func (g eValueGroups) rhoText() string {
	if len(g.rho) == 0 {
		return ""
	}
	return fmt.Sprintf(" For the indirect %s %s, the findings give the correlation of the mediator's and the "+
		"outcome's errors that would explain %s away; no threshold is set, since none is published.",
		plural(len(g.rho), "effect", "effects"), joinAnd(g.rho), plural(len(g.rho), "it", "each"))
}

// absentText says which causal claims have no E-value because they
// assert no effect ("" when none does).
func (g eValueGroups) absentText() string {
	if len(g.absent) == 0 {
		return ""
	}
	return fmt.Sprintf(" %s no effect, so there is nothing for confounding to explain away and %s no E-value.",
		plural(len(g.absent), g.absent[0]+" asserts", joinAnd(g.absent)+" assert"),
		plural(len(g.absent), "it has", "they have"))
}

// contradictedText says which causal claims have no E-value because the
// declared graph gives them no effect ("" when none).
func (g eValueGroups) contradictedText() string {
	if len(g.contradicted) == 0 {
		return ""
	}
	return fmt.Sprintf(" %s no E-value: the declared graph itself gives %s no effect (see graph-declared).",
		plural(len(g.contradicted), g.contradicted[0]+" has", joinAnd(g.contradicted)+" have"),
		them(len(g.contradicted)))
}
