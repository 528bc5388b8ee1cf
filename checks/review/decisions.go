package review

import (
	"time"

	"github.com/pathvet/pathvet/checks"
)

// The decisions a reviewer can make on a finding: ask the authors about
// it (it goes into the letter), note it for the editor only, or dismiss it
// (with a reason).
const (
	Ask     = "ask"
	Note    = "note"
	Dismiss = "dismiss"
)

// Decisions lists the decisions, in the order a form offers them.
var Decisions = []string{Ask, Note, Dismiss}

// Annotation is a reviewer's decision on one finding.
type Annotation struct {
	Decision string
	Reason   string
	// Question is the reviewer's wording of the question; "" keeps the
	// finding's default question.
	Question string
	By       string // the label of the key that decided
	At       time.Time
	// CarriedFrom is the submission (an earlier version of the manuscript)
	// whose decision this is, for a decision carried over; "" for one made
	// on this version.
	CarriedFrom string
}

// DefaultDecision is the decision in force on a finding nobody decided:
// ask about fail and warn findings, note the rest.
func DefaultDecision(severity string) string {
	if asked(severity) {
		return Ask
	}
	return Note
}

func asked(severity string) bool {
	return severity == checks.StatusFail || severity == checks.StatusWarn
}

// Entry is a finding of a report with its check.
type Entry struct {
	checks.Finding
	Check, CheckTitle string
}

// Entries lists a report's findings in report order (the pipeline's
// order of checks, each check's findings as it gave them); a report made
// before findings had keys gets them (checks.EnsureKeys).
func Entries(r *checks.Report) []Entry {
	checks.EnsureKeys(r)
	var out []Entry
	for _, c := range r.Checks {
		for _, f := range c.Findings {
			out = append(out, Entry{Finding: f, Check: c.ID, CheckTitle: c.Title})
		}
	}
	return out
}

// Decided is a finding with the decision in force on it.
type Decided struct {
	Entry
	Decision string
	// Question is what the authors are asked: the reviewer's wording, else
	// the default ("" where neither gives one).
	Question string
	// Annotation is the reviewer's decision in force, nil where the default
	// holds.
	Annotation *Annotation
}

// Edited reports whether the reviewer reworded the question.
func (d Decided) Edited() bool { return d.Annotation != nil && d.Annotation.Question != "" }

// Decide gives each finding of a report the decision in force: its
// annotation in eff (by key), else the default.
func Decide(r *checks.Report, eff map[string]Annotation) []Decided {
	var out []Decided
	for _, e := range Entries(r) {
		d := Decided{Entry: e, Decision: DefaultDecision(e.Severity), Question: e.Finding.Question}
		if d.Question == "" && asked(e.Severity) { // a report made before findings had questions
			d.Question = checks.FallbackQuestion
		}
		if a, ok := eff[e.Key]; ok {
			d.Annotation, d.Decision = &a, a.Decision
			if a.Question != "" {
				d.Question = a.Question
			}
		}
		out = append(out, d)
	}
	return out
}

// Version is one version of a manuscript as the service holds it: the
// submission's id, its newest report (nil before one is made) and the
// reviewers' own decisions on it, the newest for each key.
type Version struct {
	ID     string
	Report *checks.Report
	Own    map[string]Annotation
}

// Effective returns the decisions in force on the last version of a
// manuscript's versions (oldest first): its own, and those of an earlier
// version carried over for each finding still open (the same key, the same
// severity) from version to version, marked with the submission they were
// made on. A version without a report breaks no chain: it is skipped.
func Effective(chain []Version) map[string]Annotation {
	var prev Version
	eff := map[string]Annotation{}
	for _, v := range chain {
		if v.Report == nil {
			continue
		}
		eff = carried(prev, eff, v.Report)
		for k, a := range v.Own {
			eff[k] = a
		}
		prev = v
	}
	return eff
}

// carried are the earlier version's decisions on the findings the new
// report still has with the same severity.
func carried(prev Version, prevEff map[string]Annotation, cur *checks.Report) map[string]Annotation {
	out := map[string]Annotation{}
	if prev.Report == nil {
		return out
	}
	now := severities(cur)
	for _, e := range Entries(prev.Report) {
		a, ok := prevEff[e.Key]
		if ok && now[e.Key] == e.Severity {
			if a.CarriedFrom == "" {
				a.CarriedFrom = prev.ID
			}
			out[e.Key] = a
		}
	}
	return out
}

// severities maps each key of a report to its finding's severity.
func severities(r *checks.Report) map[string]string {
	out := map[string]string{}
	for _, e := range Entries(r) {
		out[e.Key] = e.Severity
	}
	return out
}
