package checks

// Weight is what a check's status takes off the score of 100.
type Weight struct {
	Warn int // the check's status is warn
	Fail int // the check's status is fail
	// HeadlineFail replaces Fail when a fail finding concerns a headline
	// claim: a headline claim that does not hold weighs most.
	HeadlineFail int
}

// Weights are the score deductions per check id; the README's table of
// the score is checked against them by a test.
var Weights = map[string]Weight{
	"graph-declared":          {Warn: 5, Fail: 25, HeadlineFail: 35},
	"graph-fit":               {Warn: 5, Fail: 15, HeadlineFail: 15},
	"equivalence":             {Warn: 10, Fail: 25, HeadlineFail: 35},
	"alternatives":            {Warn: 5, Fail: 15, HeadlineFail: 25},
	"nearby-graphs":           {Warn: 5, Fail: 15, HeadlineFail: 25},
	"missing-data":            {Warn: 10, Fail: 20, HeadlineFail: 30},
	"effect-reporting":        {Warn: 5, Fail: 15, HeadlineFail: 25},
	"confounding-sensitivity": {Warn: 5, Fail: 10, HeadlineFail: 15},
	"measurement":             {Warn: 5, Fail: 10, HeadlineFail: 15},
	"causal-language":         {Warn: 5, Fail: 10, HeadlineFail: 15},
}

// Band returns the band of a score: 80–100 low, 50–79 moderate, 0–49 high
// concern (README, "Score").
func Band(score int) string {
	switch {
	case score >= 80:
		return BandLow
	case score >= 50:
		return BandModerate
	}
	return BandHigh
}

// score fills each check's deduction and the report's score and band.
func score(rep *Report) {
	headline := map[string]bool{}
	for _, c := range rep.Claims {
		headline[c.ID] = c.Headline
	}
	total := 100
	for i := range rep.Checks {
		c := &rep.Checks[i]
		w := Weights[c.ID]
		switch c.Status {
		case StatusWarn:
			c.Deduction = w.Warn
		case StatusFail:
			c.Deduction = w.Fail
			for _, f := range c.Findings {
				if f.Severity == StatusFail && headline[f.Claim] {
					c.Deduction = w.HeadlineFail
				}
			}
		}
		total -= c.Deduction
	}
	rep.Score = max(total, 0)
	capTooFew(rep)
	rep.Band = Band(rep.Score)
}
