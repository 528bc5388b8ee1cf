package checks

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
		case !Causal(c.Kind) || c.AssertsAbsence:
			continue // nothing to explain away
		case a.graphContradiction(c) != "":
			a.evs[i] = claimEValue{contradicted: true, why: "the declared graph itself gives it no effect: " +
				a.graphContradiction(c) + " (see graph-declared)"}
		default:
			ev, why := a.eValue(i, c)
			a.evs[i] = claimEValue{ev: ev, why: why}
		}
	}
	return a.evs
}
