package store

import (
	"context"
	"fmt"
	"strings"
	"time"

	"github.com/riverqueue/river"
)

// ReconcileArgs is the periodic job that fails submissions whose
// screening job the queue gave up on.
type ReconcileArgs struct{}

// Kind names the job kind in the queue.
func (ReconcileArgs) Kind() string { return "reconcile_submissions" }

// InsertOpts: one attempt; the next period tries again.
func (ReconcileArgs) InsertOpts() river.InsertOpts { return river.InsertOpts{MaxAttempts: 1} }

type reconcileWorker struct {
	river.WorkerDefaults[ReconcileArgs]
	db *DB
}

func (w *reconcileWorker) Work(ctx context.Context, _ *river.Job[ReconcileArgs]) error {
	_, err := w.db.Reconcile(ctx, "")
	return err
}

// rescueError is the error River's rescuer records on a job whose worker
// stopped while it ran (killed, out of memory, lost its host).
const rescueError = "Stuck job rescued by JobRescuer"

// reconcileSQL finds queued or running submissions whose newest screening
// job is discarded or cancelled, with the job's state, attempts, how many
// attempts ended with the worker gone, and the last error.
const reconcileSQL = `
SELECT s.id, j.state, j.attempt,
	(SELECT count(*) FROM unnest(j.errors) e WHERE e->>'error' = $1),
	coalesce(j.errors[array_length(j.errors, 1)]->>'error', '')
FROM river_job j JOIN submissions s ON s.id = (j.args->>'submission_id')::uuid
WHERE j.kind = 'screen_submission' AND j.state IN ('discarded', 'cancelled')
	AND s.status IN ('queued', 'running') AND ($2 = '' OR s.id::text = $2)
	AND NOT EXISTS (SELECT 1 FROM river_job k
		WHERE k.kind = j.kind AND k.args->>'submission_id' = j.args->>'submission_id' AND k.id > j.id)`

type stoppedJob struct {
	id, state, lastError string
	attempts, rescues    int
}

// Reconcile marks failed, with the reason, every submission (or the one
// with this id) that shows queued or running although the queue discarded
// or cancelled its job; it returns how many it marked.
func (db *DB) Reconcile(ctx context.Context, id string) (int, error) {
	jobs, err := db.stoppedJobs(ctx, id)
	if err != nil {
		return 0, err
	}
	for _, j := range jobs {
		if err := db.fail(ctx, j.id, j.reason(), `status IN ('queued', 'running')`); err != nil {
			return 0, err
		}
	}
	return len(jobs), nil
}

func (db *DB) stoppedJobs(ctx context.Context, id string) ([]stoppedJob, error) {
	rows, err := db.Pool.Query(ctx, reconcileSQL, rescueError, id)
	if err != nil {
		return nil, dbError(err, "jobs")
	}
	defer rows.Close()
	var out []stoppedJob
	for rows.Next() {
		var j stoppedJob
		if err := rows.Scan(&j.id, &j.state, &j.attempts, &j.rescues, &j.lastError); err != nil {
			return nil, dbError(err, "jobs")
		}
		out = append(out, j)
	}
	return out, dbError(rows.Err(), "jobs")
}

// reason is the failure the submission shows.
func (j stoppedJob) reason() string {
	switch {
	case j.state == "cancelled":
		return "the screening job was cancelled"
	case j.rescues > 0 && j.rescues == j.attempts:
		return fmt.Sprintf(
			"the worker stopped %s; the package may need more memory than the worker has",
			times(j.rescues),
		)
	case j.rescues > 0:
		return fmt.Sprintf("screening failed after %d attempts (the worker stopped %s); last error: %s",
			j.attempts, times(j.rescues), j.lastError)
	}
	return fmt.Sprintf("screening failed after %d attempts; last error: %s", j.attempts, j.lastError)
}

// times writes a count of times in words: once, twice, three times, …
func times(n int) string {
	words := strings.Fields("zero once twice three four five six seven eight nine ten")
	switch {
	case n == 1 || n == 2:
		return words[n]
	case n < len(words):
		return words[n] + " times"
	}
	return fmt.Sprintf("%d times", n)
}

// reconcileEvery is the default period of the reconciliation.
const reconcileEvery = time.Minute
