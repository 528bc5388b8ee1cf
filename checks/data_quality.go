package checks

import (
	"context"
	"fmt"
	"strconv"
)

// Sentences about suspect values (see suspectFinding for the worst cases:
// the count is at least 2, the quartiles are finite).
const (
	suspectSummary = " Some columns also hold repeated values far outside the rest, " +
		"which every estimate now treats as real measurements; see the findings."
	suspectMessage = "Column %q has the value %s in %d rows, more than three interquartile ranges " +
		"beyond the quartiles of its other values (%.4g and %.4g); %s."
	suspectCode = "it looks like a missing-value code; if it is one, list it in /data/missing_codes " +
		"as the data write it (for example %q)"
	suspectExtreme = "check that these are real measurements: a repeated identical value this far out " +
		"is often a code or an entry error"
)

type runFunc = func(context.Context, *Analysis) (CheckResult, error)

// withDataQuality adds to a check's result a warning for every suspect
// value of the data (Dataset.Suspects): such a value is used as a real
// measurement by every estimate, so the screen must not look clean while
// it stands.
func withDataQuality(run runFunc) runFunc {
	return func(ctx context.Context, a *Analysis) (CheckResult, error) {
		res, err := run(ctx, a)
		if err != nil || len(a.Study.Data.Suspects) == 0 {
			return res, err
		}
		fs := make([]Finding, 0, len(a.Study.Data.Suspects))
		for _, s := range a.Study.Data.Suspects {
			fs = append(fs, suspectFinding(s))
		}
		res.Findings = append(fs, res.Findings...)
		if rank(res.Status) < rank(StatusWarn) {
			res.Status = StatusWarn
		}
		res.Summary += suspectSummary
		if res.Metrics == nil {
			res.Metrics = map[string]any{}
		}
		res.Metrics["suspect_values"] = len(fs)
		return res, nil
	}
}

// suspectFinding says what a suspect value is and what to do about it.
func suspectFinding(s Suspect) Finding {
	v := strconv.FormatFloat(s.Value, 'g', -1, 64)
	what := suspectExtreme
	if s.Code {
		what = fmt.Sprintf(suspectCode, v)
	}
	return Finding{
		Severity: StatusWarn,
		Topic:    topic("suspect-value", s.Variable, numberSlug(s.Value)),
		Message:  fmt.Sprintf(suspectMessage, s.Variable, v, s.Count, s.Q1, s.Q3, what),
		Details: map[string]any{
			"variable": s.Variable, "value": s.Value, "count": s.Count, "likely_missing_code": s.Code,
		},
	}
}
