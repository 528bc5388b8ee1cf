package render

import (
	"io"
	"time"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/review"
)

// The review's parts of the workspace: each finding with its decision and
// a form to change it, the history of decisions, the published comment,
// and the published page itself. Their input is plain values and the
// review's types; the service fills them.

// ReviewPanel is the review section of a submission page.
type ReviewPanel struct {
	ID, CSRF  string
	CanDecide bool // an editor's session: the forms are shown
	Findings  []DecisionRow
	History   []HistoryRow
	Notes     []ItemView // noted for the editor only, grouped as the letter groups
	Dismissed int
	Comment   *CommentInfo // nil when none is published
	Asked     int          // points the letter asks now
}

// DecisionRow is one finding with the decision in force and its form.
type DecisionRow struct {
	Key, CheckTitle, Severity, SeverityWords string
	Claim, ClaimText                         string
	Message                                  string
	Decision, DecisionWords                  string
	Question, DefaultQuestion                string
	Reason, By, At, CarriedFrom              string
	Choices                                  []Choice
}

// Choice is one decision a form offers.
type Choice struct {
	Value, Words string
	Checked      bool
}

// HistoryRow is one change of a decision, in words.
type HistoryRow struct {
	When, By, Key, Before, After string
}

// CommentInfo is the published comment, for its office.
type CommentInfo struct {
	URL, PublishedAt string
	Indexable        bool
	Points           int
}

// decisionWords say a decision in force.
var decisionWords = map[string]string{review.Ask: "asked of the authors", review.Note: "noted for the editor only",
	review.Dismiss: "dismissed"}

// choiceWords label a form's choices.
var choiceWords = map[string]string{review.Ask: "Ask the authors", review.Note: "Note for the editor only",
	review.Dismiss: "Dismiss (give a reason)"}

// severityWords say a finding's severity.
var severityWords = map[string]string{checks.StatusFail: "failure", checks.StatusWarn: "warning",
	checks.SeverityInfo: "information"}

// DecisionWords says a decision in words.
func DecisionWords(d string) string { return decisionWords[d] }

// DecisionRows are a report's findings with their decisions, worst first
// and in report order within a severity, as the review panel lists them.
func DecisionRows(r *checks.Report, decided []review.Decided, at func(time.Time) string) []DecisionRow {
	texts := map[string]string{}
	for _, c := range r.Claims {
		texts[c.ID] = c.Text
	}
	var out []DecisionRow
	for _, sev := range []string{checks.StatusFail, checks.StatusWarn, checks.SeverityInfo} {
		for _, d := range decided {
			if d.Severity == sev {
				out = append(out, decisionRow(d, texts[d.Claim], at))
			}
		}
	}
	return out
}

func decisionRow(d review.Decided, claimText string, at func(time.Time) string) DecisionRow {
	row := DecisionRow{Key: d.Key, CheckTitle: d.CheckTitle, Severity: d.Severity,
		SeverityWords: severityWords[d.Severity], Claim: d.Claim, ClaimText: claimText, Message: Prose(d.Message),
		Decision: d.Decision, DecisionWords: decisionWords[d.Decision], Question: d.Question,
		DefaultQuestion: d.Finding.Question}
	if a := d.Annotation; a != nil {
		row.Reason, row.By, row.CarriedFrom = a.Reason, a.By, a.CarriedFrom
		if !a.At.IsZero() {
			row.At = at(a.At)
		}
	}
	for _, v := range review.Decisions {
		row.Choices = append(row.Choices, Choice{Value: v, Words: choiceWords[v], Checked: v == d.Decision})
	}
	return row
}

// Published is a published comment's page: the asked points as they were
// published, with the caution.
type Published struct {
	Letter      review.Letter
	PublishedAt time.Time
	Indexable   bool
}

type publishedView struct {
	L                   review.Letter
	Items               []ItemView
	Screened, Published string
	Indexable           bool
}

// WritePublished writes a published comment's page: one self-contained
// document that links nowhere and shows no score, band, key or office.
func WritePublished(w io.Writer, p Published) error {
	return pageTmpl.ExecuteTemplate(w, "published", publishedView{L: p.Letter, Items: ItemViews(p.Letter.Items),
		Screened: p.Letter.Screened.UTC().Format("2 January 2006"), Published: p.PublishedAt.UTC().Format(
			"2 January 2006"), Indexable: p.Indexable})
}

// ConfirmDelete is the page that asks before a submission is deleted:
// what goes with it.
type ConfirmDelete struct {
	Nav                               Nav
	ID, Title, ManuscriptID, Received string
	Reports, Decisions                int
	Comment                           bool
}

// WriteConfirmDelete writes the page that asks before deleting.
func WriteConfirmDelete(w io.Writer, d ConfirmDelete) error {
	return pageTmpl.ExecuteTemplate(w, "confirmdelete", d)
}

// Deleted is what the dashboard says was deleted.
type Deleted struct {
	Title, ManuscriptID, By, At string
	Reports                     int
	Comment                     bool
}

// PublishedRow is a published comment on the dashboard's list.
type PublishedRow struct {
	SubmissionID, Title, URL, At string
}
