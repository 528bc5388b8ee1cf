package checks

import (
	"fmt"
	"strings"
)

// The default question for the authors of every fail or warn finding, by
// the finding's check and kind (its topic's kind, or the kind its check
// chose for what it found). Each asks what the finding shows and no more:
// a question never presumes a cause the finding did not establish, nor
// that a revision will fix it. A question about a claim speaks of "this
// claim", so that the letter can ask it once of several claims ("each of
// these claims"); it never names the claim, which the letter does.

// questions maps "check/kind" to its question.
var questions = map[string]string{
	"graph-declared/no-graph": "Could you state the causal graph this claim rests on: the variables it is " +
		"adjusted for, and the arrows that justify that adjustment?",
	"graph-declared/claim-outside-graph": "Could you place the variables this claim names in the declared " +
		"graph, with the arrows you assume for them?",
	"graph-declared/no-path": "Which directed path from cause to effect does this claim assume? Could you add " +
		"it to the declared graph, or revise the claim?",
	"graph-declared/arrow-reversed": "Which direction do you intend, the claim's or the declared graph's? " +
		"Could you make the graph and this claim agree?",
	"graph-declared/no-arrow": "Could you add the arrow this direct-effect claim assumes to the declared " +
		"graph, or restate the claim so that it matches the graph?",

	"graph-fit/chi-square": "How do you reconcile the declared graph with the chi-square test's rejection, and " +
		"do the claims hold under a graph revised to fit?",
	"graph-fit/fit-index": "How do you judge the declared graph's fit given this index, and do the claims " +
		"hold under a graph revised to fit better?",
	"graph-fit/too-few-cases": "With so few cases the data cannot test the declared graph; what besides these " +
		"data supports it?",

	"equivalence/across-equivalents": "What evidence beyond these data (the design, the order in time of the " +
		"measurements, earlier studies) supports the direction of the arrows this claim depends on?",
	"equivalence/arrow-direction": "What evidence beyond these data supports the direction of the arrow " +
		"behind this claim?",
	"equivalence/not-estimated": "How was this claim estimated in the paper? The screen could not estimate " +
		"it from the data under the declared graph.",
	"equivalence/across-unestimated": "Does this claim hold under every graph that fits the data exactly as " +
		"well as the declared one? The screen could not estimate it in all of them.",
	"equivalence/across-indirect-unlisted": "Does this indirect effect hold in every graph that fits the data " +
		"exactly as well as the declared one? They are too many for the screen to re-estimate it in each.",
	"equivalence/discussion": "Could you discuss the graphs that fit any data exactly as well as the declared " +
		"one, and say what beyond these data favours the declared graph?",

	"alternatives/none-stated": "Which other causal orders did you consider for the causal claims, and why do " +
		"the design or the data favour the declared graph?",

	"nearby-graphs/nearby": "Why do you prefer the declared graph to the graph one edit away under which " +
		"this claim changes, and what beyond these data supports the arrows that edit concerns?",
	"nearby-graphs/search": "What supports the declared graph's arrows that the search's graph changes, and do " +
		"the claims hold under the search's graph?",
	"nearby-graphs/unexamined": "Do the claims hold under the other graphs one edit away that fit the data " +
		"about as well as the declared one?",
	"nearby-graphs/nearby-indirect-unlisted": "Does this indirect effect hold under the graphs one edit away " +
		"that fit the data about as well, which are too many for the screen to re-estimate it in each?",
	"nearby-graphs/unlisted": "Do the claims named here hold under the graphs one edit away in which the " +
		"screen could not re-estimate them?",
	"nearby-graphs/unexamined-better": "Do the claims hold under the other graphs one edit away that fit the " +
		"data better than the declared one?",

	"missing-data/method-unstated": "How were missing values handled in the analysis, and do the claims hold " +
		"under multiple imputation or maximum likelihood?",
	"missing-data/method-none": "How were the missing values handled, given that the package says none are " +
		"missing, and do the claims hold under multiple imputation or maximum likelihood?",
	"missing-data/method-unsound": "Could you report the analysis by multiple imputation or maximum " +
		"likelihood, and say whether the conclusions change?",
	"missing-data/method-unsound-summary": "Could you share the raw rows, or report the analysis by multiple " +
		"imputation or maximum likelihood?",
	"missing-data/completed-data": "Could you share the data with their missing cells, as they were before " +
		"the missing values were filled in?",
	"missing-data/available-cases": "Could you report the analysis by multiple imputation or maximum " +
		"likelihood, as the screen could not reproduce the available-case analysis?",
	"missing-data/mcar": "Why does the analysis of complete or available cases hold here, or could you " +
		"re-analyse by multiple imputation or maximum likelihood?",
	"missing-data/mcar-unstated": "If the paper analysed complete or available cases, why does that analysis " +
		"hold here, or could you re-analyse by multiple imputation or maximum likelihood?",
	"missing-data/principled-failed": "Could you report the analysis by multiple imputation or maximum " +
		"likelihood, which the screen could not run on these data?",
	"missing-data/imputations": "Could you report the pooled estimates with enough imputations that their " +
		"Monte Carlo error cannot carry them across the significance line?",
	"missing-data/by-method": "Could you report this claim under a principled handling of missing values " +
		"(multiple imputation or maximum likelihood), and say which conclusion you draw?",
	"missing-data/by-method-unestimated": "Could you report this claim both by the missing-data method you " +
		"used and by a principled one? The screen could not compare the two.",

	"effect-reporting/p-without-estimate": "Could you report the size of this effect with its interval, " +
		"beside its p-value?",
	"effect-reporting/no-figures": "Could you report this claim's estimate with its interval (or standard " +
		"error) and its p-value?",
	"effect-reporting/no-interval": "Could you report an interval or a standard error for this estimate?",
	"effect-reporting/p-consistency": "Could you check the reported p-value against the estimate and its " +
		"uncertainty, and say which test gave it?",
	"effect-reporting/reported-figure": "How was the reported figure obtained: from which cases, with which " +
		"adjustment, on which scale?",
	"effect-reporting/reported-figure-codes": "Which values in the data are codes for missing values, and " +
		"were they read as missing in the analysis behind the reported figure?",
	"effect-reporting/normal-theory-indirect": "Could you judge this indirect effect by a percentile bootstrap " +
		"or Monte Carlo interval, and report whether that interval excludes zero?",
	"effect-reporting/too-few-cases": "With so few cases the test of this claim can hardly detect even a " +
		"large effect; what besides this test supports the claim?",
	"effect-reporting/absence-contradicted": "The data show an effect where this claim says there is none; " +
		"could you revise it, or say why an effect of this size is of no interest?",
	"effect-reporting/absence-undecided": "Could you support this claim of no effect by an equivalence test " +
		"against the smallest effect of interest, or word it as inconclusive?",
	"effect-reporting/absence-untested": "Could you report the estimate with its interval, so that this " +
		"claim of no effect can be weighed?",

	"confounding-sensitivity/e-value": "Could an unmeasured confounder of this strength plausibly exist here, " +
		"and what in the design or the measured covariates rules such confounders out?",
	"confounding-sensitivity/mediator-confounding-missing": "How sensitive is this indirect effect to an " +
		"unmeasured common cause of the mediator and the outcome, and what in the design rules one out?",
	"confounding-sensitivity/e-value-missing": "Could you report this claim's estimate with its standard " +
		"error or interval, so that its sensitivity to unmeasured confounding can be judged?",

	"measurement/corrected-impossible": "Could you check the reported reliabilities against the correlations? " +
		"Corrected for attenuation, they give an impossible correlation matrix.",
	"measurement/corrected": "Does this claim's conclusion hold once measurement error is allowed for (for " +
		"instance in a latent-variable model)?",
	"measurement/corrected-unestimated": "How does measurement error affect this claim? The screen could not " +
		"estimate it with and without the correction.",
	"measurement/none-corrected": "How does measurement error affect the claims? The screen could not " +
		"re-estimate any of them on the corrected correlations.",

	"causal-language/wording": "Could you word this claim so that it says no more than the design supports, " +
		"or supply what its causal reading lacks?",
	"causal-language/wording-association": "Could you word this association without causal verbs (for " +
		"instance \"is associated with\"), or declare it a causal claim with its graph?",
	"causal-language/target-trial": "Could you complete the description of the target trial with the parts " +
		"it lacks?",
	"causal-language/target-trial-missing": "Could you describe the target trial these causal claims " +
		"emulate: its population, intervention, comparator, outcome and follow-up?",
}

// FallbackQuestion is asked of a fail or warn finding of a kind the table
// does not know (a test holds every check's kinds to the table).
const FallbackQuestion = "How do you respond to this point?"

// identify gives a check's findings their keys and default questions.
func (a *Analysis) identify(check string, fs []Finding) {
	keyFindings(check, fs)
	for i := range fs {
		f := &fs[i]
		if f.Question == "" && (f.Severity == StatusFail || f.Severity == StatusWarn) {
			f.Question = a.question(check, *f)
		}
		if f.Severity != StatusFail && f.Severity != StatusWarn {
			f.Question = ""
		}
		f.ask = ""
	}
}

// question is the table's question for a finding, or the fallback.
func (a *Analysis) question(check string, f Finding) string {
	kind := f.ask
	if kind == "" {
		kind = TopicKind(f.Topic)
	}
	if ask, ok := subjectQuestions[check+"/"+kind]; ok {
		return ask(a, f)
	}
	if q, ok := questions[check+"/"+kind]; ok {
		return q
	}
	return FallbackQuestion
}

// subjectQuestions are questions that name their subject: variables by
// their labels, a value of the data.
var subjectQuestions = map[string]func(a *Analysis, f Finding) string{
	"graph-fit/independence": func(a *Analysis, f Finding) string {
		x, _ := f.Details["x"].(string)
		y, _ := f.Details["y"].(string)
		return fmt.Sprintf("Which arrow or common cause missing from the declared graph could connect %s and %s, "+
			"and do the claims hold once the graph allows for it?", a.varText(x), a.varText(y))
	},
	"missing-data/suspect-value": func(a *Analysis, f Finding) string {
		v, _ := f.Details["variable"].(string)
		return fmt.Sprintf("Is the value %v of %s a code (for a missing value, say), an entry error or a real "+
			"measurement?", f.Details["value"], a.varText(v))
	},
	"measurement/no-reliability": func(a *Analysis, f Finding) string {
		names, _ := f.Details["variables"].([]string)
		texts := make([]string, len(names))
		for i, n := range names {
			texts[i] = a.varText(n)
		}
		return fmt.Sprintf("Could you report the reliability of %s, and say whether correcting for measurement "+
			"error changes the claims that use %s?", joinAnd(texts), them(len(names)))
	},
}

// varText names a variable for the authors: its label in quotation marks
// with its name, or the name where the package gives no label.
func (a *Analysis) varText(name string) string {
	i, ok := a.Study.Index[name]
	if !ok || strings.TrimSpace(a.Study.Package.Variables[i].Label) == "" {
		return name
	}
	return fmt.Sprintf("“%s” (%s)", strings.Join(strings.Fields(a.Study.Package.Variables[i].Label), " "), name)
}

// alternativeQuestion is the question of a claim that changes under, or
// cannot be estimated under, a stated alternative, which it names.
func alternativeQuestion(kind, name string) string {
	if kind == "unestimated" {
		return fmt.Sprintf("How does this claim fare under your alternative “%s”? The screen could not estimate it "+
			"there.", name)
	}
	return fmt.Sprintf("Why do you prefer the declared graph to your alternative “%s”, under which this claim's "+
		"conclusion changes, when the data do not favour the declared graph over it?", name)
}

// alternativeFitQuestion asks about an alternative the screen could not
// hold against the declared graph.
func alternativeFitQuestion(name string, variables bool) string {
	if variables {
		return fmt.Sprintf("Could you state the alternative “%s” over the same variables as the declared graph, so "+
			"that the two can be compared?", name)
	}
	return fmt.Sprintf("How does the alternative “%s” fit the data? The screen could not fit it.", name)
}
