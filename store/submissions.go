package store

import (
	"bufio"
	"context"
	"encoding/base64"
	"errors"
	"fmt"
	"io"
	"regexp"
	"strconv"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/api/service"
)

var uuidRE = regexp.MustCompile(`^[0-9a-fA-F]{8}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{12}$`)

const submissionColumns = `s.id, s.office_id, s.submitter_key_id, sk.label, s.manuscript_id, s.title, s.package_sha256,
	s.status, s.error, s.attempts, s.latest_score, s.latest_band, s.report_count, s.created_at, s.updated_at,
	s.progress_stage, s.progress_done, s.progress_total, s.progress_at`

// submissionFrom joins the key that sent each submission, for its label.
const submissionFrom = ` FROM submissions s JOIN api_keys sk ON sk.id = s.submitter_key_id`

func scanSubmission(row pgx.Row) (*service.Submission, error) {
	s := &service.Submission{}
	var stage *string
	var done, total *int
	var at *time.Time
	err := row.Scan(&s.ID, &s.OfficeID, &s.SubmitterKeyID, &s.SubmittedBy, &s.ManuscriptID, &s.Title, &s.PackageSHA256,
		&s.Status, &s.Error, &s.Attempts, &s.Score, &s.Band, &s.Reports, &s.CreatedAt, &s.UpdatedAt,
		&stage, &done, &total, &at)
	if err == nil && stage != nil && done != nil && total != nil && at != nil && s.Status == service.StatusRunning {
		s.Progress = &service.Progress{Stage: *stage, Done: *done, Total: *total, UpdatedAt: at.UTC()}
	}
	return s, err
}

// SetProgress records how far a running screening is; it does nothing
// once the submission is no longer running.
func (db *DB) SetProgress(ctx context.Context, id, stage string, done, total int) error {
	_, err := db.Pool.Exec(ctx, `UPDATE submissions SET progress_stage = $2, progress_done = $3, progress_total = $4,
		progress_at = $5 WHERE id = $1 AND status = 'running'`, id, stage, done, total, db.now())
	return dbError(err, "submission")
}

// clearProgress is the SET clause that forgets a screening's progress,
// for the statements that end an attempt.
const clearProgress = `progress_stage = NULL, progress_done = NULL, progress_total = NULL, progress_at = NULL`

// CreateSubmission stores a submission and queues its screening in one
// transaction. With an idempotency key already used by the same API key it
// returns the earlier submission and replayed = true, or a conflict when
// the package differs.
func (db *DB) CreateSubmission(ctx context.Context, n service.NewSubmission) (
	sub *service.Submission, replayed bool, err error) {
	err = pgx.BeginTxFunc(ctx, db.Pool, pgx.TxOptions{}, func(tx pgx.Tx) error {
		var idem *string
		if n.IdempotencyKey != "" {
			idem = &n.IdempotencyKey
		}
		now := db.now()
		lo, err := streamData(ctx, tx, n)
		if err != nil {
			return err
		}
		var id string
		err = tx.QueryRow(ctx, `
			INSERT INTO submissions (id, office_id, submitter_key_id, manuscript_id, title, package, data,
				package_sha256, status, idempotency_key, created_at, updated_at, cells)
			VALUES (gen_random_uuid(), $1, $2, $3, $4, $5, COALESCE($6, lo_get($10)), $7, 'queued', $8, $9, $9, $11)
			ON CONFLICT (submitter_key_id, idempotency_key) DO NOTHING
			RETURNING id`, n.Key.OfficeID, n.Key.ID, n.ManuscriptID, n.Title, n.Package, n.Data,
			n.PackageSHA256, idem, now, lo, n.Cells).Scan(&id)
		if lo != nil && (err == nil || errors.Is(err, pgx.ErrNoRows)) {
			if _, uerr := tx.Exec(ctx, `SELECT lo_unlink($1)`, *lo); uerr != nil {
				return fmt.Errorf("drop the upload's large object: %w", uerr)
			}
		}
		if errors.Is(err, pgx.ErrNoRows) {
			replayed = true
			sub, err = scanSubmission(tx.QueryRow(ctx, `SELECT `+submissionColumns+submissionFrom+`
				WHERE s.submitter_key_id = $1 AND s.idempotency_key = $2`, n.Key.ID, n.IdempotencyKey))
			if err == nil && sub.PackageSHA256 != n.PackageSHA256 {
				return service.Errorf(service.EConflict,
					"the Idempotency-Key %q was used for a different package", n.IdempotencyKey)
			}
			return err
		}
		if err != nil {
			return err
		}
		if _, err := db.queue.InsertTx(ctx, tx, ScreenArgs{SubmissionID: id, Cells: n.Cells}, nil); err != nil {
			return fmt.Errorf("queue: %w", err)
		}
		sub, err = scanSubmission(tx.QueryRow(ctx, `SELECT `+submissionColumns+submissionFrom+` WHERE s.id = $1`, id))
		return err
	})
	if err != nil {
		return nil, false, dbError(err, "submission")
	}
	return sub, replayed, nil
}

// streamData writes a streamed upload (n.DataReader) into a large object of
// the transaction, 1 MiB a call, and returns its OID, which the insert reads
// back into the data column and then drops: the bytes go to PostgreSQL
// without being held whole by the caller. Nil when there is no stream.
func streamData(ctx context.Context, tx pgx.Tx, n service.NewSubmission) (*uint32, error) {
	if n.DataReader == nil {
		return nil, nil
	}
	los := tx.LargeObjects()
	oid, err := los.Create(ctx, 0)
	if err != nil {
		return nil, fmt.Errorf("upload: %w", err)
	}
	obj, err := los.Open(ctx, oid, pgx.LargeObjectModeWrite)
	if err != nil {
		return nil, fmt.Errorf("upload: %w", err)
	}
	w := bufio.NewWriterSize(obj, 1<<20)
	written, err := io.Copy(w, n.DataReader)
	if err == nil {
		err = w.Flush()
	}
	if err == nil && written != n.DataSize {
		err = fmt.Errorf("%d bytes streamed of %d", written, n.DataSize)
	}
	if err == nil {
		err = obj.Close()
	}
	if err != nil {
		return nil, fmt.Errorf("upload: %w", err)
	}
	return &oid, nil
}

// scopeSQL limits a query on submissions s to a scope; args $1..$3.
const scopeSQL = ` s.office_id = $1 AND ($2 OR s.submitter_key_id = $3)`

// Submission returns one submission that the scope may see.
func (db *DB) Submission(ctx context.Context, id string, sc service.Scope) (*service.Submission, error) {
	if !uuidRE.MatchString(id) {
		return nil, service.Errorf(service.ENotFound, "submission not found")
	}
	s, err := scanSubmission(db.Pool.QueryRow(ctx, `SELECT `+submissionColumns+submissionFrom+`
		WHERE`+scopeSQL+` AND s.id = $4`, sc.OfficeID, sc.Editor, sc.KeyID, id))
	return s, dbError(err, "submission")
}

// Submissions lists submissions, newest first, and the cursor of the next
// page ("" on the last).
func (db *DB) Submissions(ctx context.Context, f service.Filter) ([]*service.Submission, string, error) {
	limit := f.Limit
	if limit <= 0 || limit > service.MaxPage {
		limit = 50
	}
	q := `SELECT ` + submissionColumns + submissionFrom + ` WHERE` + scopeSQL
	args := []any{f.Scope.OfficeID, f.Scope.Editor, f.Scope.KeyID}
	add := func(cond string, v any) {
		args = append(args, v)
		q += fmt.Sprintf(" AND "+cond, len(args))
	}
	if f.ManuscriptID != "" {
		add("s.manuscript_id = $%d", f.ManuscriptID)
	}
	if f.Status != "" {
		add("s.status = $%d", f.Status)
	}
	if f.Band != "" {
		add("s.latest_band = $%d", f.Band)
	}
	if f.Cursor != "" {
		at, id, err := decodeCursor(f.Cursor)
		if err != nil {
			return nil, "", err
		}
		args = append(args, at, id)
		q += fmt.Sprintf(" AND (s.created_at, s.id) < ($%d, $%d)", len(args)-1, len(args))
	}
	q += fmt.Sprintf(" ORDER BY s.created_at DESC, s.id DESC LIMIT %d", limit+1)
	rows, err := db.Pool.Query(ctx, q, args...)
	if err != nil {
		return nil, "", dbError(err, "submissions")
	}
	defer rows.Close()
	var out []*service.Submission
	for rows.Next() {
		s, err := scanSubmission(rows)
		if err != nil {
			return nil, "", dbError(err, "submissions")
		}
		out = append(out, s)
	}
	if err := rows.Err(); err != nil {
		return nil, "", dbError(err, "submissions")
	}
	next := ""
	if len(out) > limit {
		out = out[:limit]
		last := out[limit-1]
		next = encodeCursor(last.CreatedAt, last.ID)
	}
	return out, next, nil
}

func encodeCursor(at time.Time, id string) string {
	return base64.RawURLEncoding.EncodeToString([]byte(strconv.FormatInt(at.UnixMicro(), 10) + "/" + id))
}

// maxCursorMicros is the end of the year 9999: a cursor past it was not
// given out by this server (and PostgreSQL could not compare it).
var maxCursorMicros = time.Date(9999, 12, 31, 23, 59, 59, 0, time.UTC).UnixMicro()

func decodeCursor(c string) (time.Time, string, error) {
	b, err := base64.RawURLEncoding.DecodeString(c)
	at, id, ok := strings.Cut(string(b), "/")
	micros, perr := strconv.ParseInt(at, 10, 64)
	if err != nil || !ok || perr != nil || !uuidRE.MatchString(id) || micros < 0 || micros > maxCursorMicros {
		return time.Time{}, "", service.Errorf(service.EInvalid, "the cursor is not one this server gave out")
	}
	return time.UnixMicro(micros).UTC(), id, nil
}

// DeleteSubmission deletes a submission and its reports.
func (db *DB) DeleteSubmission(ctx context.Context, id string, sc service.Scope) error {
	if !uuidRE.MatchString(id) {
		return service.Errorf(service.ENotFound, "submission not found")
	}
	tag, err := db.Pool.Exec(ctx, deleteSQL, sc.OfficeID, sc.Editor, sc.KeyID, id, db.now())
	if err != nil {
		return dbError(err, "submission")
	}
	if tag.RowsAffected() == 0 {
		return service.Errorf(service.ENotFound, "submission not found")
	}
	return nil
}

// deleteSQL deletes a submission (its reports, decisions and published
// comment go with it) and, in the same statement, keeps what was deleted
// and by which key (deleted_submissions, for the dashboard).
const deleteSQL = `WITH gone AS (DELETE FROM submissions s WHERE` + scopeSQL + ` AND s.id = $4
	RETURNING s.id, s.office_id, s.title, s.manuscript_id, s.report_count,
		EXISTS (SELECT 1 FROM published_comments c WHERE c.submission_id = s.id) AS had_comment)
INSERT INTO deleted_submissions (submission_id, office_id, title, manuscript_id, reports, had_comment, key_id,
	key_label, deleted_at)
SELECT g.id, g.office_id, g.title, g.manuscript_id, g.report_count, g.had_comment, $3,
	coalesce((SELECT label FROM api_keys WHERE id = $3), ''), $5 FROM gone g
ON CONFLICT (submission_id) DO NOTHING`

// Rerun queues a finished submission again (after a pipeline upgrade); its
// earlier reports are kept.
func (db *DB) Rerun(ctx context.Context, id string, sc service.Scope) (*service.Submission, error) {
	if _, err := db.Submission(ctx, id, sc); err != nil {
		return nil, err
	}
	if _, err := db.Reconcile(ctx, id); err != nil { // a job the queue gave up on ends failed first
		return nil, err
	}
	var sub *service.Submission
	err := pgx.BeginTxFunc(ctx, db.Pool, pgx.TxOptions{}, func(tx pgx.Tx) error {
		var cells int64
		err := tx.QueryRow(ctx, `UPDATE submissions SET status = 'queued', error = '', updated_at = $2
			WHERE id = $1 AND status IN ('done', 'failed') RETURNING cells`, id, db.now()).Scan(&cells)
		if errors.Is(err, pgx.ErrNoRows) {
			return service.Errorf(service.EConflict, "the submission is still queued or running")
		}
		if err != nil {
			return err
		}
		if _, err := db.queue.InsertTx(ctx, tx, ScreenArgs{SubmissionID: id, Cells: cells}, nil); err != nil {
			return fmt.Errorf("queue: %w", err)
		}
		sub, err = scanSubmission(tx.QueryRow(ctx, `SELECT `+submissionColumns+submissionFrom+` WHERE s.id = $1`, id))
		return err
	})
	return sub, dbError(err, "submission")
}
