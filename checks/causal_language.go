package checks

import (
	"context"
	"fmt"
	"regexp"
	"slices"
	"strings"
)

// causalWords are the words that state causation in a claim's text (the
// project's list; each matched as a whole word, in any case).
var causalWords = []string{
	"cause", "causes", "caused", "causing", "causal", "causally",
	"effect of", "effects of", "affect", "affects", "affected", "affecting",
	"impact", "impacts", "influence", "influences", "influenced",
	"leads to", "lead to", "led to", "results in", "resulted in", "due to", "because",
	"increase", "increases", "increased", "decrease", "decreases", "decreased",
	"reduce", "reduces", "reduced", "raise", "raises", "raised", "lower", "lowers", "lowered",
	"improve", "improves", "improved", "boost", "boosts", "drive", "drives", "driven",
	"promote", "promotes", "prevent", "prevents", "produce", "produces", "why",
}

var causalRE = regexp.MustCompile(`(?i)\b(` + strings.Join(causalWords, "|") + `)\b`)

// mediationWords state mediation, which is causal: that an effect runs
// through a mediator. They are read in indirect-effect and association
// claims only (a direct effect's text may name the path it is part of).
var mediationWords = []string{
	"through", "via", "mediate", "mediates", "mediated", "mediating", "mediation", "mediator", "mediators",
	"explain", "explains", "explained", "explaining",
}

var mediationRE = regexp.MustCompile(`(?i)\b(` + strings.Join(mediationWords, "|") + `)\b`)

// causal-language: do causal words in claims match the design, and is the
// emulated trial described? (README, "Checks")
var causalLanguageCheck = Check{
	ID:    "causal-language",
	Title: "Causal language and the target trial",
	Run:   runCausalLanguage,
	Summaries: map[string]string{
		StatusPass:          "Causal wording is backed by what the package supplies; see the findings.",
		StatusWarn:          "Causal wording from a non-randomized design is not fully backed by what the package supplies; see the findings.",
		StatusFail:          "A claim is worded causally without the support a non-randomized design needs; see the findings.",
		StatusNotApplicable: "No claim is causal or worded causally.",
	},
}

func runCausalLanguage(_ context.Context, a *Analysis) (CheckResult, error) {
	s := a.Study
	randomized := s.Package.Design == "randomized"
	var fs []Finding
	worded := 0
	for _, c := range s.Package.Claims {
		words := claimWording(c)
		if len(words) == 0 {
			continue
		}
		worded++
		if randomized {
			continue
		}
		fs = append(fs, a.wordingFinding(c, words))
	}
	causal := worded > 0 || hasCausalClaim(s.Package)
	if !randomized && causal {
		fs = append(fs, targetTrialFinding(s.Package.TargetTrial)...)
	}
	res := CheckResult{
		Findings: fs,
		Metrics:  map[string]any{"claims_with_causal_wording": worded, "design": s.Package.Design},
	}
	switch {
	case randomized:
		res.Status, res.Summary = StatusPass, "The design is randomized, so causal wording about the randomized comparison is supported by design."
		if worded == 0 {
			res.Status, res.Summary = StatusNotApplicable, "The design is randomized and no claim uses causal wording."
		}
	case !causal:
		res.Status = StatusNotApplicable
	default:
		res.Status = statusOf(fs)
		res.Summary = languageSummary(res.Status, worded)
	}
	return res, nil
}

func languageSummary(status string, worded int) string {
	switch {
	case worded == 0 && status == StatusPass:
		return "No claim is worded causally, and the target trial behind the causal claims is described in all five parts."
	case worded == 0:
		return "No claim is worded causally, but the target trial behind the causal claims is not fully described; see the findings."
	case status == StatusPass:
		return "Causal wording is backed by a declared graph, a discussion of equivalent graphs, E-values where a claim needs them, and a described target trial."
	}
	return "" // the declared summary
}

func hasCausalClaim(p *Package) bool {
	for _, c := range p.Claims {
		if Causal(c.Kind) {
			return true
		}
	}
	return false
}

// claimWording lists the causal words of a claim's text, and for an
// indirect effect or an association its mediation words too.
func claimWording(c Claim) []string {
	words := uniqueMatches(causalRE, c.Text)
	if c.Kind == KindIndirect || c.Kind == KindAssociation {
		for _, w := range uniqueMatches(mediationRE, c.Text) {
			if !slices.Contains(words, w) {
				words = append(words, w)
			}
		}
	}
	return words
}

func uniqueMatches(re *regexp.Regexp, text string) []string {
	seen := map[string]bool{}
	var out []string
	for _, w := range re.FindAllString(text, -1) {
		w = strings.ToLower(w)
		if !seen[w] {
			seen[w] = true
			out = append(out, w)
		}
	}
	return out
}

// wordingFinding weighs a causally worded claim against what the package
// supplies: a graph, equivalents discussed, an E-value of some strength.
func (a *Analysis) wordingFinding(c Claim, words []string) Finding {
	quoted := `"` + strings.Join(words, `", "`) + `"`
	if c.Kind == KindAssociation {
		return Finding{Severity: headlineSeverity(c), Claim: c.ID, Topic: "wording", ask: "wording-association",
			Message: fmt.Sprintf("%s is declared an association but worded causally (%s); from a non-randomized design, say \"is associated with\" or declare it as a causal claim with its graph.",
				c.ID,
				quoted,
			)}
	}
	var lacks []string
	if a.Study.Declared == nil {
		lacks = append(lacks, "a declared graph")
	} else if !a.Study.Package.Graph.EquivalentsDiscussed {
		lacks = append(lacks, "a discussion of the equivalent graphs")
	}
	if ce := a.claimEValue(c); ce.ev == nil && ce.why != "" && !ce.contradicted {
		lacks = append(lacks, "figures from which an E-value can be computed (an estimate with its SE or interval)")
	}
	if i := a.claimIndex(c); c.Kind == KindIndirect && !c.AssertsAbsence {
		if mc, _ := a.mediatorSensitivity(i); mc == nil || mc.RhoAtZero == nil {
			lacks = append(lacks, "a figure for how much confounding of its mediator and outcome would explain it "+
				"away")
		}
	}
	if len(lacks) == 0 {
		return Finding{Severity: SeverityInfo, Claim: c.ID, Topic: "wording", Message: fmt.Sprintf(
			"%s is worded causally (%s) and backed by a declared graph, a discussion of equivalent graphs%s.",
			c.ID,
			quoted,
			a.eValueBacking(c),
		)}
	}
	sev := StatusWarn
	if a.Study.Declared == nil {
		sev = headlineSeverity(c)
	}
	return Finding{Severity: sev, Claim: c.ID, Topic: "wording", Message: fmt.Sprintf(
		"%s is worded causally (%s) from a non-randomized design without %s.",
		c.ID,
		quoted,
		strings.Join(lacks, " or "),
	)}
}

// eValueBacking names the E-value among a claim's backing, where it has
// one.
func (a *Analysis) eValueBacking(c Claim) string {
	if a.claimEValue(c).ev != nil {
		return " and E-values"
	}
	if mc, _ := a.mediatorSensitivity(a.claimIndex(c)); c.Kind == KindIndirect && mc != nil && mc.RhoAtZero != nil {
		return " and the error correlation of mediator and outcome that would explain it away"
	}
	return ""
}

// claimIndex is the position of claim c in the package.
func (a *Analysis) claimIndex(c Claim) int {
	for i, cc := range a.Study.Package.Claims {
		if cc.ID == c.ID {
			return i
		}
	}
	return -1
}

// claimEValue finds the E-value computed for a claim, if any.
func (a *Analysis) claimEValue(c Claim) claimEValue {
	for i, cc := range a.Study.Package.Claims {
		if cc.ID == c.ID {
			return a.eValues()[i]
		}
	}
	return claimEValue{}
}

// targetTrialFinding lists the missing parts of the target trial
// (Hernán & Robins 2016).
func targetTrialFinding(t *TargetTrial) []Finding {
	if t == nil {
		return []Finding{
			{
				Severity: StatusWarn,
				Topic:    "target-trial",
				ask:      "target-trial-missing",
				Message:  "No target trial is described: the randomized trial these causal claims emulate (population, intervention, comparator, outcome, follow-up; Hernán & Robins 2016) is left unsaid.",
			},
		}
	}
	var missing []string
	for _, part := range []struct{ name, v string }{
		{"population", t.Population}, {"intervention", t.Intervention}, {"comparator", t.Comparator},
		{"outcome", t.Outcome}, {"follow-up", t.FollowUp},
	} {
		if strings.TrimSpace(part.v) == "" {
			missing = append(missing, part.name)
		}
	}
	if len(missing) == 0 {
		return []Finding{
			{
				Severity: SeverityInfo,
				Topic:    "target-trial",
				Message:  "The target trial is described in all five parts (Hernán & Robins 2016).",
			},
		}
	}
	return []Finding{
		{
			Severity: StatusWarn,
			Topic:    "target-trial",
			Message:  "The target trial lacks its " + strings.Join(missing, ", ") + " (Hernán & Robins 2016).",
		},
	}
}
