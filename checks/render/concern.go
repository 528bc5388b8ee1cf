package render

import (
	"fmt"
	"sort"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// Concern is a report's level of concern in words, with the ledger of
// what each check took off the 100 points. Pages and the text view lead
// with it; the score is only the figure left at the end.
type Concern struct {
	Level string // "moderate concern", or "no checks ran"
	// Gist says how many checks fail and warn and how many points that
	// takes off; Headline names the headline claims a failing finding is
	// about; Unfinished the checks that could not run to the end.
	Gist, Headline, Unfinished string
	// Capped says why the score was held below what the deductions leave
	// (checks.ScoreCap); empty when it was not.
	Capped string
	Lines  []LedgerLine // the checks that took something off, most first
	Rest   string       // the checks that took nothing off, by verdict
	Off    int          // the points taken off in all
	Score  int
	Scale  string // which level each number of points taken off gives
}

// LedgerLine is one check's deduction.
type LedgerLine struct {
	ID, Title, Status, Verdict string
	Off                        int
}

// concernOf states a report's concern in words.
func concernOf(r *checks.Report) Concern {
	c := Concern{Level: bandWords(r.Band), Score: r.Score, Scale: concernScale()}
	if len(r.Checks) == 0 {
		c.Level, c.Gist = noChecksLevel, noChecksGist
		return c
	}
	var rest []checks.CheckResult
	for _, ch := range r.Checks {
		c.Off += ch.Deduction
		if ch.Deduction == 0 {
			rest = append(rest, ch)
			continue
		}
		c.Lines = append(c.Lines, LedgerLine{ID: ch.ID, Title: ch.Title, Status: ch.Status,
			Verdict: verdict(ch.Status), Off: ch.Deduction})
	}
	sort.SliceStable(c.Lines, func(i, j int) bool { return c.Lines[i].Off > c.Lines[j].Off })
	c.Gist = verdictTally(r.Checks) + "; " + pointsOff(c.Off, r.Score) + "."
	if r.ScoreCap != nil {
		c.Gist = verdictTally(r.Checks) + "; " + pointsOff(c.Off, r.ScoreCap.Uncapped) + "."
		c.Capped = r.ScoreCap.Reason
	}
	c.Headline, c.Unfinished = headlineFails(r), unfinished(r.Checks)
	if len(rest) > 0 && len(c.Lines) > 0 {
		c.Rest = restWords(rest)
	}
	return c
}

// Phrases of the concern.
const (
	noChecksLevel = "no checks ran"
	noChecksGist  = "No check ran, so this report says nothing about the submission."
)

// verdict is a check's status as the verb the pages use.
func verdict(status string) string {
	switch status {
	case checks.StatusFail:
		return "fails"
	case checks.StatusWarn:
		return "warns"
	case checks.StatusPass:
		return "passes"
	case checks.StatusNotApplicable:
		return "does not apply"
	}
	return Words(status)
}

// verdictN is "1 fails", "3 fail", "2 do not apply".
func verdictN(n int, status string) string { return fmt.Sprintf("%d %s", n, verdictVerb(n, status)) }

// verdictVerb is the verdict's verb agreeing with n checks.
func verdictVerb(n int, status string) string {
	v := verdict(status)
	if p, ok := pluralVerdicts[v]; ok && n != 1 {
		return p
	}
	return v
}

var pluralVerdicts = map[string]string{"fails": "fail", "warns": "warn", "passes": "pass",
	"does not apply": "do not apply"}

// verdictTally is "None of the 10 checks fails and 4 warn".
func verdictTally(cs []checks.CheckResult) string {
	fail, warn := 0, 0
	for _, c := range cs {
		fail += b2i(c.Status == checks.StatusFail)
		warn += b2i(c.Status == checks.StatusWarn)
	}
	if len(cs) == 1 {
		return "The one check " + verdict(cs[0].Status)
	}
	lead := fmt.Sprintf("%d of the %d checks", fail, len(cs))
	switch {
	case fail == 0 && warn == 0:
		return fmt.Sprintf("None of the %d checks fails or warns", len(cs))
	case fail == 0:
		lead = fmt.Sprintf("None of the %d checks fails", len(cs))
	case fail == 1:
		lead += " fails"
	default:
		lead += " fail"
	}
	if warn == 0 {
		return lead + " and none warns"
	}
	return lead + " and " + verdictN(warn, checks.StatusWarn)
}

// pointsOff says how many of the 100 points are taken off and what is left.
func pointsOff(off, score int) string {
	switch {
	case off == 0:
		return "nothing is taken off the 100 points"
	case off > 100:
		return fmt.Sprintf("%d points are taken off, more than the 100 there are, so the score stops at %d",
			off, score)
	case off == 1:
		return fmt.Sprintf("1 of the 100 points is taken off, leaving a score of %d", score)
	}
	return fmt.Sprintf("%d of the 100 points are taken off, leaving a score of %d", off, score)
}

// restWords says that the checks that took nothing off did so, and their
// verdicts: "The other 4 checks pass and take nothing off.", "The other
// 6 checks take nothing off: 4 pass and 2 do not apply."
func restWords(cs []checks.CheckResult) string {
	n := map[string]int{}
	for _, c := range cs {
		n[c.Status]++
	}
	var parts []string
	for _, s := range []string{checks.StatusFail, checks.StatusWarn, checks.StatusPass, checks.StatusNotApplicable} {
		if n[s] > 0 {
			parts = append(parts, verdictN(n[s], s))
		}
	}
	switch {
	case len(cs) == 1:
		return "The other check " + verdict(cs[0].Status) + " and takes nothing off."
	case len(parts) == 1:
		return fmt.Sprintf("The other %d checks %s and take nothing off.", len(cs), verdictVerb(2, cs[0].Status))
	}
	return fmt.Sprintf("The other %d checks take nothing off: %s.", len(cs), andList(parts))
}

// headlineFails names the headline claims that a failing finding is about.
func headlineFails(r *checks.Report) string {
	headline := map[string]bool{}
	for _, c := range r.Claims {
		headline[c.ID] = c.Headline
	}
	seen := map[string]bool{}
	var ids []string
	for _, c := range r.Checks {
		for _, f := range c.Findings {
			if f.Severity == checks.StatusFail && headline[f.Claim] && !seen[f.Claim] {
				seen[f.Claim] = true
				ids = append(ids, f.Claim)
			}
		}
	}
	switch len(ids) {
	case 0:
		return ""
	case 1:
		return "A failing finding is about the headline claim " + ids[0] + "."
	}
	return "Failing findings are about the headline claims " + andList(ids) + "."
}

// unfinished names the checks that could not run to the end.
func unfinished(cs []checks.CheckResult) string {
	var titles []string
	for _, c := range cs {
		if c.RunError != "" {
			titles = append(titles, c.Title)
		}
	}
	switch len(titles) {
	case 0:
		return ""
	case 1:
		return "One check could not run to the end and counts as failing: " + titles[0] + "."
	}
	return fmt.Sprintf("%d checks could not run to the end and count as failing: %s.", len(titles),
		andList(titles))
}

// concernScale says which points taken off give which level, read from
// checks.Band so that it cannot drift from the scoring.
func concernScale() string {
	var parts []string
	from := 0
	for off := 0; off <= 100; off++ {
		level := checks.Band(100 - off)
		if off < 100 && checks.Band(100-off-1) == level {
			continue
		}
		word := strings.TrimSuffix(bandWords(level), " concern")
		switch {
		case off == 100:
			parts = append(parts, fmt.Sprintf("%s from %d", word, from))
		case from == 0:
			parts = append(parts, fmt.Sprintf("%s up to %d points off", word, off))
		default:
			parts = append(parts, fmt.Sprintf("%s from %d to %d", word, from, off))
		}
		from = off + 1
	}
	return "Levels of concern: " + strings.Join(parts, ", ") + "."
}

// andList is "a", "a and b", "a, b and c".
func andList(s []string) string {
	if len(s) < 2 {
		return strings.Join(s, "")
	}
	return strings.Join(s[:len(s)-1], ", ") + " and " + s[len(s)-1]
}
