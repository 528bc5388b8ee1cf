package store_test

import (
	"context"
	"errors"
	"sync/atomic"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// A worker that dies just after the transaction that ends a screening has
// committed (kill -9 there, before the queue hears that the job is done)
// leaves nothing to run again: the job's completion committed with the
// report and the webhook delivery, so there is one of each. The death is
// stood in for by the attempt ending with an error at that point: a job
// the queue did not see complete is retried, as the rescuer retries a
// killed worker's job; a completed one is not.
func TestWorker_DiesAfterTheReportCommits(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, s := submissionWithWebhook(t, db)
	var crashes atomic.Int32
	var atCrash string // the job's state, seen from another connection
	cfg := store.WorkerConfig{Workers: 1, Timeout: time.Minute, Screen: screenDemo}
	store.SetAfterFinish(&cfg, func(context.Context) error {
		if crashes.Add(1) > 1 {
			return nil
		}
		if err := db.Pool.QueryRow(ctx, `SELECT state FROM river_job WHERE kind = 'screen_submission'`).
			Scan(&atCrash); err != nil {
			t.Error(err)
		}
		return errors.New("the worker died here")
	})
	w, err := db.StartWorkers(ctx, cfg)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Stop(ctx)
	waitStatus(t, db, s.ID, k.Scope(), service.StatusDone)
	waitJobsEnded(t, db)
	if atCrash != "completed" {
		t.Errorf("the job was %q when its report had committed, want completed in the same transaction", atCrash)
	}
	checkOneOfEach(t, db, s.ID)
}

// A job run again for a submission that already ended (the worker died
// after the transaction that marked it failed, and the job was retried)
// finds nothing to do: it does not screen again, and sends no second
// webhook.
func TestWorker_JobOfAnEndedSubmissionDoesNothing(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, s := submissionWithWebhook(t, db)
	if err := db.MarkFailed(ctx, s.ID, "attempt 1 of 4: permanent"); err != nil {
		t.Fatal(err)
	}
	var screened atomic.Int32
	screen := func(ctx context.Context, pkg, data []byte, p store.ProgressFunc) (*checks.Report, error) {
		screened.Add(1)
		return screenDemo(ctx, pkg, data, p)
	}
	w, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 1, Timeout: time.Minute, Screen: screen})
	if err != nil {
		t.Fatal(err)
	}
	defer w.Stop(ctx)
	waitJobsEnded(t, db)
	if n := screened.Load(); n != 0 {
		t.Errorf("an ended submission was screened %d times", n)
	}
	if got, err := db.Submission(ctx, s.ID, k.Scope()); err != nil || got.Status != service.StatusFailed {
		t.Fatalf("the submission after its stale job: %+v, %v", got, err)
	}
	if n := count(t, db, `SELECT count(*) FROM webhook_deliveries`); n != 1 {
		t.Errorf("%d webhook deliveries, want the failure's one", n)
	}
}

// submissionWithWebhook stores the demo package, queued, for an office
// with a webhook (whose deliveries fail: the name does not resolve).
func submissionWithWebhook(t *testing.T, db *store.DB) (*service.Key, *service.Submission) {
	t.Helper()
	k, _ := mustKey(t, db, "Office K", service.RoleEditor)
	if _, err := db.SetWebhook(ctx, k.OfficeID, "https://receiver.invalid/hook"); err != nil {
		t.Fatal(err)
	}
	s, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Package: demoPackage(t), Title: "t",
		PackageSHA256: "h"})
	if err != nil {
		t.Fatal(err)
	}
	return k, s
}

// waitJobsEnded waits until no screening job is waiting, retrying or
// running.
func waitJobsEnded(t *testing.T, db *store.DB) {
	t.Helper()
	for range 600 {
		if count(t, db, `SELECT count(*) FROM river_job WHERE kind = 'screen_submission'
			AND state NOT IN ('completed', 'cancelled', 'discarded')`) == 0 {
			return
		}
		time.Sleep(100 * time.Millisecond)
	}
	t.Fatal("a screening job has not ended within a minute")
}

func checkOneOfEach(t *testing.T, db *store.DB, id string) {
	t.Helper()
	for what, q := range map[string]string{
		"reports":             `SELECT count(*) FROM reports WHERE submission_id = '` + id + `'`,
		"webhook deliveries":  `SELECT count(*) FROM webhook_deliveries WHERE submission_id = '` + id + `'`,
		"delivery jobs":       `SELECT count(*) FROM river_job WHERE kind = 'deliver_webhook'`,
		"screening attempts":  `SELECT attempts FROM submissions WHERE id = '` + id + `'`,
		"screen job attempts": `SELECT attempt FROM river_job WHERE kind = 'screen_submission'`,
	} {
		if n := count(t, db, q); n != 1 {
			t.Errorf("%d %s, want 1", n, what)
		}
	}
}

func count(t *testing.T, db *store.DB, q string) int {
	t.Helper()
	var n int
	if err := db.Pool.QueryRow(ctx, q).Scan(&n); err != nil {
		t.Fatal(err)
	}
	return n
}

// A delivery that fails is recorded by its class, not the error's text
// (which names the resolver's address here).
func TestDelivery_RecordsTheClass(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	_, s := submissionWithWebhook(t, db)
	if err := db.MarkFailed(ctx, s.ID, "a reason"); err != nil {
		t.Fatal(err)
	}
	w, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 1, Timeout: time.Minute, Screen: screenDemo})
	if err != nil {
		t.Fatal(err)
	}
	defer w.Stop(ctx)
	var last string
	for range 300 {
		if err := db.Pool.QueryRow(ctx, `SELECT last_error FROM webhook_deliveries WHERE attempts > 0`).
			Scan(&last); err == nil {
			break
		}
		time.Sleep(100 * time.Millisecond)
	}
	if last != "DNS lookup failed" {
		t.Fatalf("the delivery's last error is %q, want its class", last)
	}
}
