package review

import (
	"github.com/pathvet/pathvet/checks"
)

// What became of a question asked of an earlier version.
const (
	// Answered: the new version's screen no longer raises the finding (its
	// key is gone, or it is now only a note).
	Answered = "answered"
	// Open: the same finding, with the same severity, is still there.
	Open = "open"
	// Changed: the finding is still there, but graver or milder (a failure
	// now a warning, or the reverse).
	Changed = "changed"
)

// Outcome is what became of one question asked of the earlier version.
type Outcome struct {
	State      string
	Key        string
	CheckTitle string
	Claim      *ClaimRef // the claim it was about, as the earlier version stated it
	Question   string    // as it was asked
	Was        string    // the finding's sentence then
	Now        string    // and now ("" when answered by its going)
	WasSev     string
	NowSev     string // "" when the finding is gone
}

// Comparison is what became of the earlier version's questions, and the
// findings the new version raises that the earlier one did not.
type Comparison struct {
	Asked  []Outcome
	Raised []Decided // fail and warn findings with a key the earlier report lacks
}

// Compare holds the questions asked of the earlier version (its findings
// decided "ask" under prevEff) against the new version's report, and
// lists the new version's fail and warn findings that are new.
func Compare(prev *checks.Report, prevEff map[string]Annotation, cur *checks.Report,
	curEff map[string]Annotation) Comparison {
	now := map[string]Entry{}
	for _, e := range Entries(cur) {
		now[e.Key] = e
	}
	claims := claimRefs(prev)
	var c Comparison
	before := map[string]bool{}
	for _, d := range Decide(prev, prevEff) {
		before[d.Key] = true
		if d.Decision == Ask {
			c.Asked = append(c.Asked, outcome(d, now, claims))
		}
	}
	for _, d := range Decide(cur, curEff) {
		if !before[d.Key] && asked(d.Severity) {
			c.Raised = append(c.Raised, d)
		}
	}
	return c
}

func outcome(d Decided, now map[string]Entry, claims map[string]ClaimRef) Outcome {
	o := Outcome{Key: d.Key, CheckTitle: d.CheckTitle, Question: d.Question, Was: d.Message, WasSev: d.Severity}
	if c, ok := claims[d.Claim]; ok {
		o.Claim = &c
	}
	e, ok := now[d.Key]
	switch {
	case !ok:
		o.State = Answered
		return o
	case e.Severity == d.Severity:
		o.State = Open
	case asked(d.Severity) && !asked(e.Severity):
		o.State = Answered
	default:
		o.State = Changed
	}
	o.Now, o.NowSev = e.Message, e.Severity
	return o
}
