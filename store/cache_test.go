package store_test

import (
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// cachingDB opens the test database a second time, as a server does, with
// the read cache listening; entries last an hour, so that only the
// database's announcements can make the cache forget one.
func cachingDB(t *testing.T, url string) *store.DB {
	t.Helper()
	db, err := store.Open(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(db.Close)
	db.CacheReads(ctx)
	store.SetCacheTTL(db, time.Hour)
	waitListening(t, db, true)
	return db
}

func waitListening(t *testing.T, db *store.DB, want bool) {
	t.Helper()
	for range 300 {
		if store.CacheListening(db) == want {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatalf("the key cache's listening is not %v after 6 s", want)
}

// mustFindKey looks the token up and says whether the cache answered.
func mustFindKey(t *testing.T, db *store.DB, token string) bool {
	t.Helper()
	before := store.CacheHits(db)
	if _, err := db.KeyByToken(ctx, token); err != nil {
		t.Fatalf("a live key: %v", err)
	}
	return store.CacheHits(db) > before
}

// waitRefused waits until the token is refused; a revoked key must stop
// working although its entry had an hour left.
func waitRefused(t *testing.T, db *store.DB, token string) {
	t.Helper()
	for range 500 {
		if _, err := db.KeyByToken(ctx, token); service.ErrorCode(err) == service.ENotFound {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatal("a revoked key still works after 10 s")
}

// A key revoked by another process (pathvet keys revoke) stops working on
// a server whose cache holds it, as soon as the announcement arrives.
func TestCache_KeyRevocation(t *testing.T) {
	admin, url := storetest.MustOpenDB(t)
	k, token := mustKey(t, admin, "Office C", service.RoleEditor)
	_, other := mustKey(t, admin, "Office C", service.RoleSubmitter)
	db := cachingDB(t, url)
	if mustFindKey(t, db, token) {
		t.Fatal("the first lookup was answered from an empty cache")
	}
	if !mustFindKey(t, db, token) {
		t.Fatal("the second lookup of a key was not answered from the cache")
	}
	mustFindKey(t, db, other)
	if err := admin.RevokeKey(ctx, k.ID); err != nil {
		t.Fatal(err)
	}
	waitRefused(t, db, token)
	if mustFindKey(t, db, other) {
		t.Error("an entry outlived the announcement of a revocation")
	}
	if !mustFindKey(t, db, other) {
		t.Error("after the revocation the other key is not cached again")
	}
}

// While the cache's listening connection is gone, nothing is served from
// memory; a key revoked meanwhile is refused at once, and when it listens
// again the cache starts afresh.
func TestCache_KeyListenerLost(t *testing.T) {
	admin, url := storetest.MustOpenDB(t)
	k, token := mustKey(t, admin, "Office L", service.RoleEditor)
	db := cachingDB(t, url)
	mustFindKey(t, db, token)
	if _, err := admin.Pool.Exec(ctx, `SELECT pg_terminate_backend(pid) FROM pg_stat_activity
		WHERE datname = current_database() AND query LIKE 'LISTEN %'`); err != nil {
		t.Fatal(err)
	}
	waitListening(t, db, false)
	if mustFindKey(t, db, token) {
		t.Fatal("a key was served from memory while the cache was not listening")
	}
	if _, err := admin.Pool.Exec(ctx, `UPDATE api_keys SET revoked_at = now() WHERE id = $1`, k.ID); err != nil {
		t.Fatal(err)
	}
	if _, err := db.KeyByToken(ctx, token); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("a key revoked while the cache was not listening: %v", err)
	}
	waitListening(t, db, true)
	if _, err := db.KeyByToken(ctx, token); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("the revoked key after the cache listens again: %v", err)
	}
}

// An entry lasts KeyCacheTTL at most, announcements or not.
func TestCache_KeyEntriesExpire(t *testing.T) {
	admin, url := storetest.MustOpenDB(t)
	_, token := mustKey(t, admin, "Office X", service.RoleEditor)
	db := cachingDB(t, url)
	store.SetCacheTTL(db, store.CacheTTL)
	at := time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC)
	db.Now = func() time.Time { return at }
	mustFindKey(t, db, token)
	db.Now = func() time.Time { return at.Add(store.CacheTTL - time.Millisecond) }
	if !mustFindKey(t, db, token) {
		t.Error("an entry inside its lifetime was not used")
	}
	db.Now = func() time.Time { return at.Add(store.CacheTTL) }
	if mustFindKey(t, db, token) {
		t.Error("an entry was used at the end of its lifetime")
	}
}

// screenedSub stores a submission sent with k, with one report.
func screenedSub(t *testing.T, db *store.DB, k *service.Key, hash string) *service.Submission {
	t.Helper()
	s, _, err := db.CreateSubmission(ctx, newSub(k, hash, ""))
	if err != nil {
		t.Fatal(err)
	}
	saveReport(t, db, s.ID, 70)
	return s
}

// readReport reads the newest report and says whether the cache answered.
func readReport(t *testing.T, db *store.DB, id string, sc service.Scope, have int64) (
	*service.StoredReport, error, bool) {
	t.Helper()
	before := store.CacheHits(db)
	r, err := db.LatestReport(ctx, id, sc, have)
	return r, err, store.CacheHits(db) > before
}

// A report read once is served from memory, to the scopes the database
// would serve it to and no others; a newer report stored by another
// process (a rerun) replaces it as soon as its announcement arrives,
// although the entry had an hour left.
func TestCache_ReportRerun(t *testing.T) {
	admin, url := storetest.MustOpenDB(t)
	editor, _ := mustKey(t, admin, "Office P", service.RoleEditor)
	sender, _ := mustKey(t, admin, "Office P", service.RoleSubmitter)
	colleague, _ := mustKey(t, admin, "Office P", service.RoleSubmitter)
	stranger, _ := mustKey(t, admin, "Office Q", service.RoleEditor)
	s := screenedSub(t, admin, sender, "h1")
	db := cachingDB(t, url)
	first, err, cached := readReport(t, db, s.ID, editor.Scope(), 0)
	if err != nil || cached || len(first.JSON) == 0 {
		t.Fatalf("first read: %v, from the cache %v", err, cached)
	}
	for _, tc := range []struct {
		name string
		k    *service.Key
		ok   bool
	}{{"editor", editor, true}, {"sender", sender, true}, {"colleague", colleague, false}, {"stranger", stranger, false}} {
		r, err, cached := readReport(t, db, s.ID, tc.k.Scope(), 0)
		if !cached || (err == nil) != tc.ok || tc.ok && r.ID != first.ID {
			t.Errorf("%s: %v, %v, from the cache %v; want found %v from the cache", tc.name, r, err, cached, tc.ok)
		}
	}
	if r, err, cached := readReport(t, db, s.ID, editor.Scope(), first.ID); err != nil || !cached || r.JSON != nil {
		t.Errorf("the report the caller holds, from the cache: %+v, %v, %v", r, err, cached)
	}
	saveReport(t, admin, s.ID, 40)
	for range 500 {
		if r, _ := db.LatestReport(ctx, s.ID, editor.Scope(), 0); r.ID != first.ID {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatal("the earlier report is still served 10 s after a newer one was stored")
}

// A submission deleted by another process is not served from memory once
// the announcement arrives.
func TestCache_ReportDeleted(t *testing.T) {
	admin, url := storetest.MustOpenDB(t)
	editor, _ := mustKey(t, admin, "Office D", service.RoleEditor)
	s := screenedSub(t, admin, editor, "h1")
	db := cachingDB(t, url)
	readReport(t, db, s.ID, editor.Scope(), 0)
	if _, err, cached := readReport(t, db, s.ID, editor.Scope(), 0); err != nil || !cached {
		t.Fatalf("second read: %v, from the cache %v", err, cached)
	}
	if err := admin.DeleteSubmission(ctx, s.ID, editor.Scope()); err != nil {
		t.Fatal(err)
	}
	for range 500 {
		if _, err := db.LatestReport(ctx, s.ID, editor.Scope(), 0); service.ErrorCode(err) == service.ENotFound {
			return
		}
		time.Sleep(20 * time.Millisecond)
	}
	t.Fatal("a deleted submission's report is still served after 10 s")
}
