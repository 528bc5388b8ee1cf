package store_test

import (
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// A real outage (connections refused, open ones terminated) makes every
// call the API uses answer unavailable, not an internal error, and stores
// nothing.
func TestDB_OutageIsUnavailable(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	k, token := mustKey(t, db, "Office O", service.RoleEditor)
	s, _, err := db.CreateSubmission(ctx, newSub(k, "h1", ""))
	if err != nil {
		t.Fatal(err)
	}
	restore := storetest.Outage(t, url)
	sc := k.Scope()
	calls := map[string]func() error{
		"KeyByToken":       func() error { _, err := db.KeyByToken(ctx, token); return err },
		"CreateSubmission": func() error { _, _, err := db.CreateSubmission(ctx, newSub(k, "h2", "")); return err },
		"Submission":       func() error { _, err := db.Submission(ctx, s.ID, sc); return err },
		"Submissions":      func() error { _, _, err := db.Submissions(ctx, service.Filter{Scope: sc}); return err },
		"Rerun":            func() error { _, err := db.Rerun(ctx, s.ID, sc); return err },
		"LatestReport":     func() error { _, err := db.LatestReport(ctx, s.ID, sc, 0); return err },
		"DeleteSubmission": func() error { return db.DeleteSubmission(ctx, s.ID, sc) },
	}
	for name, call := range calls {
		if err := call(); service.ErrorCode(err) != service.EUnavailable {
			t.Errorf("%s during an outage: %v (code %q)", name, err, service.ErrorCode(err))
		}
	}
	restore()
	waitForDatabase(t, db)
	var n int
	if err := db.Pool.QueryRow(ctx, `SELECT count(*) FROM submissions`).Scan(&n); err != nil || n != 1 {
		t.Fatalf("after the outage %d submissions (%v), want the 1 from before", n, err)
	}
}

// waitForDatabase waits until the pool reaches the database again.
func waitForDatabase(t *testing.T, db *store.DB) {
	t.Helper()
	for range 100 {
		if db.Ping(ctx) == nil {
			return
		}
		time.Sleep(100 * time.Millisecond)
	}
	t.Fatal("the database did not come back")
}

// A value PostgreSQL's text cannot hold (a NUL) is invalid, not internal.
func TestDB_DataExceptionIsInvalid(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office N", service.RoleEditor)
	n := newSub(k, "h", "")
	n.Title = "a\x00b"
	if _, _, err := db.CreateSubmission(ctx, n); service.ErrorCode(err) != service.EInvalid {
		t.Fatalf("NUL in a title: %v (code %q)", err, service.ErrorCode(err))
	}
}
