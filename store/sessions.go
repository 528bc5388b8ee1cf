package store

import (
	"context"
	"crypto/rand"
	"encoding/base64"
	"math"
	"time"

	"github.com/pathvet/pathvet/api/service"
)

// OpenSession opens a web session for key that lasts ttl and returns its
// id, which is stored only as its hash; sessions expired for a day are
// deleted on the way.
func (db *DB) OpenSession(ctx context.Context, k *service.Key, ttl time.Duration) (string, error) {
	raw := make([]byte, 32)
	if _, err := rand.Read(raw); err != nil {
		return "", err
	}
	id := base64.RawURLEncoding.EncodeToString(raw)
	now := db.now()
	if _, err := db.Pool.Exec(ctx, `DELETE FROM web_sessions WHERE expires_at < $1`, now.Add(-24*time.Hour)); err != nil {
		return "", dbError(err, "session")
	}
	_, err := db.Pool.Exec(ctx, `INSERT INTO web_sessions (id_sha256, key_id, created_at, expires_at)
		VALUES ($1, $2, $3, $4)`, hashToken(id), k.ID, now, now.Add(ttl))
	return id, dbError(err, "session")
}

// SessionKey returns the key of a live session: not ended, not expired,
// its key not revoked; else a not-found error.
func (db *DB) SessionKey(ctx context.Context, id string) (*service.Key, error) {
	k, err := scanKey(db.Pool.QueryRow(ctx, `
		SELECT `+keyColumns+`
		FROM web_sessions w JOIN api_keys k ON k.id = w.key_id JOIN offices o ON o.id = k.office_id
		WHERE w.id_sha256 = $1 AND w.ended_at IS NULL AND w.expires_at > $2 AND k.revoked_at IS NULL`,
		hashToken(id), db.now()))
	return k, dbError(err, "session")
}

// EndSession ends a session; ending an unknown or ended one is no error.
func (db *DB) EndSession(ctx context.Context, id string) error {
	_, err := db.Pool.Exec(ctx, `UPDATE web_sessions SET ended_at = $2 WHERE id_sha256 = $1 AND ended_at IS NULL`,
		hashToken(id), db.now())
	return dbError(err, "session")
}

// Sign-in slowing: after FreeSignInFailures failures from one address
// within SignInWindow, each further attempt waits twice as long as the
// one before, from one second up to MaxSignInWait. Only a quiet
// SignInWindow forgets the failures: a success does not (it may be the
// guesser's own key).
const (
	FreeSignInFailures = 3
	SignInWindow       = 15 * time.Minute
	MaxSignInWait      = 5 * time.Minute
)

// SignInWait is how long the address must still wait before its next
// sign-in attempt is looked at (0: at once).
func (db *DB) SignInWait(ctx context.Context, address string) (time.Duration, error) {
	var failures int
	var last time.Time
	err := db.Pool.QueryRow(ctx, `SELECT failures, last_at FROM web_sign_in_failures WHERE address = $1`, address).
		Scan(&failures, &last)
	if service.ErrorCode(dbError(err, "failures")) == service.ENotFound {
		return 0, nil
	}
	if err != nil {
		return 0, dbError(err, "failures")
	}
	now := db.now()
	if now.Sub(last) > SignInWindow {
		return 0, nil
	}
	return max(last.Add(signInBackoff(failures)).Sub(now), 0), nil
}

// signInBackoff is the wait after n failures.
func signInBackoff(n int) time.Duration {
	if n <= FreeSignInFailures {
		return 0
	}
	d := time.Duration(math.Pow(2, float64(min(n-FreeSignInFailures-1, 20)))) * time.Second
	return min(d, MaxSignInWait)
}

// NoteSignInFailure counts a failed sign-in from the address; a failure
// after a quiet SignInWindow starts the count again.
func (db *DB) NoteSignInFailure(ctx context.Context, address string) error {
	now := db.now()
	_, err := db.Pool.Exec(ctx, `
		INSERT INTO web_sign_in_failures AS f (address, failures, last_at) VALUES ($1, 1, $2)
		ON CONFLICT (address) DO UPDATE SET
			failures = CASE WHEN f.last_at < $2 - $3::interval THEN 1 ELSE f.failures + 1 END, last_at = $2`,
		address, now, SignInWindow.String())
	return dbError(err, "failures")
}
