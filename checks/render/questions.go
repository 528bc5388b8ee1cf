package render

import (
	"fmt"
	"io"
	"sort"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// Question is one question for the authors, made from one fail or warn
// finding: the finding as the screen states it, then what to ask.
type Question struct {
	N          int
	CheckTitle string
	Claim      string
	Finding    string
	Ask        string
	Severity   string
	// from is the finding it was made from: the check's id and the
	// finding's place among the check's findings, worst first.
	from questionSource
}

type questionSource struct {
	check string
	index int
}

// asks are the questions each check's findings raise.
var asks = map[string]string{
	"graph-declared": "Could you state the complete causal graph that the claims rest on?",
	"graph-fit": "How do you reconcile the declared graph with the data here, " +
		"and would a revised graph change the claims?",
	"equivalence": "What evidence beyond these data supports the direction " +
		"of the arrows the claims depend on?",
	"nearby-graphs": "Why is the declared graph preferred to this graph one edit away, " +
		"and do the claims hold under it?",
	"alternatives": "Which other causal orders did you consider, and why do the data " +
		"or the design favour the declared graph?",
	"missing-data": "How were missing values coded and handled, and do the claims hold " +
		"under maximum likelihood or multiple imputation?",
	"effect-reporting": "Could you report each effect with its size and interval, " +
		"and state conclusions that agree with them?",
	"confounding-sensitivity": "Which unmeasured confounders could explain the estimates away, " +
		"and how does the design rule them out?",
	"measurement": "How reliable are the measures, and does correcting for measurement error " +
		"change the claims?",
	"causal-language": "Could you word the claims so that they say no more than the design " +
		"and the stated target trial support?",
}

const defaultAsk = "How do you respond to this point?"

// Questions turns every fail and warn finding into one numbered question,
// fails first, then in the order of the checks.
func Questions(r *checks.Report) []Question {
	var qs []Question
	for _, c := range ByConcern(r.Checks) {
		for i, f := range c.Findings {
			if f.Severity != checks.StatusFail && f.Severity != checks.StatusWarn {
				continue
			}
			ask, ok := asks[c.ID]
			if !ok {
				ask = defaultAsk
			}
			qs = append(qs, Question{CheckTitle: c.Title, Claim: f.Claim,
				Finding: Prose(f.Message), Ask: ask, Severity: f.Severity, from: questionSource{c.ID, i}})
		}
	}
	sort.SliceStable(qs, func(i, j int) bool { return rank(qs[i].Severity) > rank(qs[j].Severity) })
	for i := range qs {
		qs[i].N = i + 1
	}
	return qs
}

// WriteLetter writes the questions for the authors as Markdown, ready to
// paste into a decision letter, with the caution and the package hash.
func WriteLetter(w io.Writer, r *checks.Report) error {
	var b strings.Builder
	fmt.Fprintf(&b, "# Questions for the authors\n\n**%s**", MarkdownText(r.Title))
	if r.ManuscriptID != "" {
		fmt.Fprintf(&b, " (manuscript %s)", MarkdownText(r.ManuscriptID))
	}
	fmt.Fprintf(&b, "\n\nAn automated statistical screen (pathvet %s, %s) scored this submission %d of 100: %s.",
		r.ToolVersion, r.GeneratedAt.UTC().Format("2 January 2006"), r.Score, bandWords(r.Band))
	if r.ScoreCap != nil {
		b.WriteString(" " + MarkdownText(r.ScoreCap.Reason))
	}
	b.WriteString("\n\n")
	fmt.Fprintf(&b, "> %s\n\n", MarkdownText(r.Caution))
	qs := Questions(r)
	if len(qs) == 0 {
		b.WriteString("The screen raised no questions.\n")
	}
	for _, q := range qs {
		about := q.CheckTitle
		if q.Claim != "" {
			about += ", claim " + q.Claim
		}
		fmt.Fprintf(&b, "%d. %s (%s) %s\n", q.N, MarkdownText(q.Finding), MarkdownText(about), MarkdownText(q.Ask))
	}
	fmt.Fprintf(&b, "\nPackage SHA-256: `%s`\n", r.PackageSHA256)
	_, err := io.WriteString(w, b.String())
	return err
}
