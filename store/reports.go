package store

import (
	"context"
	"encoding/json"
	"time"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
)

// Claim marks a submission running for one more attempt and returns its
// package and data. A submission deleted meanwhile, or one that already
// ended (a job run again after the transaction that ended it committed),
// is not found: the job has nothing left to do.
func (db *DB) Claim(ctx context.Context, id string) (pkg, data []byte, err error) {
	err = db.Pool.QueryRow(ctx, `UPDATE submissions SET status = 'running', attempts = attempts + 1, updated_at = $2,
		`+clearProgress+` WHERE id = $1 AND status IN ('queued', 'running') RETURNING package, data`, id, db.now()).
		Scan(&pkg, &data)
	return pkg, data, dbError(err, "submission")
}

// SaveReport stores a report and marks the submission done, queueing its
// webhook delivery, in one transaction.
func (db *DB) SaveReport(ctx context.Context, id string, rep *checks.Report, took time.Duration) error {
	return db.finishWith(ctx, id, rep, took, func(pgx.Tx) error { return nil })
}

// finishWith is SaveReport with more work in its transaction: the worker
// completes the job there, so that the report, its webhook delivery and
// the job's completion commit together or not at all.
func (db *DB) finishWith(ctx context.Context, id string, rep *checks.Report, took time.Duration,
	also func(pgx.Tx) error) error {
	b, err := json.Marshal(rep)
	if err != nil {
		return err
	}
	err = pgx.BeginTxFunc(ctx, db.Pool, pgx.TxOptions{}, func(tx pgx.Tx) error {
		if err := db.saveReport(ctx, tx, id, rep, b, took); err != nil {
			return err
		}
		return also(tx)
	})
	return dbError(err, "report")
}

func (db *DB) saveReport(ctx context.Context, tx pgx.Tx, id string, rep *checks.Report, b []byte,
	took time.Duration) error {
	now := db.now()
	if _, err := tx.Exec(ctx, `INSERT INTO reports (submission_id, report, score, band, tool_version,
		duration_ms, created_at) VALUES ($1, $2, $3, $4, $5, $6, $7)`,
		id, string(b), rep.Score, rep.Band, rep.ToolVersion, took.Milliseconds(), now); err != nil {
		return err
	}
	_, err := tx.Exec(ctx, `UPDATE submissions SET status = 'done', error = '', updated_at = $2, `+clearProgress+`,
		latest_score = $3, latest_band = $4, report_count = report_count + 1 WHERE id = $1`, id, now, rep.Score, rep.Band)
	if err != nil {
		return err
	}
	return db.notify(ctx, tx, id)
}

// MarkFailed records that screening a submission failed for good, with
// the reason the client will see.
func (db *DB) MarkFailed(ctx context.Context, id, reason string) error {
	return db.fail(ctx, id, reason, `status <> 'failed'`)
}

// fail marks a submission failed where cond holds, and notifies its
// office's webhook, in one transaction.
func (db *DB) fail(ctx context.Context, id, reason, cond string) error {
	err := pgx.BeginTxFunc(ctx, db.Pool, pgx.TxOptions{}, func(tx pgx.Tx) error {
		tag, err := tx.Exec(
			ctx,
			`UPDATE submissions SET status = 'failed', error = $2, updated_at = $3, `+clearProgress+`
			WHERE id = $1 AND `+cond,
			id,
			reason,
			db.now(),
		)
		if err != nil || tag.RowsAffected() == 0 {
			return err
		}
		return db.notify(ctx, tx, id)
	})
	return dbError(err, "submission")
}

// NoteAttemptError records the error of an attempt that will be retried;
// the submission goes back to queued.
func (db *DB) NoteAttemptError(ctx context.Context, id, reason string) error {
	_, err := db.Pool.Exec(
		ctx,
		`UPDATE submissions SET status = 'queued', error = $2, updated_at = $3, `+clearProgress+`
		WHERE id = $1 AND status = 'running'`,
		id,
		reason,
		db.now(),
	)
	return dbError(err, "submission")
}

// latestReportSQL reads, in one statement, whether the scope may see the
// submission, who may (its office and sender), and its newest report's id
// and bytes; the bytes are not read when the id is the one the caller
// holds ($5).
const latestReportSQL = `SELECT s.office_id, s.submitter_key_id, r.id,
	CASE WHEN r.id = $5 THEN NULL ELSE r.report END
FROM submissions s LEFT JOIN LATERAL (SELECT id, report FROM reports WHERE submission_id = s.id
	ORDER BY id DESC LIMIT 1) r ON true
WHERE` + scopeSQL + ` AND s.id = $4`

// LatestReport returns the newest report of a submission the scope may
// see, its JSON as stored; the JSON is nil when the report's id is have
// (a client that holds it needs only to hear that it is still current).
// After CacheReads it answers from memory what it has read before
// (readCache).
func (db *DB) LatestReport(ctx context.Context, id string, sc service.Scope, have int64) (
	*service.StoredReport, error) {
	if !uuidRE.MatchString(id) {
		return nil, service.Errorf(service.ENotFound, "submission not found")
	}
	if r, ok, err := db.cachedReport(id, sc, have); ok {
		return r, err
	}
	gen, keep := db.cache.generation()
	read := have
	if keep {
		read = 0 // read the bytes, to keep them
	}
	e, err := db.latestReport(ctx, id, sc, read)
	if err != nil {
		return nil, err
	}
	if keep {
		db.cache.putReport(id, e, gen, db.now())
	}
	if e.report.ID == have {
		return &service.StoredReport{ID: have}, nil
	}
	return &e.report, nil
}

func (db *DB) latestReport(ctx context.Context, id string, sc service.Scope, have int64) (reportEntry, error) {
	var e reportEntry
	var rid *int64
	err := db.Pool.QueryRow(ctx, latestReportSQL, sc.OfficeID, sc.Editor, sc.KeyID, id, have).
		Scan(&e.officeID, &e.senderKeyID, &rid, &e.report.JSON)
	if err != nil {
		return e, dbError(err, "submission")
	}
	if rid == nil {
		return e, service.Errorf(service.ENotFound, "no report yet: the submission has not been screened")
	}
	e.report.ID = *rid
	return e, nil
}
