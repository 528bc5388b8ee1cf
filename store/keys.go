package store

import (
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
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

// CreateKey makes a key for the office (creating the office if it is new)
// and returns the token, which is stored only as its hash.
func (db *DB) CreateKey(ctx context.Context, office, role string) (string, *service.Key, error) {
	office = strings.TrimSpace(office)
	if office == "" {
		return "", nil, service.Errorf(service.EInvalid, "the office needs a name")
	}
	if role != service.RoleEditor && role != service.RoleSubmitter {
		return "", nil, service.Errorf(service.EInvalid, "role must be editor or submitter, not %q", role)
	}
	raw := make([]byte, 32)
	if _, err := rand.Read(raw); err != nil {
		return "", nil, err
	}
	token := tokenPrefix + base64.RawURLEncoding.EncodeToString(raw)
	k := &service.Key{OfficeName: office, Role: role, CreatedAt: db.now()}
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
func (db *DB) KeyByToken(ctx context.Context, token string) (*service.Key, error) {
	k := &service.Key{}
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
