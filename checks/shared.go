package checks

import "fmt"

// Results that several checks read are computed here, lazily and once per
// Analysis, never by one check for another: a check sees the same values
// whether it runs alone, first or last (Options.Checks).

// claimEValue is the E-value of one claim, or why there is none.
type claimEValue struct {
	ev *EValue
	// why there is no E-value; "" with ev nil means none is wanted (an
	// association, a claim of no effect).
	why string
	// contradicted: the declared graph itself gives the claim no effect.
	contradicted bool
}

// eValues returns every claim's E-value (confounding-sensitivity writes
// them into the report; causal-language weighs them), computed once.
func (a *Analysis) eValues() []claimEValue {
	if a.evs != nil {
		return a.evs
	}
	a.evs = make([]claimEValue, len(a.Study.Package.Claims))
	for i, c := range a.Study.Package.Claims {
		switch {
		case !Causal(c.Kind) || c.AssertsAbsence || c.Kind == KindIndirect:
			continue // nothing to explain away, or mediatorSensitivity's
		case a.graphContradiction(c) != "":
			a.evs[i] = claimEValue{contradicted: true, why: "the declared graph itself gives it no effect: " +
				a.graphContradiction(c)}
		default:
			ev, why := a.eValue(i, c)
			a.evs[i] = claimEValue{ev: ev, why: why}
		}
	}
	return a.evs
}

// declaredAcross is claim i re-estimated across the plausible members of
// the declared graph's class (nil for a claim that is not causal, not in
// the graph, or not estimable under it), computed once: equivalence
// reports it, nearby-graphs asks whether it is unstable.
func (a *Analysis) declaredAcross(i int) (*AcrossEquivalents, error) {
	n := len(a.Study.Package.Claims)
	if a.across == nil {
		a.across, a.acrossErr, a.acrossDone = make([]*AcrossEquivalents, n), make([]error, n), make([]bool, n)
	}
	if !a.acrossDone[i] {
		c, decl := a.Study.Package.Claims[i], a.declaredEstimate(i)
		if a.Study.Declared != nil && Causal(c.Kind) && a.claimInGraph(c) && decl.ok() {
			a.across[i], a.acrossErr[i] = a.acrossEquivalents(c, decl)
		}
		a.acrossDone[i] = true
	}
	return a.across[i], a.acrossErr[i]
}

// unstableAmongEquivalents: claim i changes sign or significance among
// the declared graph's own plausible equivalents.
func (a *Analysis) unstableAmongEquivalents(i int) bool {
	ae, err := a.declaredAcross(i)
	return err == nil && ae != nil && ae.Unstable
}

// directionCaution is the caution an E-value needs when the data cannot
// orient the claim: in some plausible equivalents, which fit exactly as
// well, the graph gives the claim no effect (declaredAcross, shared). ""
// when every estimate keeps an effect, or none could be made.
func (a *Analysis) directionCaution(i int, c Claim) string {
	ae, err := a.declaredAcross(i)
	if err != nil || ae == nil || ae.zero == 0 {
		return ""
	}
	in := fmt.Sprintf("%d of the %d plausible equivalent graphs, which fit exactly as well", ae.zero, ae.Estimates)
	if ae.Method == AcrossParentSets {
		in = fmt.Sprintf("%d of the %d locally valid parent sets of the equivalent graphs", ae.zero, ae.Estimates)
	}
	if c.Kind == KindIndirect {
		return fmt.Sprintf(" The figure assumes the declared directions of the paths from %s %s to %s, which the "+
			"data cannot settle: in %s, the indirect effect is zero.", c.From,
			throughText(c), c.To, in)
	}
	return fmt.Sprintf(" The E-value speaks to unmeasured confounding under the declared direction of %s on %s; "+
		"it says nothing of that direction, which the data cannot settle: in %s, the claimed effect of %s on "+
		"%s %s.", c.From, c.To, in, c.From, c.To, isNoEffect(claimScale(c)))
}
