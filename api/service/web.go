package service

import "time"

// ReportEntry is one stored report of a submission, for the workspace's
// report history.
type ReportEntry struct {
	ID          int64
	CreatedAt   time.Time
	Score       int
	Band        string
	ToolVersion string
	Report      []byte
}

// Version is a submission's place among the versions of its manuscript:
// the Nth of Of, oldest first.
type Version struct{ N, Of int }
