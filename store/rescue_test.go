package store_test

import (
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// A worker that dies outright (no chance to cancel) leaves its job
// running; once it has been running longer than RescueAfter, the queue
// rescues it and another worker finishes it. The dead worker is stood in
// for by marking the job running, attempted an hour ago.
func TestWorkers_RescueAfterHardKill(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office R", service.RoleEditor)
	doc := demoPackage(t)
	s, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Package: doc, Title: "t", PackageSHA256: "h"})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := db.Pool.Exec(ctx, `UPDATE river_job SET state = 'running', attempt = 1,
		attempted_at = now() - interval '1 hour', attempted_by = ARRAY['a-worker-that-died']
		WHERE args->>'submission_id' = $1`, s.ID); err != nil {
		t.Fatal(err)
	}
	if _, _, err := db.Claim(ctx, s.ID); err != nil { // the dead worker had claimed it
		t.Fatal(err)
	}
	start := time.Now()
	w, err := db.StartWorkers(
		ctx,
		store.WorkerConfig{Workers: 1, Timeout: time.Second, RescueAfter: 2 * time.Second, Screen: screenDemo},
	)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Stop(ctx)
	done := waitStatusWithin(t, db, s.ID, k.Scope(), service.StatusDone, 90*time.Second)
	t.Logf("rescued and finished after %v, attempts %d", time.Since(start).Round(time.Second), done.Attempts)
	if done.Attempts != 2 {
		t.Fatalf("attempts %d, want 2", done.Attempts)
	}
}
