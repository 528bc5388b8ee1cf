package service

import "time"

// Roles of an API key.
const (
	RoleEditor    = "editor"    // sees every submission of its office
	RoleSubmitter = "submitter" // sees its own submissions
)

// Office is an editorial office: the owner of keys and submissions.
type Office struct {
	ID        int64
	Name      string
	CreatedAt time.Time
}

// Key is an API key, without its token. Label says who holds it.
type Key struct {
	ID         int64
	OfficeID   int64
	OfficeName string
	Role       string
	Label      string
	CreatedAt  time.Time
	LastUsedAt *time.Time
	RevokedAt  *time.Time
}

// Scope is what a key may see.
func (k *Key) Scope() Scope {
	return Scope{OfficeID: k.OfficeID, KeyID: k.ID, Editor: k.Role == RoleEditor}
}

// Scope limits queries to what one key may see: its office's submissions
// for an editor, its own for a submitter.
type Scope struct {
	OfficeID int64
	KeyID    int64
	Editor   bool
}

// NewKey is what a store needs to make a key: an existing office by name,
// a role and a label.
type NewKey struct {
	Office string
	Role   string
	Label  string
}
