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

// A running screening's progress reaches its submission: the latest of a
// burst of calls, written by the worker while the screening still runs,
// and cleared when the job ends. The real queue and worker run it.
func TestWorkers_ProgressWhileRunning(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office P", service.RoleEditor)
	doc := demoPackage(t)
	release := make(chan struct{})
	screen := func(ctx context.Context, pkg, data []byte, progress store.ProgressFunc) (*checks.Report, error) {
		for i := 1; i <= 50; i++ {
			progress("missing data: imputations", i, 50)
		}
		select {
		case <-release:
		case <-ctx.Done():
			return nil, ctx.Err()
		}
		return screenDemo(ctx, pkg, data, nil)
	}
	w, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 1, Timeout: time.Minute, Screen: screen})
	if err != nil {
		t.Fatal(err)
	}
	defer w.Stop(ctx)
	s, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Package: doc, Title: "t", PackageSHA256: "h"})
	if err != nil {
		t.Fatal(err)
	}
	running := waitProgress(t, db, s.ID, k.Scope(), 50)
	if p := running.Progress; running.Status != service.StatusRunning || p.Stage != "missing data: imputations" ||
		p.Total != 50 || p.UpdatedAt.IsZero() {
		t.Fatalf("while running: %+v, progress %+v", running, p)
	}
	close(release)
	done := waitStatus(t, db, s.ID, k.Scope(), service.StatusDone)
	var stage *string
	err = db.Pool.QueryRow(ctx, `SELECT progress_stage FROM submissions WHERE id = $1`, s.ID).Scan(&stage)
	if err != nil {
		t.Fatal(err)
	}
	if done.Progress != nil || stage != nil {
		t.Fatalf("progress kept after the job ended: %+v, column %v", done.Progress, stage)
	}
}

// waitProgress polls until the submission shows progress with done
// units done.
func waitProgress(t *testing.T, db *store.DB, id string, sc service.Scope, done int) *service.Submission {
	t.Helper()
	for deadline := time.Now().Add(30 * time.Second); time.Now().Before(deadline); time.Sleep(50 * time.Millisecond) {
		s, err := db.Submission(ctx, id, sc)
		if err != nil {
			t.Fatal(err)
		}
		if s.Progress != nil && s.Progress.Done == done {
			return s
		}
	}
	t.Fatalf("submission %s never showed progress %d", id, done)
	return nil
}

// SetProgress writes only while the submission runs; a queued one keeps
// none.
func TestDB_SetProgressOnlyWhileRunning(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office Q", service.RoleEditor)
	s, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Package: []byte(`{}`), Title: "t",
		PackageSHA256: "h"})
	if err != nil {
		t.Fatal(err)
	}
	if err := db.SetProgress(ctx, s.ID, "checks", 1, 10); err != nil {
		t.Fatal(err)
	}
	if got, _ := db.Submission(ctx, s.ID, k.Scope()); got.Progress != nil {
		t.Fatalf("a queued submission took progress: %+v", got.Progress)
	}
	if _, _, err := db.Claim(ctx, s.ID); err != nil {
		t.Fatal(err)
	}
	if err := db.SetProgress(ctx, s.ID, "checks", 1, 10); err != nil {
		t.Fatal(err)
	}
	got, _ := db.Submission(ctx, s.ID, k.Scope())
	if got.Progress == nil || got.Progress.Done != 1 || got.Progress.Total != 10 {
		t.Fatalf("a running submission: %+v", got.Progress)
	}
	if err := db.MarkFailed(ctx, s.ID, "a reason"); err != nil {
		t.Fatal(err)
	}
	if got, _ := db.Submission(ctx, s.ID, k.Scope()); got.Progress != nil {
		t.Fatalf("a failed submission kept progress: %+v", got.Progress)
	}
}

// The cell count reaches the job's arguments, and a rerun's job too.
func TestDB_CellsCarriedIntoJobs(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office C", service.RoleEditor)
	s, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Package: []byte(`{}`), Title: "t",
		PackageSHA256: "h", Cells: 60_000_000})
	if err != nil {
		t.Fatal(err)
	}
	if err := db.MarkFailed(ctx, s.ID, "a reason"); err != nil {
		t.Fatal(err)
	}
	if _, err := db.Rerun(ctx, s.ID, k.Scope()); err != nil {
		t.Fatal(err)
	}
	rows, err := db.Pool.Query(ctx, `SELECT (args->>'cells')::bigint FROM river_job
		WHERE args->>'submission_id' = $1 ORDER BY id`, s.ID)
	if err != nil {
		t.Fatal(err)
	}
	var cells []int64
	for rows.Next() {
		var c int64
		if err := rows.Scan(&c); err != nil {
			t.Fatal(err)
		}
		cells = append(cells, c)
	}
	if len(cells) != 2 || cells[0] != 60_000_000 || cells[1] != 60_000_000 {
		t.Fatalf("cells in the jobs: %v, want 60000000 twice", cells)
	}
}
