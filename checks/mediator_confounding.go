package checks

import (
	"fmt"
	"slices"

	"github.com/pathvet/pathvet/checks/mediation"
)

// The sensitivity of a single-mediator indirect effect to a common cause
// of the mediator and the outcome (confounding-sensitivity): the error
// correlation at which the effect vanishes, in the linear model of Imai,
// Keele & Yamamoto (2010, Statistical Science 25(1); Imai, Keele & Tingley
// 2010, Psychological Methods 15(4)), mediation.MediatorConfounding.

// MediatorConfounding is the correlation between the mediator's and the
// outcome's error terms at which a single-mediator indirect effect would
// vanish, with the covariates of both equations.
type MediatorConfounding struct {
	RhoAtZero  *float64 `json:"rho_at_zero"`
	Mediator   string   `json:"mediator"`
	Covariates []string `json:"covariates"`
	Model      string   `json:"model"`
}

// mediatorModel names the model the error correlation is computed in.
const mediatorModel = "linear structural equations with the exposure and the covariates in the mediator's and " +
	"the outcome's equations (Imai, Keele & Yamamoto 2010)"

// Sentences about the mediator–outcome confounding.
const (
	rhoFormat = "%s: an unmeasured common cause of %s and %s that correlated their errors by %s would explain the " +
		"indirect effect away (the error correlation at which it is zero, in the linear model of Imai, Keele & " +
		"Yamamoto 2010 with %s in both equations). No threshold is set, since none is published; the figure " +
		"speaks to confounding of the mediator and the outcome, not of %s with either."
	noRhoFormat = "%s has no figure for confounding of its mediator and outcome: %s."
)

// mediatorSensitivity is claim i's mediator–outcome confounding, or why
// it has none; computed once (confounding-sensitivity reports it,
// causal-language weighs it).
func (a *Analysis) mediatorSensitivity(i int) (*MediatorConfounding, string) {
	if a.rhos == nil {
		a.rhos, a.rhoWhy = make([]*MediatorConfounding, len(a.Study.Package.Claims)),
			make([]string, len(a.Study.Package.Claims))
		for k, c := range a.Study.Package.Claims {
			if c.Kind == KindIndirect {
				a.rhos[k], a.rhoWhy[k] = a.computeRho(c)
			}
		}
	}
	return a.rhos[i], a.rhoWhy[i]
}

func (a *Analysis) computeRho(c Claim) (*MediatorConfounding, string) {
	s := a.Study
	switch {
	case len(c.Through) != 1:
		return nil, "the closed form is for a claim through one mediator"
	case s.Declared == nil || !a.claimInGraph(c):
		return nil, "the claim's variables are in no declared graph"
	}
	t, m, y := s.Index[c.From], s.Index[c.Through[0]], s.Index[c.To]
	for _, v := range []int{m, y} {
		if s.Package.Variables[v].Scale == ScaleBinary {
			return nil, fmt.Sprintf("%s is binary, and the closed form is for a continuous mediator and outcome",
				s.Names[v])
		}
	}
	cov, other := a.mediatorCovariates(t, m, y)
	if len(other) > 0 {
		return nil, fmt.Sprintf("the equations of %s and %s hold %s, which %s affects, so the single-mediator model "+
			"does not apply", c.Through[0], c.To, joinAnd(a.names(other)), c.From)
	}
	mo, err := a.moments()
	if err != nil {
		return nil, a.dataError().Error()
	}
	r, err := mediation.MediatorConfounding(mo.Cor, t, m, y, cov)
	if err != nil {
		return nil, "it could not be computed (" + err.Error() + ")"
	}
	return &MediatorConfounding{RhoAtZero: finite(r.RhoAtZero), Mediator: c.Through[0],
		Covariates: append([]string{}, a.names(cov)...), Model: mediatorModel}, ""
}

// mediatorCovariates are the parents of m and y in the declared graph
// other than t, m and y: the covariates of both equations; other are
// those that t affects, which the model's pre-exposure covariates cannot
// be.
func (a *Analysis) mediatorCovariates(t, m, y int) (cov, other []int) {
	g := a.Study.Declared
	affected := reach(childLists(g.Children, len(a.Study.Names)), t)
	for _, v := range append(g.Parents(m), g.Parents(y)...) {
		if v == t || v == m || v == y || slices.Contains(cov, v) || slices.Contains(other, v) {
			continue
		}
		if affected[v] {
			other = append(other, v)
			continue
		}
		cov = append(cov, v)
	}
	slices.Sort(cov)
	slices.Sort(other)
	return cov, other
}

func childLists(children func(int) []int, n int) [][]int {
	out := make([][]int, n)
	for v := range out {
		out[v] = children(v)
	}
	return out
}

// mediatorFinding words claim i's mediator–outcome sensitivity.
func (a *Analysis) mediatorFinding(i int, c Claim) (Finding, bool) {
	mc, why := a.mediatorSensitivity(i)
	if mc == nil || mc.RhoAtZero == nil {
		if why == "" {
			why = "the error correlation is not a finite number"
		}
		return Finding{Severity: StatusWarn, Claim: c.ID, Topic: "mediator-confounding", ask: "mediator-confounding-missing",
			Message: fmt.Sprintf(noRhoFormat, c.ID, why)}, false
	}
	a.Claims[i].MediatorConfounding = mc
	given := joinAnd(append([]string{c.From}, mc.Covariates...))
	msg := fmt.Sprintf(rhoFormat, c.ID, mc.Mediator, c.To, estText(*mc.RhoAtZero), given, c.From)
	return Finding{Severity: SeverityInfo, Claim: c.ID, Topic: "mediator-confounding",
		Message: msg + a.directionCaution(i, c)}, true
}
