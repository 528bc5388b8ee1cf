package checks

import (
	"fmt"
	"math"

	"github.com/pathvet/pathvet/checks/effects"
)

// Too few cases for the tests to tell (README, "Score"): a test that
// would detect even a large effect, a partial correlation of 0.5 (Cohen
// 1988, Statistical Power Analysis, ch. 3: "large"), with probability
// below one half cannot tell an effect from none. Where every test of the
// graph's implications is such a test, graph-fit says the fit test cannot
// tell; where a claim's is, effect-reporting says so; and either caps the
// score at MaxScoreTooFewCases, so that a screen that could not look does
// not look clean. The threshold of one half is common practice for "almost
// no power" (worse than even odds), not a published line.
const (
	largeEffect         = 0.5
	tooLittlePower      = 0.5
	MaxScoreTooFewCases = 79 // the top of moderate concern
)

// Sentences of the too-few-cases rule.
const (
	fitTooFewFormat = "With %s, %s cannot tell: %s, so that the data do not contradict the graph says " +
		"little about it."
	fitPowerFormat = "%s would detect a missing arrow even of a large partial correlation (0.5; Cohen 1988) " +
		"with probability at most %.2f at the %g level"
	fitNoTest        = "so few cases leave no degrees of freedom for a test by Fisher's z (n − k − 3 < 1)"
	tooFewSummary    = "With so few cases, the data can hardly tell the size or sign of %s; see the findings."
	fitTooFewSummary = "With %s, the tests of the declared graph's implications have %s: the fit test cannot " +
		"tell whether the data contradict the graph. "
	claimTooFewFormat = "With %s and %s adjusted for, the data can hardly tell %s's size or sign: %s%s."
	tooFewPowerFormat = "a test of it would detect even a large effect (a partial correlation of 0.5; Cohen 1988) " +
		"with probability %.2f at the %g level"
	tooFewNoTest   = "so few cases leave no degrees of freedom for a test of it by Fisher's z (n − k − 3 < 1)"
	scoreCapFormat = "The score is capped at %d (moderate concern), from %d: with so few cases the tests cannot " +
		"tell (%s), and a screen that cannot look does not look clean."
)

// tooFewKey marks, in a finding's details, that the finding is one of too
// few cases for the tests to tell; score caps a report that has one.
const tooFewKey = "too_few_cases"

// capTooFew caps the score of a report where some check warns or fails
// with a finding of too few cases, and says so in rep.ScoreCap.
func capTooFew(rep *Report) {
	var ids []string
	for _, c := range rep.Checks {
		if c.Status != StatusWarn && c.Status != StatusFail {
			continue
		}
		for _, f := range c.Findings {
			if f.Details[tooFewKey] == true {
				ids = append(ids, c.ID)
				break
			}
		}
	}
	if len(ids) == 0 || rep.Score <= MaxScoreTooFewCases {
		return
	}
	rep.ScoreCap = &ScoreCap{Cap: MaxScoreTooFewCases, Uncapped: rep.Score, Reason: fmt.Sprintf(scoreCapFormat,
		MaxScoreTooFewCases, rep.Score, "see "+joinAnd(ids))}
	rep.Score = MaxScoreTooFewCases
}

// tooFewOnly says whether every warning or fail among fs is one of too
// few cases, and how many claims those concern.
func tooFewOnly(fs []Finding) (only bool, claims int) {
	only = true
	for _, f := range fs {
		switch {
		case f.Details[tooFewKey] == true:
			claims++
		case f.Severity == StatusWarn || f.Severity == StatusFail:
			only = false
		}
	}
	return only && claims > 0, claims
}

// tooFewFitSummary opens graph-fit's summary where its tests cannot tell.
func tooFewFitSummary(n int, best float64) string {
	power := fmt.Sprintf("almost no power (at most %.2f against a large missing arrow)", best)
	if best == 0 {
		power = "no degrees of freedom left (n − k − 3 < 1)"
	}
	return fmt.Sprintf(fitTooFewSummary, count(n, "case", "cases"), power)
}

// largeEffectPower is the power of the two-sided Fisher-z test at alpha of
// a partial correlation given k variables, from n cases, to detect a
// partial correlation of largeEffect (Cohen 1988, ch. 3):
//
//	power = P(|Z + atanh(0.5) sqrt(n − k − 3)| > z_{1−α/2})
//
// and 0 where n − k − 3 < 1, which allows no test.
func largeEffectPower(n, k int, alpha float64) float64 {
	df := n - k - 3
	if df < 1 {
		return 0
	}
	return effects.Power(math.Atanh(largeEffect), 1/math.Sqrt(float64(df)), alpha, effects.Normal)
}

// fitTooFew is the finding that the graph's implications cannot be told
// apart from their violation with these cases, and the largest power
// among their tests; nil where some test has power, or none was made.
func (a *Analysis) fitTooFew(tests []implicationTest, n int) (*Finding, float64) {
	if len(tests) == 0 {
		return nil, math.NaN()
	}
	best := 0.0
	for _, t := range tests {
		best = math.Max(best, largeEffectPower(n, len(t.imp.Given), a.Alpha))
	}
	if best >= tooLittlePower {
		return nil, best
	}
	which, each := fmt.Sprintf("the tests of the graph's %d implied independences", len(tests)), "each"
	if len(tests) == 1 {
		which, each = "the test of the graph's one implied independence", "it"
	}
	how := fmt.Sprintf(fitPowerFormat, each, best, a.Alpha)
	if best == 0 {
		how = fitNoTest
	}
	return &Finding{Severity: StatusWarn, Topic: "too-few-cases",
		Message: fmt.Sprintf(fitTooFewFormat, count(n, "case", "cases"),
			which, how),
		Details: map[string]any{"power_large_effect": num(best), tooFewKey: true}}, best
}

// claimTooFew is the finding that a claim's recomputed estimate e rests
// on too few cases for its test to tell; nil otherwise.
func (a *Analysis) claimTooFew(c Claim, e est) *Finding {
	if !e.ok() || e.method == MethodZero || e.n == 0 {
		return nil
	}
	pw := largeEffectPower(e.n, len(e.adjusted), a.Alpha)
	if pw >= tooLittlePower {
		return nil
	}
	adj := "nothing"
	if k := len(e.adjusted); k > 0 {
		adj = count(k, "variable", "variables")
	}
	interval := ""
	if !math.IsNaN(e.lo) && !math.IsNaN(e.hi) {
		interval = fmt.Sprintf(" (recomputed %g%% interval %s to %s)", 100*claimLevel(c), figure(e.lo), figure(e.hi))
	}
	how := fmt.Sprintf(tooFewPowerFormat, pw, a.Alpha)
	if pw == 0 {
		how = tooFewNoTest
	}
	return &Finding{Severity: StatusWarn, Claim: c.ID, Topic: "too-few-cases", Message: fmt.Sprintf(claimTooFewFormat,
		count(e.n, "case", "cases"), adj, c.ID, how, interval),
		Details: map[string]any{"power_large_effect": num(pw), tooFewKey: true}}
}
