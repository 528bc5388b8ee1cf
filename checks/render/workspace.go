package render

import (
	"bytes"
	"html/template"
	"io"
	"reflect"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/review"
)

// The pages of the web workspace around a report: sign-in, the office's
// dashboard, the workspace parts of a submission page, and notices. Their
// input is plain values; the service fills them from its store.

// Nav is the workspace's navigation bar.
type Nav struct {
	Office, Role, Label, CSRF string
}

// SignIn is the sign-in page.
type SignIn struct {
	CSRF    string
	Message string // why the last attempt failed, in plain words
}

// Row is one submission on the dashboard.
type Row struct {
	ID, Title, ManuscriptID, Received, KeyLabel string
	Status, Progress                            string
	Score                                       *int
	Band                                        string    // a report token, or ""
	Version                                     string    // "version 2 of 3", or ""
	Running                                     *Progress // nil unless running and written
}

// Off is the points the newest report took off, in words.
func (r Row) Off() string {
	if r.Score == nil {
		return ""
	}
	return offWords(*r.Score)
}

// Group is the listed versions of one manuscript (or one submission
// without a manuscript ID).
type Group struct {
	ManuscriptID string
	Rows         []Row
}

// BandCount is how many submissions a band has.
type BandCount struct {
	Band, Words string
	N           int
}

// Filter is the dashboard's filter and period.
type Filter struct {
	Band, Status, Manuscript, Period string
}

// Dashboard is the office's dashboard.
type Dashboard struct {
	Nav        Nav
	Filter     Filter
	Groups     []Group
	Counts     []BandCount
	Unscreened int // submissions queued or running without a report yet
	// Unscreenable: submissions whose screening failed without any report.
	Unscreenable int
	Recurring    Recurring
	Truncated    bool // the recurring findings cover only the newest reports
	Periods      []string
	Next         string // the URL of the next page, or ""
	Refresh      bool   // some listed submission is queued or running
	// Deleted says what was just deleted (nil otherwise); Comments are the
	// office's published comments, newest first.
	Deleted  *Deleted
	Comments []PublishedRow
}

// HistoryEntry is one earlier report of a submission.
type HistoryEntry struct {
	N                int
	When, Tool, Band string
	Score            int
	Link             string
	Current          bool
}

// Off is the points the report took off, in words.
func (h HistoryEntry) Off() string { return offWords(h.Score) }

// offWords is the points a score leaves taken off: "35 points off"; a
// score of 0 may hide more than 100.
func offWords(score int) string {
	switch {
	case score >= 100:
		return "nothing off"
	case score <= 0:
		return "100 or more points off"
	}
	return plural(100-score, "point", "points") + " off"
}

// screeningWords are a submission's statuses in words.
var screeningWords = map[string]string{"queued": "waiting in the queue", "running": "being screened",
	"done": "screened", "failed": "could not be screened"}

// screening is a submission's status in words.
func screening(status string) string {
	if w, ok := screeningWords[status]; ok {
		return w
	}
	return Words(status)
}

// rankingHint says how the dashboard ranks the checks that recur.
const rankingHint = "Ranked by the number of reports in which the check failed, " +
	"then by the number in which it warned."

// Workspace is what a submission page adds to its report.
type Workspace struct {
	Nav    Nav
	ID     string
	Status string
	Error  string // why the newest screening failed, in words, with what to do
	// ErrorDetail is what the server recorded of that failure, verbatim.
	ErrorDetail string
	Running     *Progress // nil unless a new screening runs and has written how far it is
	History     []HistoryEntry
	// Earlier says which earlier report the page shows ("" for the newest).
	Earlier string
	// The review: the letter under the decisions in force, the decisions
	// with their forms, and the comparison with the previous version; nil
	// where the page shows none (an earlier report).
	Letter *review.Letter
	Review *ReviewPanel
	Since  *Since
}

// WriteSignIn writes the sign-in page.
func WriteSignIn(w io.Writer, s SignIn) error { return pageTmpl.ExecuteTemplate(w, "signin", s) }

// WriteDashboard writes the office's dashboard.
func WriteDashboard(w io.Writer, d Dashboard) error {
	return pageTmpl.ExecuteTemplate(w, "dashboard", d)
}

// WriteNotice writes a short page: not found, not yet screened, refused.
func WriteNotice(w io.Writer, nav *Nav, title, message string) error {
	return pageTmpl.ExecuteTemplate(w, "notice", struct {
		Nav            *Nav
		Title, Message string
	}{nav, title, message})
}

// WriteSubmission writes a submission page: the report with the
// workspace's navigation, its forms and its history.
func WriteSubmission(w io.Writer, r *checks.Report, ws Workspace) error {
	var opts PageOptions
	for _, part := range []struct {
		name string
		data any
		out  *template.HTML
	}{{"navbar", ws.Nav, &opts.Nav}, {"actions", ws, &opts.Actions}, {"history", ws, &opts.History},
		{"reviewpanel", ws.Review, &opts.Review}, {"since", ws.Since, &opts.Since}} {
		if v := reflect.ValueOf(part.data); v.Kind() == reflect.Pointer && v.IsNil() {
			continue
		}
		var b bytes.Buffer
		if err := pageTmpl.ExecuteTemplate(&b, part.name, part.data); err != nil {
			return err
		}
		*part.out = template.HTML(b.String())
	}
	opts.Letter = ws.Letter
	return WritePage(w, r, opts)
}
