package store

import (
	"context"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
	"errors"
	"time"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/api/service"
)

// Published comments (migration 00012): the asked points of a submission
// at an address whose secret part is 32 random bytes, looked up by their
// SHA-256.

// tokenBytes is the size of a comment address's secret part (256 bits).
const tokenBytes = 32

func newToken() (string, []byte, error) {
	raw := make([]byte, tokenBytes)
	if _, err := rand.Read(raw); err != nil {
		return "", nil, err
	}
	t := base64.RawURLEncoding.EncodeToString(raw)
	sum := sha256.Sum256([]byte(t))
	return t, sum[:], nil
}

const commentColumns = `c.submission_id::text, s.title, c.token, c.letter::text, c.indexable, c.key_label,
	c.published_at`

func scanComment(row pgx.Row) (*service.Comment, error) {
	c := &service.Comment{}
	var letter string
	err := row.Scan(&c.SubmissionID, &c.Title, &c.Token, &letter, &c.Indexable, &c.By, &c.PublishedAt)
	c.Letter, c.PublishedAt = []byte(letter), c.PublishedAt.UTC()
	return c, err
}

// PublishComment publishes the comment of a submission the scope may see
// (letter, as its page will show it), made with key k, or replaces what
// an already published one shows; its address stays. created says it is
// new.
func (db *DB) PublishComment(ctx context.Context, id string, sc service.Scope, k *service.Key, letter []byte,
	indexable bool) (c *service.Comment, created bool, err error) {
	sub, err := db.Submission(ctx, id, sc)
	if err != nil {
		return nil, false, err
	}
	token, sum, err := newToken()
	if err != nil {
		return nil, false, err
	}
	err = db.Pool.QueryRow(ctx, `INSERT INTO published_comments AS c (submission_id, office_id, token,
		token_sha256, letter, indexable, key_label, published_at) VALUES ($1, $2, $3, $4, $5, $6, $7, $8)
		ON CONFLICT (submission_id) DO UPDATE SET letter = EXCLUDED.letter, indexable = EXCLUDED.indexable,
			key_label = EXCLUDED.key_label, published_at = EXCLUDED.published_at
		RETURNING c.token = $3`, sub.ID, sub.OfficeID, token, sum, string(letter), indexable, k.Label,
		db.now()).Scan(&created)
	if err != nil {
		return nil, false, dbError(err, "comment")
	}
	c, err = db.Comment(ctx, id, sc)
	return c, created, err
}

// Comment returns the published comment of a submission the scope may
// see; not found when none is published.
func (db *DB) Comment(ctx context.Context, id string, sc service.Scope) (*service.Comment, error) {
	if _, err := db.Submission(ctx, id, sc); err != nil {
		return nil, err
	}
	c, err := scanComment(db.Pool.QueryRow(ctx, `SELECT `+commentColumns+`
		FROM published_comments c JOIN submissions s ON s.id = c.submission_id WHERE c.submission_id = $1`, id))
	if errors.Is(err, pgx.ErrNoRows) {
		return nil, service.Errorf(service.ENotFound, "no comment is published for this submission")
	}
	return c, dbError(err, "comment")
}

// WithdrawComment withdraws the published comment of a submission the
// scope may see: its address answers not found from then on.
func (db *DB) WithdrawComment(ctx context.Context, id string, sc service.Scope) error {
	if _, err := db.Submission(ctx, id, sc); err != nil {
		return err
	}
	tag, err := db.Pool.Exec(ctx, `DELETE FROM published_comments WHERE submission_id = $1`, id)
	if err == nil && tag.RowsAffected() == 0 {
		return service.Errorf(service.ENotFound, "no comment is published for this submission")
	}
	return dbError(err, "comment")
}

// PublishedComment finds a published comment by its address's secret
// part, for anyone who has it; not found otherwise.
func (db *DB) PublishedComment(ctx context.Context, token string) (*service.Comment, error) {
	sum := sha256.Sum256([]byte(token))
	c, err := scanComment(db.Pool.QueryRow(ctx, `SELECT `+commentColumns+`
		FROM published_comments c JOIN submissions s ON s.id = c.submission_id WHERE c.token_sha256 = $1`, sum[:]))
	if errors.Is(err, pgx.ErrNoRows) {
		return nil, service.Errorf(service.ENotFound, "no such comment")
	}
	return c, dbError(err, "comment")
}

// Comments lists the comments an office has published, newest first, at
// most limit; an editor's scope sees the office's, a submitter's those on
// its own submissions.
func (db *DB) Comments(ctx context.Context, sc service.Scope, limit int) ([]*service.Comment, error) {
	rows, err := db.Pool.Query(ctx, `SELECT `+commentColumns+`
		FROM published_comments c JOIN submissions s ON s.id = c.submission_id
		WHERE`+scopeSQL+` ORDER BY c.published_at DESC LIMIT $4`, sc.OfficeID, sc.Editor, sc.KeyID, limit)
	if err != nil {
		return nil, dbError(err, "comments")
	}
	defer rows.Close()
	var out []*service.Comment
	for rows.Next() {
		c, err := scanComment(rows)
		if err != nil {
			return nil, dbError(err, "comments")
		}
		out = append(out, c)
	}
	return out, dbError(rows.Err(), "comments")
}

// Deletion says what was deleted as the submission id, in the scope's
// office (for a submitter key, what that key deleted).
func (db *DB) Deletion(ctx context.Context, id string, sc service.Scope) (*service.Deletion, error) {
	if !uuidRE.MatchString(id) {
		return nil, service.Errorf(service.ENotFound, "no such deletion")
	}
	d := &service.Deletion{}
	var at time.Time
	err := db.Pool.QueryRow(ctx, `SELECT submission_id::text, title, manuscript_id, reports, had_comment,
		key_label, deleted_at FROM deleted_submissions
		WHERE submission_id = $1 AND office_id = $2 AND ($3 OR key_id = $4)`, id, sc.OfficeID, sc.Editor, sc.KeyID).
		Scan(&d.SubmissionID, &d.Title, &d.ManuscriptID, &d.Reports, &d.Comment, &d.By, &at)
	d.At = at.UTC()
	return d, dbError(err, "deletion")
}
