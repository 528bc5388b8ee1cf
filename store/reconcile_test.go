package store_test

import (
	"context"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// dieFourTimes stands in for a worker killed three times and a fourth
// time mid-job: the job has used its last attempt, is running, and its
// worker is gone an hour ago; the submission was claimed by it.
func dieFourTimes(t *testing.T, db *store.DB, id string) {
	t.Helper()
	if _, err := db.Pool.Exec(ctx, `UPDATE river_job SET state = 'running', attempt = 4,
		attempted_at = now() - interval '1 hour', attempted_by = ARRAY['a-worker-that-died'],
		errors = (SELECT array_agg(jsonb_build_object('at', now() - interval '2 hours', 'attempt', a,
			'error', 'Stuck job rescued by JobRescuer', 'trace', '')) FROM generate_series(1, 3) a)
		WHERE args->>'submission_id' = $1`, id); err != nil {
		t.Fatal(err)
	}
	if _, _, err := db.Claim(ctx, id); err != nil {
		t.Fatal(err)
	}
}

// A submission whose worker died on every attempt ends failed with the
// reason once the queue discards the job, and a rerun screens it again.
// The real queue rescues and discards the job.
func TestWorkers_DiscardedJobFailsSubmission(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office D", service.RoleEditor)
	doc := demoPackage(t)
	s, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Package: doc, Title: "t", PackageSHA256: "h"})
	if err != nil {
		t.Fatal(err)
	}
	dieFourTimes(t, db, s.ID)
	w, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 1, Timeout: time.Second, RescueAfter: 2 * time.Second,
		ReconcileEvery: time.Second, Screen: screenDemo})
	if err != nil {
		t.Fatal(err)
	}
	defer w.Stop(ctx)
	failed := waitStatusWithin(t, db, s.ID, k.Scope(), service.StatusFailed, 90*time.Second)
	if want := "the worker stopped four times; the package may need more memory than the worker has"; failed.Error != want {
		t.Fatalf("reason %q, want %q", failed.Error, want)
	}
	if _, err := db.Rerun(ctx, s.ID, k.Scope()); err != nil {
		t.Fatalf("rerun of a failed submission: %v", err)
	}
	waitStatus(t, db, s.ID, k.Scope(), service.StatusDone)
}

// Rerun reconciles first: a submission still shown running whose job was
// discarded is accepted, not refused as still running.
func TestRerun_AfterDiscardedJob(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office E", service.RoleEditor)
	s, _, err := db.CreateSubmission(ctx, newSub(k, "h", ""))
	if err != nil {
		t.Fatal(err)
	}
	dieFourTimes(t, db, s.ID)
	if _, err := db.Rerun(ctx, s.ID, k.Scope()); service.ErrorCode(err) != service.EConflict {
		t.Fatalf("rerun while the job still runs: %v, want a conflict", err)
	}
	if _, err := db.Pool.Exec(ctx, `UPDATE river_job SET state = 'discarded', finalized_at = now()
		WHERE args->>'submission_id' = $1`, s.ID); err != nil {
		t.Fatal(err)
	}
	again, err := db.Rerun(ctx, s.ID, k.Scope())
	if err != nil || again.Status != service.StatusQueued {
		t.Fatalf("rerun after the job was discarded: %+v, %v", again, err)
	}
}

// A job cancelled by a shutdown, even on its last attempt, goes back to
// the queue without spending the attempt, and its submission shows queued.
func TestWorkers_ShutdownReleasesUnspent(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office U", service.RoleEditor)
	started := make(chan struct{}, 1)
	block := func(ctx context.Context, _, _ []byte, _ store.ProgressFunc) (*checks.Report, error) {
		started <- struct{}{}
		<-ctx.Done()
		return nil, ctx.Err()
	}
	s, _, err := db.CreateSubmission(ctx, newSub(k, "h", ""))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Pool.Exec(ctx, `UPDATE river_job SET attempt = 3 WHERE args->>'submission_id' = $1`, s.ID); err != nil {
		t.Fatal(err)
	}
	w, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 1, Timeout: time.Minute, Screen: block})
	if err != nil {
		t.Fatal(err)
	}
	<-started
	expired, cancel := context.WithTimeout(ctx, time.Millisecond)
	defer cancel()
	if err := w.Stop(expired); err != nil {
		t.Fatal(err)
	}
	var left int
	var state string
	if err := db.Pool.QueryRow(ctx, `SELECT max_attempts - attempt, state FROM river_job
		WHERE args->>'submission_id' = $1`, s.ID).Scan(&left, &state); err != nil || left != 1 || state != "available" {
		t.Fatalf("after a shutdown the job has %d attempts left, state %q (%v); want 1, available", left, state, err)
	}
	if got, _ := db.Submission(ctx, s.ID, k.Scope()); got.Status != service.StatusQueued {
		t.Fatalf("submission %s after the shutdown", got.Status)
	}
}
