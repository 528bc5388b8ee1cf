package store

import (
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
	"errors"
	"strings"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/api/service"
)

// tokenPrefix starts every token, so that a leaked one is easy to spot.
const tokenPrefix = "pv_"

func hashToken(token string) []byte {
	sum := sha256.Sum256([]byte(token))
	return sum[:]
}

// CreateOffice makes an editorial office; a name already taken is a
// conflict.
func (db *DB) CreateOffice(ctx context.Context, name string) (*service.Office, error) {
	o := &service.Office{Name: strings.TrimSpace(name), CreatedAt: db.now()}
	if o.Name == "" {
		return nil, service.Errorf(service.EInvalid, "the office needs a name")
	}
	err := db.Pool.QueryRow(ctx, `INSERT INTO offices (name, created_at) VALUES ($1, $2) RETURNING id`,
		o.Name, o.CreatedAt).Scan(&o.ID)
	return o, dbError(err, "office "+o.Name)
}

// Offices lists the offices by name.
func (db *DB) Offices(ctx context.Context) ([]*service.Office, error) {
	rows, err := db.Pool.Query(ctx, `SELECT id, name, created_at FROM offices ORDER BY name`)
	if err != nil {
		return nil, dbError(err, "offices")
	}
	out, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (*service.Office, error) {
		o := &service.Office{}
		return o, r.Scan(&o.ID, &o.Name, &o.CreatedAt)
	})
	return out, dbError(err, "offices")
}

// CreateKey makes a key for an existing office and returns the token,
// which is stored only as its hash. An unknown office is not found: a
// typo never makes a second office.
func (db *DB) CreateKey(ctx context.Context, n service.NewKey) (string, *service.Key, error) {
	if n.Role != service.RoleEditor && n.Role != service.RoleSubmitter {
		return "", nil, service.Errorf(service.EInvalid, "role must be editor or submitter, not %q", n.Role)
	}
	raw := make([]byte, 32)
	if _, err := rand.Read(raw); err != nil {
		return "", nil, err
	}
	token := tokenPrefix + base64.RawURLEncoding.EncodeToString(raw)
	k := &service.Key{OfficeName: strings.TrimSpace(n.Office), Role: n.Role, Label: strings.TrimSpace(n.Label),
		CreatedAt: db.now()}
	err := db.Pool.QueryRow(ctx, `
		INSERT INTO api_keys (office_id, role, label, token_sha256, created_at)
		SELECT id, $2, $3, $4, $5 FROM offices WHERE name = $1
		RETURNING id, office_id`, k.OfficeName, k.Role, k.Label, hashToken(token), k.CreatedAt).Scan(&k.ID, &k.OfficeID)
	if errors.Is(err, pgx.ErrNoRows) {
		return "", nil, service.Errorf(service.ENotFound,
			"there is no office named %q; create it first with pathvet offices create", k.OfficeName)
	}
	if err != nil {
		return "", nil, dbError(err, "key")
	}
	return token, k, nil
}

const keyColumns = `k.id, k.office_id, o.name, k.role, k.label, k.created_at, k.last_used_at, k.revoked_at`

func scanKey(row pgx.Row) (*service.Key, error) {
	k := &service.Key{}
	return k, row.Scan(&k.ID, &k.OfficeID, &k.OfficeName, &k.Role, &k.Label, &k.CreatedAt, &k.LastUsedAt, &k.RevokedAt)
}

// KeyByToken finds the live key with this token and notes its use (at
// most once a minute, so that reads do not each write); after
// CacheReads, from memory when it was found in the last CacheTTL and no
// key has changed since (readCache).
func (db *DB) KeyByToken(ctx context.Context, token string) (*service.Key, error) {
	return db.cachedKey(ctx, token, db.lookupKey)
}

func (db *DB) lookupKey(ctx context.Context, token string) (*service.Key, error) {
	k, err := scanKey(db.Pool.QueryRow(ctx, `
		WITH used AS (
			UPDATE api_keys SET last_used_at = $2
			WHERE token_sha256 = $1 AND revoked_at IS NULL
				AND (last_used_at IS NULL OR last_used_at < $2::timestamptz - interval '1 minute'))
		SELECT `+keyColumns+` FROM api_keys k JOIN offices o ON o.id = k.office_id
		WHERE k.token_sha256 = $1 AND k.revoked_at IS NULL`, hashToken(token), db.now()))
	if err != nil {
		return nil, dbError(err, "key")
	}
	return k, nil
}

// Keys lists the keys of one office (every office for ""), live and
// revoked, oldest first; never their tokens.
func (db *DB) Keys(ctx context.Context, office string) ([]*service.Key, error) {
	rows, err := db.Pool.Query(ctx, `SELECT `+keyColumns+` FROM api_keys k JOIN offices o ON o.id = k.office_id
		WHERE $1 = '' OR o.name = $1 ORDER BY k.id`, office)
	if err != nil {
		return nil, dbError(err, "keys")
	}
	out, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (*service.Key, error) { return scanKey(r) })
	return out, dbError(err, "keys")
}

// RevokeKey revokes a live key: its token stops working at once (a
// server's read cache forgets it when the announcement arrives).
func (db *DB) RevokeKey(ctx context.Context, id int64) error {
	tag, err := db.Pool.Exec(
		ctx,
		`UPDATE api_keys SET revoked_at = $2 WHERE id = $1 AND revoked_at IS NULL`,
		id,
		db.now(),
	)
	if err != nil {
		return dbError(err, "key")
	}
	if tag.RowsAffected() == 0 {
		return service.Errorf(service.ENotFound, "no live key with id %d", id)
	}
	return nil
}
