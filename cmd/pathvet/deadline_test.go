package main

import (
	"context"
	"log/slog"
	"strings"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// deadlineSlack is how long past its deadline an attempt may take to
// return: the requirement is one second, kept as it is on the shared
// two-core machine (the loops check their context at every iteration, and
// one iteration over the rows below takes well under that).
const deadlineSlack = time.Second

// A job at its deadline really stops: the real River workers and
// PostgreSQL, a raw-data package with missing cells whose screening takes
// far longer than the job timeout (slowPackage's 100,000 rows, about 6 s:
// EM, its bootstrap and 20 imputations), a timeout of 1.5 s. The attempt is recorded as failed by
// the deadline, and it ended within the slack of it (both times from the
// queue's own record of the attempt), and the one worker slot is free
// again: a small package queued behind it is screened.
func TestWorker_JobAtItsDeadlineReturns(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	_, k := storetest.MustKey(t, db, "Office D", service.RoleEditor)
	ctx := context.Background()
	pkg, csv := slowPackage(t, 100_000)
	slow, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Title: "slow", PackageSHA256: "slow",
		Package: pkg, Data: csv})
	if err != nil {
		t.Fatal(err)
	}
	small, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Title: "small", PackageSHA256: "small",
		Package: readFile(t, "../../testdata/demo/tutoring-anxiety/package.json")})
	if err != nil {
		t.Fatal(err)
	}
	cfg := defaultConfig(func(string) string { return "" })
	cfg.DatabaseURL, cfg.Workers, cfg.JobTimeout = url, 1, 1500*time.Millisecond
	events := make(logEvents, 1024)
	m := &Main{Config: cfg, Logger: slog.New(events)}
	if err := m.Run(ctx); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(m.Kill)
	took := firstAttempt(t, events, slow.ID)
	t.Logf("the attempt ended %v after it started (deadline %v)", took, cfg.JobTimeout)
	var reason string
	if err := m.DB.Pool.QueryRow(ctx, `SELECT error FROM submissions WHERE id = $1`, slow.ID).Scan(&reason); err != nil ||
		!strings.Contains(reason, "attempt 1 of") ||
		!strings.Contains(reason, "deadline exceeded") {
		t.Fatalf("the slow submission's error is %q (%v), want its first attempt ended by the deadline", reason, err)
	}
	if took > cfg.JobTimeout+deadlineSlack {
		t.Fatalf("the attempt ended %v after it started: more than %v past its deadline of %v",
			took, deadlineSlack, cfg.JobTimeout)
	}
	waitStatus(t, m, small.ID, service.StatusDone)
}

// logEvents is a slog handler that hands each record's time, message and
// submission on to a channel.
type logEvents chan logEvent

type logEvent struct {
	at       time.Time
	msg, sub string
}

func (h logEvents) Enabled(context.Context, slog.Level) bool { return true }
func (h logEvents) WithAttrs([]slog.Attr) slog.Handler       { return h }
func (h logEvents) WithGroup(string) slog.Handler            { return h }

func (h logEvents) Handle(_ context.Context, r slog.Record) error {
	e := logEvent{at: r.Time, msg: r.Message}
	r.Attrs(func(a slog.Attr) bool {
		if a.Key == "submission_id" {
			e.sub = a.Value.String()
		}
		return true
	})
	select {
	case h <- e:
	default:
	}
	return nil
}

// firstAttempt returns how long the first attempt at a submission ran, by
// the worker's log: from "screening started" to the queue's word that the
// job errored (logged once the work function has returned), and whether
// that came.
func firstAttempt(t *testing.T, events logEvents, id string) time.Duration {
	t.Helper()
	var started time.Time
	timeout := time.After(3 * time.Minute)
	for {
		select {
		case e := <-events:
			switch {
			case e.msg == "screening started" && started.IsZero():
				if e.sub != id {
					t.Fatalf("the first job started was %s, want the slow %s", e.sub, id)
				}
				started = e.at
			case strings.Contains(e.msg, "Job errored") && !started.IsZero():
				return e.at.Sub(started)
			}
		case <-timeout:
			t.Fatal("the slow job's first attempt never ended")
		}
	}
}

// waitStatus waits for a submission to reach a status.
func waitStatus(t *testing.T, m *Main, id, status string) {
	t.Helper()
	var got string
	for end := time.Now().Add(3 * time.Minute); time.Now().Before(end); time.Sleep(100 * time.Millisecond) {
		if err := m.DB.Pool.QueryRow(context.Background(), `SELECT status FROM submissions WHERE id = $1`, id).
			Scan(&got); err == nil && got == status {
			return
		}
	}
	t.Fatalf("submission %s is %q, want %q: the worker slot never came free", id, got, status)
}
