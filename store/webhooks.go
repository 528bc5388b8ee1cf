package store

import (
	"context"
	"crypto/rand"
	"encoding/base64"
	"errors"
	"fmt"
	"net/url"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/api/service"
)

// SetWebhook sets the office's webhook URL with a new secret, which it
// returns (the only time it is shown).
func (db *DB) SetWebhook(ctx context.Context, officeID int64, rawURL string) (*service.Webhook, error) {
	u, err := url.Parse(rawURL)
	if err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "" || len(rawURL) > 2000 {
		return nil, service.Errorf(service.EInvalid, service.WebhookURLRule)
	}
	raw := make([]byte, 32)
	if _, err := rand.Read(raw); err != nil {
		return nil, err
	}
	w := &service.Webhook{OfficeID: officeID, URL: rawURL, Secret: "whsec_" + base64.RawURLEncoding.EncodeToString(raw),
		CreatedAt: db.now()}
	_, err = db.Pool.Exec(ctx, `INSERT INTO webhooks (office_id, url, secret, created_at) VALUES ($1, $2, $3, $4)
		ON CONFLICT (office_id) DO UPDATE SET url = EXCLUDED.url, secret = EXCLUDED.secret, created_at = EXCLUDED.created_at`,
		w.OfficeID, w.URL, w.Secret, w.CreatedAt)
	return w, dbError(err, "webhook")
}

// Webhook returns the office's webhook, without its secret.
func (db *DB) Webhook(ctx context.Context, officeID int64) (*service.Webhook, error) {
	w := &service.Webhook{OfficeID: officeID}
	err := db.Pool.QueryRow(ctx, `SELECT url, created_at FROM webhooks WHERE office_id = $1`, officeID).
		Scan(&w.URL, &w.CreatedAt)
	return w, dbError(err, "webhook")
}

// DeleteWebhook removes the office's webhook and its deliveries.
func (db *DB) DeleteWebhook(ctx context.Context, officeID int64) error {
	tag, err := db.Pool.Exec(ctx, `DELETE FROM webhooks WHERE office_id = $1`, officeID)
	if err == nil && tag.RowsAffected() == 0 {
		return service.Errorf(service.ENotFound, "webhook not found")
	}
	return dbError(err, "webhook")
}

// Deliveries lists the office's newest webhook deliveries.
func (db *DB) Deliveries(ctx context.Context, officeID int64, limit int) ([]*service.Delivery, error) {
	rows, err := db.Pool.Query(ctx, `SELECT id, submission_id, status, attempts, last_status_code, last_error,
		created_at, finished_at FROM webhook_deliveries WHERE office_id = $1 ORDER BY id DESC LIMIT $2`,
		officeID, min(max(limit, 1), service.MaxPage))
	if err != nil {
		return nil, dbError(err, "deliveries")
	}
	out, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) (*service.Delivery, error) {
		d := &service.Delivery{}
		return d, r.Scan(&d.ID, &d.SubmissionID, &d.Status, &d.Attempts, &d.LastStatusCode, &d.LastError,
			&d.CreatedAt, &d.FinishedAt)
	})
	return out, dbError(err, "deliveries")
}

// notifySQL records a delivery of the submission's end for its office's
// webhook, if it has one; the payload is the submission as it now is.
const notifySQL = `
INSERT INTO webhook_deliveries (office_id, submission_id, payload, status, created_at)
SELECT w.office_id, s.id, convert_to(json_build_object('event', 'screening.finished', 'submission_id', s.id,
	'status', s.status, 'score', s.latest_score, 'band', s.latest_band, 'error', s.error,
	'finished_at', s.updated_at)::text, 'UTF8'), 'pending', $2
FROM submissions s JOIN webhooks w ON w.office_id = s.office_id WHERE s.id = $1
RETURNING id`

// notify queues the webhook delivery of a submission's end, in the
// transaction that ended it.
func (db *DB) notify(ctx context.Context, tx pgx.Tx, submissionID string) error {
	var id int64
	err := tx.QueryRow(ctx, notifySQL, submissionID, db.now()).Scan(&id)
	if errors.Is(err, pgx.ErrNoRows) {
		return nil // no webhook
	}
	if err != nil {
		return err
	}
	if _, err := db.queue.InsertTx(ctx, tx, DeliverArgs{DeliveryID: id}, nil); err != nil {
		return fmt.Errorf("queue delivery: %w", err)
	}
	return nil
}
