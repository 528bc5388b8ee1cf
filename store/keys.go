package store

import (
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/checks"
)

// Roles of an API key.
const (
	RoleEditor    = "editor"    // sees every submission of its office
	RoleSubmitter = "submitter" // sees its own submissions
)

// tokenPrefix starts every token, so that a leaked one is easy to spot.
const tokenPrefix = "pv_"

// Key is an API key, without its token.
type Key struct {
	ID         int64
	OfficeID   int64
	OfficeName string
	Role       string
	CreatedAt  time.Time
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

func hashToken(token string) []byte {
	sum := sha256.Sum256([]byte(token))
	return sum[:]
}

// CreateKey makes a key for the office (creating the office if it is new)
// and returns the token, which is stored only as its hash.
func (db *DB) CreateKey(ctx context.Context, office, role string) (string, *Key, error) {
	office = strings.TrimSpace(office)
	if office == "" {
		return "", nil, checks.Errorf(checks.EInvalid, "the office needs a name")
	}
	if role != RoleEditor && role != RoleSubmitter {
		return "", nil, checks.Errorf(checks.EInvalid, "role must be editor or submitter, not %q", role)
	}
	raw := make([]byte, 32)
	if _, err := rand.Read(raw); err != nil {
		return "", nil, err
	}
	token := tokenPrefix + base64.RawURLEncoding.EncodeToString(raw)
	k := &Key{OfficeName: office, Role: role, CreatedAt: db.now()}
	err := pgx.BeginTxFunc(ctx, db.Pool, pgx.TxOptions{}, func(tx pgx.Tx) error {
		if err := tx.QueryRow(ctx, `
			INSERT INTO offices (name, created_at) VALUES ($1, $2)
			ON CONFLICT (name) DO UPDATE SET name = EXCLUDED.name
			RETURNING id`, office, k.CreatedAt).Scan(&k.OfficeID); err != nil {
			return err
		}
		return tx.QueryRow(ctx, `
			INSERT INTO api_keys (office_id, role, token_sha256, created_at) VALUES ($1, $2, $3, $4)
			RETURNING id`, k.OfficeID, role, hashToken(token), k.CreatedAt).Scan(&k.ID)
	})
	if err != nil {
		return "", nil, dbError(err, "key")
	}
	return token, k, nil
}

// KeyByToken finds the live key with this token.
func (db *DB) KeyByToken(ctx context.Context, token string) (*Key, error) {
	k := &Key{}
	err := db.Pool.QueryRow(ctx, `
		SELECT k.id, k.office_id, o.name, k.role, k.created_at
		FROM api_keys k JOIN offices o ON o.id = k.office_id
		WHERE k.token_sha256 = $1 AND k.revoked_at IS NULL`, hashToken(token)).
		Scan(&k.ID, &k.OfficeID, &k.OfficeName, &k.Role, &k.CreatedAt)
	if err != nil {
		return nil, dbError(err, "key")
	}
	return k, nil
}
