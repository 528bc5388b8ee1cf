package store_test

import (
	"context"
	"errors"
	"os"
	"sync/atomic"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

var ctx = context.Background()

func mustKey(t *testing.T, db *store.DB, office, role string) (*service.Key, string) {
	t.Helper()
	token, k := storetest.MustKey(t, db, office, role)
	return k, token
}

// demoPackage is the tutoring-anxiety demo package, which the workers
// screen in these tests.
func demoPackage(t *testing.T) []byte {
	t.Helper()
	doc, err := os.ReadFile("../testdata/demo/tutoring-anxiety/package.json")
	if err != nil {
		t.Fatal(err)
	}
	return doc
}

func newSub(k *service.Key, hash, idem string) service.NewSubmission {
	return service.NewSubmission{Key: k, Package: []byte(`{"title": "x"}`), Title: "A study", ManuscriptID: "M-1",
		PackageSHA256: hash, IdempotencyKey: idem}
}

func TestKeys(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, token := mustKey(t, db, "Journal of Invented Studies", service.RoleEditor)
	got, err := db.KeyByToken(ctx, token)
	if err != nil || got.ID != k.ID || got.Role != service.RoleEditor ||
		got.OfficeName != "Journal of Invented Studies" {
		t.Fatalf("KeyByToken: %+v, %v", got, err)
	}
	k2, _ := mustKey(t, db, "Journal of Invented Studies", service.RoleSubmitter)
	if k2.OfficeID != k.OfficeID {
		t.Fatal("a second key for the same office made a second office")
	}
	t.Run("ErrNotFound", func(t *testing.T) {
		if _, err := db.KeyByToken(ctx, token+"x"); service.ErrorCode(err) != service.ENotFound {
			t.Fatalf("bad token: %v", err)
		}
	})
	t.Run("UnknownOfficeNotFound", func(t *testing.T) {
		_, _, err := db.CreateKey(ctx, service.NewKey{Office: "Journal of Invented Studis", Role: service.RoleEditor})
		if service.ErrorCode(err) != service.ENotFound {
			t.Fatalf("a typo in the office: %v", err)
		}
		if offices, _ := db.Offices(ctx); len(offices) != 1 {
			t.Fatalf("%d offices, want 1", len(offices))
		}
	})
	t.Run("ListAndRevoke", func(t *testing.T) {
		keys, err := db.Keys(ctx, "Journal of Invented Studies")
		if err != nil || len(keys) != 2 || keys[0].LastUsedAt == nil || keys[1].LastUsedAt != nil ||
			keys[0].Label == "" {
			t.Fatalf("keys %+v, %v: want two, the first used", keys, err)
		}
		if err := db.RevokeKey(ctx, k.ID); err != nil {
			t.Fatal(err)
		}
		if _, err := db.KeyByToken(ctx, token); service.ErrorCode(err) != service.ENotFound {
			t.Fatalf("revoked key still works: %v", err)
		}
		if err := db.RevokeKey(ctx, k.ID); service.ErrorCode(err) != service.ENotFound {
			t.Fatalf("revoking twice: %v", err)
		}
	})
	t.Run("ErrInvalid", func(t *testing.T) {
		if _, _, err := db.CreateKey(ctx, service.NewKey{Office: "x", Role: "admin"}); service.ErrorCode(
			err,
		) != service.EInvalid {
			t.Fatalf("bad role: %v", err)
		}
	})
	var n int
	if err := db.Pool.QueryRow(ctx, `SELECT count(*) FROM api_keys WHERE position($1 in encode(token_sha256, 'escape')) > 0`, token).Scan(&n); err != nil ||
		n != 0 {
		t.Fatalf("the token itself is stored: %d, %v", n, err)
	}
}

func TestSubmissionStore(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	editor, _ := mustKey(t, db, "Office A", service.RoleEditor)
	sub1, _ := mustKey(t, db, "Office A", service.RoleSubmitter)
	sub2, _ := mustKey(t, db, "Office A", service.RoleSubmitter)
	other, _ := mustKey(t, db, "Office B", service.RoleEditor)

	s, replayed, err := db.CreateSubmission(ctx, newSub(sub1, "h1", "k1"))
	if err != nil || replayed || s.Status != service.StatusQueued || s.SubmittedBy != "submitter of Office A" {
		t.Fatalf("create: %+v, %v, %v", s, replayed, err)
	}
	var jobs int
	if err := db.Pool.QueryRow(ctx, `SELECT count(*) FROM river_job WHERE args->>'submission_id' = $1`, s.ID).Scan(&jobs); err != nil ||
		jobs != 1 {
		t.Fatalf("queued jobs: %d, %v", jobs, err)
	}
	t.Run("Idempotency", func(t *testing.T) {
		again, replayed, err := db.CreateSubmission(ctx, newSub(sub1, "h1", "k1"))
		if err != nil || !replayed || again.ID != s.ID {
			t.Fatalf("replay: %+v, %v, %v", again, replayed, err)
		}
		if _, _, err := db.CreateSubmission(ctx, newSub(sub1, "h2", "k1")); service.ErrorCode(
			err,
		) != service.EConflict {
			t.Fatalf("same key, other package: %v", err)
		}
		if _, replayed, err := db.CreateSubmission(ctx, newSub(sub2, "h1", "k1")); err != nil || replayed {
			t.Fatalf("another key may reuse the idempotency key: %v %v", replayed, err)
		}
	})
	t.Run("Scope", func(t *testing.T) {
		for _, tc := range []struct {
			name string
			key  *service.Key
			want string
		}{{"editor", editor, ""}, {"own submitter", sub1, ""}, {"other submitter", sub2, service.ENotFound}, {"other office", other, service.ENotFound}} {
			_, err := db.Submission(ctx, s.ID, tc.key.Scope())
			if service.ErrorCode(err) != tc.want {
				t.Errorf("%s: %v", tc.name, err)
			}
		}
		if _, err := db.Submission(ctx, "not-a-uuid", editor.Scope()); service.ErrorCode(err) != service.ENotFound {
			t.Errorf("bad id: %v", err)
		}
	})
	t.Run("ListAndPaginate", func(t *testing.T) {
		for i := range 5 {
			n := newSub(sub1, "h", "")
			n.ManuscriptID = map[bool]string{true: "M-2", false: "M-3"}[i%2 == 0]
			if _, _, err := db.CreateSubmission(ctx, n); err != nil {
				t.Fatal(err)
			}
		}
		page, next, err := db.Submissions(ctx, service.Filter{Scope: editor.Scope(), Limit: 4})
		if err != nil || len(page) != 4 || next == "" {
			t.Fatalf("page 1: %d, %q, %v", len(page), next, err)
		}
		rest, next2, err := db.Submissions(ctx, service.Filter{Scope: editor.Scope(), Limit: 4, Cursor: next})
		if err != nil || len(rest) != 3 || next2 != "" {
			t.Fatalf("page 2: %d, %q, %v", len(rest), next2, err)
		}
		seen := map[string]bool{}
		for _, x := range append(page, rest...) {
			if seen[x.ID] {
				t.Fatalf("%s listed twice", x.ID)
			}
			seen[x.ID] = true
		}
		m2, _, _ := db.Submissions(ctx, service.Filter{Scope: editor.Scope(), ManuscriptID: "M-2"})
		if len(m2) != 3 {
			t.Fatalf("manuscript filter: %d", len(m2))
		}
		own, _, _ := db.Submissions(ctx, service.Filter{Scope: sub2.Scope()})
		if len(own) != 1 {
			t.Fatalf("a submitter lists %d submissions, want its 1", len(own))
		}
		if _, _, err := db.Submissions(ctx, service.Filter{Scope: editor.Scope(), Cursor: "garbage"}); service.ErrorCode(
			err,
		) != service.EInvalid {
			t.Fatalf("bad cursor: %v", err)
		}
	})
	t.Run("ReportsAndRerun", func(t *testing.T) {
		if _, err := db.Rerun(ctx, s.ID, editor.Scope()); service.ErrorCode(err) != service.EConflict {
			t.Fatalf("rerun while queued: %v", err)
		}
		if _, _, err := db.Claim(ctx, s.ID); err != nil {
			t.Fatal(err)
		}
		rep := &checks.Report{Score: 77, Band: checks.BandModerate, ToolVersion: checks.ToolVersion}
		if err := db.SaveReport(ctx, s.ID, rep, time.Second); err != nil {
			t.Fatal(err)
		}
		got, _ := db.Submission(ctx, s.ID, editor.Scope())
		if got.Status != service.StatusDone || *got.Score != 77 || got.Reports != 1 || got.Attempts != 1 {
			t.Fatalf("after report: %+v", got)
		}
		again, err := db.Rerun(ctx, s.ID, editor.Scope())
		if err != nil || again.Status != service.StatusQueued || again.Reports != 1 {
			t.Fatalf("rerun: %+v, %v", again, err)
		}
		r, err := db.LatestReport(ctx, s.ID, sub1.Scope(), 0)
		if err != nil || len(r.JSON) == 0 || r.ID == 0 {
			t.Fatalf("the old report is kept: %v", err)
		}
		if held, err := db.LatestReport(ctx, s.ID, sub1.Scope(), r.ID); err != nil || held.ID != r.ID ||
			held.JSON != nil {
			t.Fatalf("the report the caller holds: %+v, %v; want its id and no bytes", held, err)
		}
		if _, err := db.LatestReport(ctx, s.ID, other.Scope(), 0); service.ErrorCode(err) != service.ENotFound {
			t.Fatalf("other office reads the report: %v", err)
		}
	})
	t.Run("Delete", func(t *testing.T) {
		if err := db.DeleteSubmission(ctx, s.ID, other.Scope()); service.ErrorCode(err) != service.ENotFound {
			t.Fatalf("other office deletes: %v", err)
		}
		if err := db.DeleteSubmission(ctx, s.ID, editor.Scope()); err != nil {
			t.Fatal(err)
		}
		if _, err := db.Submission(ctx, s.ID, editor.Scope()); service.ErrorCode(err) != service.ENotFound {
			t.Fatalf("deleted submission still found: %v", err)
		}
	})
	if s, _ := db.MigrationStatus(ctx); len(s) == 0 || !s[0].Applied {
		t.Fatalf("migration status %+v", s)
	}
}

func waitStatus(t *testing.T, db *store.DB, id string, sc service.Scope, want string) *service.Submission {
	t.Helper()
	return waitStatusWithin(t, db, id, sc, want, 30*time.Second)
}

func waitStatusWithin(
	t *testing.T,
	db *store.DB,
	id string,
	sc service.Scope,
	want string,
	within time.Duration,
) *service.Submission {
	t.Helper()
	deadline := time.Now().Add(within)
	for time.Now().Before(deadline) {
		s, err := db.Submission(ctx, id, sc)
		if err != nil {
			t.Fatal(err)
		}
		if s.Status == want {
			return s
		}
		time.Sleep(50 * time.Millisecond)
	}
	t.Fatalf("submission %s never reached %s", id, want)
	return nil
}

func TestWorkers(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office W", service.RoleEditor)
	doc := demoPackage(t)
	screen := screenDemo
	t.Run("ScreensAndStores", func(t *testing.T) {
		w, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 2, Timeout: time.Minute, Screen: screen})
		if err != nil {
			t.Fatal(err)
		}
		defer w.Stop(ctx)
		s, _, err := db.CreateSubmission(
			ctx,
			service.NewSubmission{Key: k, Package: doc, Title: "t", PackageSHA256: "h"},
		)
		if err != nil {
			t.Fatal(err)
		}
		done := waitStatus(t, db, s.ID, k.Scope(), service.StatusDone)
		if done.Score == nil || done.Band == nil {
			t.Fatalf("done without a score: %+v", done)
		}
		bad, _, _ := db.CreateSubmission(
			ctx,
			service.NewSubmission{Key: k, Package: []byte(`{}`), Title: "t", PackageSHA256: "h2"},
		)
		failed := waitStatus(t, db, bad.ID, k.Scope(), service.StatusFailed)
		if failed.Error == "" || failed.Attempts != 1 {
			t.Fatalf("a permanent error should fail at once with its reason: %+v", failed)
		}
	})
	t.Run("KilledWorkerJobIsRetried", func(t *testing.T) {
		var calls atomic.Int32
		started := make(chan struct{}, 1)
		stuck := func(ctx context.Context, pkg, data []byte, _ store.ProgressFunc) (*checks.Report, error) {
			if calls.Add(1) == 1 {
				started <- struct{}{}
				<-ctx.Done() // the first worker is killed mid-job
				return nil, ctx.Err()
			}
			return screen(ctx, pkg, data, nil)
		}
		first, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 1, Timeout: time.Minute, Screen: stuck})
		if err != nil {
			t.Fatal(err)
		}
		s, _, _ := db.CreateSubmission(
			ctx,
			service.NewSubmission{Key: k, Package: doc, Title: "t", PackageSHA256: "h3"},
		)
		<-started
		if err := first.Kill(ctx); err != nil {
			t.Fatal(err)
		}
		second, err := db.StartWorkers(ctx, store.WorkerConfig{Workers: 1, Timeout: time.Minute, Screen: stuck})
		if err != nil {
			t.Fatal(err)
		}
		defer second.Stop(ctx)
		done := waitStatus(t, db, s.ID, k.Scope(), service.StatusDone)
		if done.Attempts != 2 || calls.Load() != 2 {
			t.Fatalf(
				"attempts %d, calls %d; want the job retried once by the second worker",
				done.Attempts,
				calls.Load(),
			)
		}
	})
}

// screenDemo is the workers' job in these tests: load and screen.
func screenDemo(ctx context.Context, pkg, _ []byte, progress store.ProgressFunc) (*checks.Report, error) {
	s, err := load.Load(pkg, load.Options{})
	if err != nil {
		return nil, errors.Join(store.ErrPermanent, err)
	}
	return checks.Run(ctx, s, checks.Options{Progress: progress})
}
