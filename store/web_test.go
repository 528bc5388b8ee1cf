package store_test

import (
	"encoding/json"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

func TestSessions(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	k, _ := mustKey(t, db, "Office S", service.RoleEditor)
	id, err := db.OpenSession(ctx, k, time.Hour)
	if err != nil {
		t.Fatal(err)
	}
	var stored []byte
	if err := db.Pool.QueryRow(ctx, `SELECT id_sha256 FROM web_sessions`).Scan(&stored); err != nil ||
		string(stored) == id {
		t.Fatalf("the session id is stored as is, or not at all: %v", err)
	}
	got, err := db.SessionKey(ctx, id)
	if err != nil || got.ID != k.ID || got.OfficeID != k.OfficeID || got.Role != service.RoleEditor ||
		got.Label != k.Label {
		t.Fatalf("session key: %+v, %v", got, err)
	}
	if _, err := db.SessionKey(ctx, id+"x"); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("unknown session: %v", err)
	}
	now := db.Now
	db.Now = func() time.Time { return now().Add(2 * time.Hour) }
	if _, err := db.SessionKey(ctx, id); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("expired session: %v", err)
	}
	db.Now = func() time.Time { return now().Add(26 * time.Hour) }
	if _, err := db.OpenSession(ctx, k, time.Hour); err != nil {
		t.Fatal(err)
	}
	var left int
	if err := db.Pool.QueryRow(ctx, `SELECT count(*) FROM web_sessions`).Scan(&left); err != nil || left != 1 {
		t.Fatalf("%d sessions after a day past expiry, want the new one only (%v)", left, err)
	}
	db.Now = now
	id, _ = db.OpenSession(ctx, k, time.Hour)
	if err := db.EndSession(ctx, id); err != nil {
		t.Fatal(err)
	}
	if _, err := db.SessionKey(ctx, id); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("ended session: %v", err)
	}
}

// TestSignInWait: three failures are free, then the wait doubles from one
// second; a quiet window starts the count again.
func TestSignInWait(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	at := time.Date(2026, 1, 1, 9, 0, 0, 0, time.UTC)
	db.Now = func() time.Time { return at }
	for i, want := range []time.Duration{0, 0, 0, time.Second, 2 * time.Second, 4 * time.Second} {
		if err := db.NoteSignInFailure(ctx, "192.0.2.1"); err != nil {
			t.Fatal(err)
		}
		if got, err := db.SignInWait(ctx, "192.0.2.1"); err != nil || got != want {
			t.Errorf("after %d failures: wait %v, want %v (%v)", i+1, got, want, err)
		}
	}
	if got, _ := db.SignInWait(ctx, "192.0.2.2"); got != 0 {
		t.Errorf("another address waits %v", got)
	}
	db.Now = func() time.Time { return at.Add(3 * time.Second) }
	if got, _ := db.SignInWait(ctx, "192.0.2.1"); got != time.Second {
		t.Errorf("3 s into a 4 s wait: %v left", got)
	}
	db.Now = func() time.Time { return at.Add(store.SignInWindow + time.Second) }
	if got, _ := db.SignInWait(ctx, "192.0.2.1"); got != 0 {
		t.Errorf("after a quiet window: wait %v", got)
	}
	if err := db.NoteSignInFailure(ctx, "192.0.2.1"); err != nil {
		t.Fatal(err)
	}
	if got, _ := db.SignInWait(ctx, "192.0.2.1"); got != 0 {
		t.Errorf("the first failure after a quiet window waits %v: the count did not start again", got)
	}
}

// saveReport screens the submission again (queued, as a rerun leaves it,
// then claimed) and stores a report with the score.
func saveReport(t *testing.T, db *store.DB, id string, score int) {
	t.Helper()
	if _, err := db.Pool.Exec(ctx, `UPDATE submissions SET status = 'queued' WHERE id = $1`, id); err != nil {
		t.Fatal(err)
	}
	if _, _, err := db.Claim(ctx, id); err != nil {
		t.Fatal(err)
	}
	rep := &checks.Report{Title: "A study", Score: score, Band: checks.Band(score), ToolVersion: checks.ToolVersion}
	if err := db.SaveReport(ctx, id, rep, time.Millisecond); err != nil {
		t.Fatal(err)
	}
}

func TestWorkspaceQueries(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	editor, _ := mustKey(t, db, "Office W", service.RoleEditor)
	author, _ := mustKey(t, db, "Office W", service.RoleSubmitter)
	other, _ := mustKey(t, db, "Office V", service.RoleEditor)
	v1, _, _ := db.CreateSubmission(ctx, newSub(author, "h1", ""))
	v2, _, _ := db.CreateSubmission(ctx, newSub(editor, "h2", ""))
	saveReport(t, db, v1.ID, 40)
	saveReport(t, db, v2.ID, 70)
	if _, err := db.Rerun(ctx, v2.ID, editor.Scope()); err != nil { // a second report comes from a rerun
		t.Fatal(err)
	}
	saveReport(t, db, v2.ID, 90)

	hist, err := db.ReportHistory(ctx, v2.ID, editor.Scope())
	if err != nil || len(hist) != 2 || hist[0].Score != 90 || hist[1].Score != 70 || !json.Valid(hist[0].Report) {
		t.Fatalf("history: %+v, %v", hist, err)
	}
	if _, err := db.ReportHistory(ctx, v2.ID, other.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("another office's history: %v", err)
	}
	v2s, _ := db.Submission(ctx, v2.ID, editor.Scope())
	prev, rep, err := db.PreviousVersion(ctx, v2s, editor.Scope())
	if err != nil || prev.ID != v1.ID || rep == nil {
		t.Fatalf("previous version: %+v, %v", prev, err)
	}
	v1s, _ := db.Submission(ctx, v1.ID, author.Scope())
	if _, _, err := db.PreviousVersion(ctx, v1s, author.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("the first version has an earlier one: %v", err)
	}
	if _, _, err := db.PreviousVersion(ctx, v2s, other.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Fatalf("another office sees the earlier version: %v", err)
	}
	vs, err := db.Versions(ctx, []string{v1.ID, v2.ID}, editor.Scope())
	if err != nil || vs[v1.ID] != (service.Version{N: 1, Of: 2}) || vs[v2.ID] != (service.Version{N: 2, Of: 2}) {
		t.Fatalf("versions: %v, %v", vs, err)
	}
	counts, err := db.BandCounts(ctx, editor.Scope())
	if err != nil || counts[checks.BandHigh] != 1 || counts[checks.BandLow] != 1 || len(counts) != 2 {
		t.Fatalf("band counts: %v, %v", counts, err)
	}
	if c, _ := db.BandCounts(ctx, author.Scope()); c[checks.BandHigh] != 1 || len(c) != 1 {
		t.Fatalf("a submitter's counts: %v", c)
	}
	reps, more, err := db.RecentReports(ctx, editor.Scope(), time.Now().Add(-time.Hour), 1)
	if err != nil || len(reps) != 1 || !more {
		t.Fatalf("recent reports: %d, %v, %v", len(reps), more, err)
	}
	if reps, _, _ := db.RecentReports(ctx, editor.Scope(), time.Now().Add(time.Hour), 10); len(reps) != 0 {
		t.Fatalf("reports from the future: %d", len(reps))
	}
}

// A submission whose screening failed without a report counts as failed,
// not as "not screened yet" beside the queued one (issue 22.4); one that
// failed after an earlier report counts under that report's band.
func TestBandCounts_FailedApart(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	editor, _ := mustKey(t, db, "Office F", service.RoleEditor)
	queued, _, _ := db.CreateSubmission(ctx, newSub(editor, "q", ""))
	failed, _, _ := db.CreateSubmission(ctx, newSub(editor, "f", ""))
	rerun, _, _ := db.CreateSubmission(ctx, newSub(editor, "r", ""))
	saveReport(t, db, rerun.ID, 90)
	for _, id := range []string{failed.ID, rerun.ID} {
		if err := db.MarkFailed(ctx, id, "attempt 1 of 1: context deadline exceeded"); err != nil {
			t.Fatal(err)
		}
	}
	counts, err := db.BandCounts(ctx, editor.Scope())
	want := map[string]int{"": 1, service.StatusFailed: 1, checks.BandLow: 1}
	if err != nil || len(counts) != len(want) {
		t.Fatalf("counts %v (%v), want %v", counts, err, want)
	}
	for k, n := range want {
		if counts[k] != n {
			t.Errorf("counts[%q] = %d, want %d (all: %v; queued %s)", k, counts[k], n, counts, queued.ID)
		}
	}
}

// The package and the data part come back byte for byte, to the scopes
// that may see the submission; a package without a data part has none.
func TestSubmissionPackage(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	author, _ := mustKey(t, db, "Office P", service.RoleSubmitter)
	editor, _ := mustKey(t, db, "Office P", service.RoleEditor)
	another, _ := mustKey(t, db, "Office P", service.RoleSubmitter)
	other, _ := mustKey(t, db, "Office Q", service.RoleEditor)
	n := newSub(author, "h1", "")
	n.Data = []byte("a,b\n1,2\n")
	withData, _, _ := db.CreateSubmission(ctx, n)
	bare, _, _ := db.CreateSubmission(ctx, newSub(author, "h2", ""))
	for _, k := range []*service.Key{author, editor} {
		pkg, data, err := db.SubmissionPackage(ctx, withData.ID, k.Scope())
		if err != nil || string(pkg) != `{"title": "x"}` || string(data) != "a,b\n1,2\n" {
			t.Errorf("%s: %q %q %v", k.Role, pkg, data, err)
		}
	}
	if _, data, err := db.SubmissionPackage(ctx, bare.ID, editor.Scope()); err != nil || data != nil {
		t.Errorf("without a data part: %q %v", data, err)
	}
	for _, k := range []*service.Key{another, other} {
		if _, _, err := db.SubmissionPackage(ctx, withData.ID, k.Scope()); service.ErrorCode(err) != service.ENotFound {
			t.Errorf("key %d of office %d sees another's package: %v", k.ID, k.OfficeID, err)
		}
	}
	if _, _, err := db.SubmissionPackage(ctx, "not-a-uuid", editor.Scope()); service.ErrorCode(err) != service.ENotFound {
		t.Errorf("a malformed id: %v", err)
	}
}
