package service

import "time"

// The review of a submission: reviewers' decisions on its findings, the
// comment an office publishes, and what it deleted.

// Decisions a reviewer can make on a finding.
const (
	DecisionAsk     = "ask"
	DecisionNote    = "note"
	DecisionDismiss = "dismiss"
)

// Limits of a reviewer's texts, in characters.
const (
	MaxReason   = 2000
	MaxQuestion = 2000
)

// Annotation is one decision a reviewer made on a finding of a
// submission, as kept: every change is a new one.
type Annotation struct {
	ID           int64
	SubmissionID string
	Key          string // the finding's key
	Decision     string
	Reason       string
	Question     string // "" keeps the default question
	By           string // the label of the key that decided ("" for a key without one)
	ByKeyID      int64  // 0 once that key is deleted
	At           time.Time
}

// NewAnnotation is a decision to keep.
type NewAnnotation struct {
	Key, Decision, Reason, Question string
}

// ReviewVersion is a version of a manuscript with what a review needs: its
// newest report (nil before one is made) and the newest decision on each
// of its findings.
type ReviewVersion struct {
	Submission *Submission
	Report     []byte
	Own        []Annotation
}

// Comment is a comment an office published on a submission: a read-only
// page of the asked points at an unguessable address.
type Comment struct {
	SubmissionID string
	Title        string // the submission's title, for the office's list
	Token        string // the address's secret part
	Letter       []byte // what the page shows, as published (JSON)
	Indexable    bool   // search engines may index it (noindex otherwise)
	By           string
	PublishedAt  time.Time
}

// Deletion is what an office deleted: a submission, its reports, its
// decisions and its published comment.
type Deletion struct {
	SubmissionID, Title, ManuscriptID string
	Reports                           int
	Comment                           bool // a published comment was withdrawn with it
	By                                string
	At                                time.Time
}

// PackageBytes is a submission's package as stored, with the SHA-256 of
// its data part (hex).
type PackageBytes struct {
	Package    []byte
	DataSHA256 string
}
