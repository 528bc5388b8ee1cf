package store

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net/http"
	"strconv"
	"time"

	"github.com/riverqueue/river"

	"github.com/pathvet/pathvet/api/service"
)

// DeliverArgs is the job that POSTs one webhook delivery.
type DeliverArgs struct {
	DeliveryID int64 `json:"delivery_id"`
}

// Kind names the job kind in the queue.
func (DeliverArgs) Kind() string { return "deliver_webhook" }

// InsertOpts: 8 attempts with River's backoff (attempt⁴ seconds, about
// 1.3 hours in all) before the delivery counts as failed.
func (DeliverArgs) InsertOpts() river.InsertOpts { return river.InsertOpts{MaxAttempts: 8} }

type deliverWorker struct {
	river.WorkerDefaults[DeliverArgs]
	db     *DB
	client *http.Client
	logger *slog.Logger
}

func (w *deliverWorker) Timeout(*river.Job[DeliverArgs]) time.Duration { return 30 * time.Second }

// Work POSTs the delivery's payload, signed, and records the outcome; a
// non-2xx answer or a failed request is retried until the last attempt,
// but an address the egress refuses fails the delivery at once.
func (w *deliverWorker) Work(ctx context.Context, job *river.Job[DeliverArgs]) error {
	id := job.Args.DeliveryID
	var target, secret string
	var payload []byte
	err := w.db.Pool.QueryRow(ctx, `SELECT w.url, w.secret, d.payload FROM webhook_deliveries d
		JOIN webhooks w ON w.office_id = d.office_id WHERE d.id = $1 AND d.status = 'pending'`, id).
		Scan(&target, &secret, &payload)
	if service.ErrorCode(dbError(err, "delivery")) == service.ENotFound {
		return nil // the webhook was removed, or the delivery already ended
	}
	if err != nil {
		return err
	}
	code, err := w.post(ctx, target, secret, id, payload)
	var refused *service.RefusedAddressError
	final := job.Attempt >= job.MaxAttempts || errors.As(err, &refused)
	if err != nil {
		w.logger.Warn("webhook delivery failed", "delivery_id", id, "attempt", job.Attempt, "error", err)
	}
	if rerr := w.db.recordDelivery(context.WithoutCancel(ctx), id, code, err, final); rerr != nil {
		return rerr
	}
	if err != nil && final {
		return river.JobCancel(err)
	}
	return err
}

// post sends one request; a status outside 2xx is an error.
func (w *deliverWorker) post(ctx context.Context, target, secret string, id int64, payload []byte) (int, error) {
	req, err := http.NewRequestWithContext(ctx, http.MethodPost, target, bytes.NewReader(payload))
	if err != nil {
		return 0, err
	}
	ts, sig := service.SignWebhook(secret, w.db.now(), id, payload)
	req.Header.Set("Content-Type", "application/json")
	req.Header.Set(service.HeaderWebhookTimestamp, ts)
	req.Header.Set(service.HeaderWebhookSignature, sig)
	req.Header.Set(service.HeaderWebhookDelivery, strconv.FormatInt(id, 10))
	resp, err := w.client.Do(req)
	if err != nil {
		return 0, err
	}
	defer resp.Body.Close()
	_, _ = io.Copy(io.Discard, io.LimitReader(resp.Body, 64<<10))
	if resp.StatusCode < 200 || resp.StatusCode > 299 {
		return resp.StatusCode, &statusError{resp.StatusCode}
	}
	return resp.StatusCode, nil
}

// statusError is a receiver's answer outside 2xx.
type statusError struct{ code int }

func (e *statusError) Error() string { return fmt.Sprintf("the receiver answered %d", e.code) }

// recordDelivery notes an attempt: delivered on success, failed after
// the last attempt, still pending otherwise. The error is kept as its
// class (deliveryFailure), never its text, which would show an editor
// what the workers' network holds.
func (db *DB) recordDelivery(ctx context.Context, id int64, code int, sendErr error, final bool) error {
	status, msg := service.DeliveryDelivered, ""
	if sendErr != nil {
		status, msg = service.DeliveryPending, deliveryFailure(sendErr)
		if final {
			status = service.DeliveryFailed
		}
	}
	var codeArg *int
	if code != 0 {
		codeArg = &code
	}
	_, err := db.Pool.Exec(ctx, `UPDATE webhook_deliveries SET status = $2, attempts = attempts + 1,
		last_status_code = $3, last_error = $4,
		finished_at = CASE WHEN $2 = 'pending' THEN NULL ELSE $5::timestamptz END WHERE id = $1`,
		id, status, codeArg, msg, db.now())
	return dbError(err, "delivery")
}

// webhookClient sends deliveries through the egress's dialer: no proxy
// (it would dial an address not checked), a short timeout, and no
// redirects (a receiver answers itself).
func webhookClient(e *service.Egress) *http.Client {
	t := &http.Transport{DialContext: e.DialContext, ForceAttemptHTTP2: true, MaxIdleConns: 16,
		IdleConnTimeout: 90 * time.Second, TLSHandshakeTimeout: 10 * time.Second}
	return &http.Client{Transport: t, Timeout: 10 * time.Second, CheckRedirect: func(*http.Request, []*http.Request) error {
		return http.ErrUseLastResponse
	}}
}
