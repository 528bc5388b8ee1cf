package render

import (
	"fmt"
	"io"
	"strings"
)

// Progress is how far a running screening is, as its worker last wrote
// it: the stage (the check about to run, or a long step inside one, such
// as the imputations) and how many of the stage's units are done.
type Progress struct {
	Stage       string
	Done, Total int
	AsOf        string // when the worker wrote it, e.g. "05:12:03 UTC"
}

// barCells is how many characters a progress bar has.
const barCells = 10

// clamped is Done held within 0 and Total.
func (p Progress) clamped() int { return max(0, min(p.Done, p.Total)) }

// Words says the progress: "missing data: imputations, 7 of 20 done"; a
// stage without a known total is named alone.
func (p Progress) Words() string {
	stage := strings.TrimSpace(p.Stage)
	if stage == "" {
		stage = "a stage not named"
	}
	if p.Total <= 0 {
		return stage
	}
	return fmt.Sprintf("%s, %d of %d done", stage, p.clamped(), p.Total)
}

// Bar draws the progress in text: a filled square for each full tenth
// done, a hollow one for each tenth to go, so shape and not colour tells
// them apart; empty when the total is unknown. It repeats the numbers
// Words gives, for the eye only.
func (p Progress) Bar() string {
	if p.Total <= 0 {
		return ""
	}
	full := p.clamped() * barCells / p.Total
	return "[" + strings.Repeat("■", full) + strings.Repeat("□", barCells-full) + "]"
}

// Pending is the page of a submission without a report yet: queued,
// running (with its progress, when the worker has written it) or failed.
type Pending struct {
	Nav     Nav
	ID      string
	Title   string
	Status  string
	Running *Progress // nil unless running and written
	Note    string    // the attempt, or why it failed in words and what to do
	Detail  string    // what the server recorded of a failure, verbatim
}

// Refresh says whether the page reloads itself: while the screening may
// still end.
func (p Pending) Refresh() bool { return p.Status == "queued" || p.Status == "running" }

// Failed says whether the screening ended without a report: the page then
// offers to screen it again.
func (p Pending) Failed() bool { return p.Status == "failed" }

// WritePending writes the page of a submission that has no report yet.
func WritePending(w io.Writer, p Pending) error { return pageTmpl.ExecuteTemplate(w, "pending", p) }
