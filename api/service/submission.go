package service

import (
	"io"
	"time"
)

// Submission statuses.
const (
	StatusQueued  = "queued"
	StatusRunning = "running"
	StatusDone    = "done"
	StatusFailed  = "failed"
)

// Statuses lists every submission status.
var Statuses = []string{StatusQueued, StatusRunning, StatusDone, StatusFailed}

// Finished reports whether a status is final until a rerun.
func Finished(status string) bool { return status == StatusDone || status == StatusFailed }

// Submission is one package sent for screening, without its bytes.
type Submission struct {
	ID             string
	OfficeID       int64
	SubmitterKeyID int64
	// SubmittedBy is the label of the key that sent it.
	SubmittedBy   string
	ManuscriptID  string
	Title         string
	PackageSHA256 string
	Status        string
	Error         string
	Attempts      int
	// Score and Band are those of the newest report; Reports counts them.
	Score     *int
	Band      *string
	Reports   int
	CreatedAt time.Time
	UpdatedAt time.Time
	// Progress is how far a running screening is; nil when it is not
	// running or has not yet reported.
	Progress *Progress
}

// Progress is how far a running screening is: its stage (the check about
// to run, or a long step inside one) and how many of the stage's units
// are done, as the worker last wrote it.
type Progress struct {
	Stage       string
	Done, Total int
	UpdatedAt   time.Time
}

// NewSubmission is what a store keeps for a new submission.
type NewSubmission struct {
	Key           *Key
	Package, Data []byte
	// DataReader, when not nil, gives the data instead of Data: DataSize
	// bytes, streamed into the store.
	DataReader     io.Reader
	DataSize       int64
	Title          string
	ManuscriptID   string
	PackageSHA256  string
	IdempotencyKey string
	// Cells counts the raw data's cells (rows × columns; 0 for summary
	// statistics): a job's deadline grows with it.
	Cells int64
}

// Filter selects submissions for a listing.
type Filter struct {
	Scope        Scope
	ManuscriptID string
	Status       string
	Band         string
	// Cursor continues a listing where an earlier page ended; Limit is the
	// page size.
	Cursor string
	Limit  int
}

// MaxPage is the largest page of a listing.
const MaxPage = 200

// StoredReport is a submission's newest report as stored: its id, which
// names these bytes for good (a stored report never changes), and the
// JSON, left nil when the caller said it already holds this id.
type StoredReport struct {
	ID   int64
	JSON []byte
}
