package main

import (
	"context"
	"errors"
	"log/slog"
	"runtime"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// A job at its deadline really stops: the real River workers and
// PostgreSQL, a raw-data package with missing cells whose screening takes
// far longer than the job timeout (slowPackage's 100,000 rows, about 6 s
// on the development machine: EM, its bootstrap and 20 imputations), a
// timeout of 1.5 s. The evidence is the screening's own, not a clock, so
// that a loaded machine cannot fail it: the attempt is recorded as failed
// by the deadline; its screening returned the deadline's error without
// reaching its end; once its context had ended it did no more work than
// the units in hand (stoppedInTime); it had returned before the queue
// heard the attempt end, and reported nothing afterwards; and the one
// worker slot is free again: a small package queued behind it is screened.
// A screening that ignores its context runs to its end, or on past its
// deadline unit by unit, and fails here however fast the machine.
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
	attempt := &attemptTrace{}
	cfg.wrapScreen = attempt.wrapFirstWithData
	events := make(logEvents, 1024)
	m := &Main{Config: cfg, Logger: slog.New(events)}
	if err := m.Run(ctx); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(m.Kill)
	took := firstAttempt(t, events, slow.ID)
	t.Logf("the attempt ended %v after it started (deadline %v; measured, not held to a bound)", took, cfg.JobTimeout)
	attempt.stoppedInTime(t)
	var reason string
	if err := m.DB.Pool.QueryRow(ctx, `SELECT error FROM submissions WHERE id = $1`, slow.ID).Scan(&reason); err != nil ||
		!strings.Contains(reason, "attempt 1 of") ||
		!strings.Contains(reason, "deadline exceeded") {
		t.Fatalf("the slow submission's error is %q (%v), want its first attempt ended by the deadline", reason, err)
	}
	waitStatus(t, m, small.ID, service.StatusDone)
	attempt.quietAfterReturn(t)
}

// The screening stops when its context ends, whatever the machine's speed:
// the context of a screening of slowPackage ends as its first imputation
// is reported (the deadline made to fall there), and the screening
// returns the context's error with at most the imputations the other
// workers held reported after it, never its end. A screening whose
// imputations ignore the context would report all twenty.
func TestScreen_StopsWhenItsContextEnds(t *testing.T) {
	pkg, csv := slowPackage(t, 20_000)
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	var mu sync.Mutex
	ended, late, reachedEnd := false, 0, false
	progress := func(stage string, done, total int) {
		mu.Lock()
		defer mu.Unlock()
		switch {
		case stage == "checks" && done == total:
			reachedEnd = true
		case ended:
			late++
		case strings.HasPrefix(stage, "missing data: imputations"):
			ended = true
			cancel()
		}
	}
	_, err := screenFunc(defaultConfig(func(string) string { return "" }))(ctx, pkg, csv, progress)
	mu.Lock()
	defer mu.Unlock()
	if !ended || !errors.Is(err, context.Canceled) || reachedEnd {
		t.Fatalf("the screening returned %v (context ended at the first imputation: %v; its end reported: %v), "+
			"want the context's error before its end", err, ended, reachedEnd)
	}
	if held := runtime.GOMAXPROCS(0) - 1; late > held {
		t.Fatalf("after its context ended the screening reported %d more units, more than the other workers "+
			"held (%d)", late, held)
	}
}

// attemptTrace records what the first attempt at a screening with raw
// data did: each progress report its screening made, whether the
// attempt's context had ended by then, and how the screening returned.
type attemptTrace struct {
	mu       sync.Mutex
	begun    bool
	ctx      context.Context
	reports  []tracedReport
	returned bool
	err      error
	// afterReturn counts the reports made after the screening returned.
	afterReturn int
}

type tracedReport struct {
	stage       string
	done, total int
	late        bool // the attempt's context had ended
}

// wrapFirstWithData is a Config.wrapScreen that traces the first
// screening with raw data (the slow package's first attempt).
func (a *attemptTrace) wrapFirstWithData(next store.ScreenFunc) store.ScreenFunc {
	return func(ctx context.Context, pkg, data []byte, progress store.ProgressFunc) (*checks.Report, error) {
		a.mu.Lock()
		traced := !a.begun && len(data) > 0
		if traced {
			a.begun, a.ctx = true, ctx
		}
		a.mu.Unlock()
		if !traced {
			return next(ctx, pkg, data, progress)
		}
		rep, err := next(ctx, pkg, data, func(stage string, done, total int) {
			a.report(stage, done, total)
			progress(stage, done, total)
		})
		a.mu.Lock()
		a.returned, a.err = true, err
		a.mu.Unlock()
		return rep, err
	}
}

func (a *attemptTrace) report(stage string, done, total int) {
	a.mu.Lock()
	defer a.mu.Unlock()
	if a.returned {
		a.afterReturn++
		return
	}
	a.reports = append(a.reports, tracedReport{stage, done, total, a.ctx.Err() != nil})
}

// stoppedInTime holds the attempt, which the queue has said ended, to
// having stopped at its deadline: its screening had returned, with the
// deadline's error; it never reported its end ("checks", all done); and
// once its context had ended it reported at most one unit per imputation
// worker (each may finish the imputation it holds; none is handed out
// after the deadline) and the check the pipeline was then starting.
func (a *attemptTrace) stoppedInTime(t *testing.T) {
	t.Helper()
	a.mu.Lock()
	defer a.mu.Unlock()
	if !a.returned {
		t.Fatal("the queue heard the attempt end while its screening was still running")
	}
	var late []tracedReport
	for _, r := range a.reports {
		if r.stage == "checks" && r.done == r.total {
			t.Fatalf("the attempt's screening ran to its end (%d checks) past its deadline: it does not watch "+
				"its context", r.total)
		}
		if r.late {
			late = append(late, r)
		}
	}
	if n := len(a.reports) - len(late); n > 0 {
		t.Logf("before the deadline the screening reached %+v", a.reports[n-1])
	}
	if !errors.Is(a.err, context.DeadlineExceeded) {
		t.Fatalf("the attempt's screening returned %v, want the deadline's error", a.err)
	}
	if len(late) > runtime.GOMAXPROCS(0)+1 {
		t.Fatalf("after its deadline the screening went on to report %d units of work (%+v ... %+v): more than "+
			"the %d its imputation workers held and the check then starting", len(late), late[0], late[len(late)-1],
			runtime.GOMAXPROCS(0)+1)
	}
}

// quietAfterReturn: nothing of the attempt's work reported progress after
// its screening had returned (no computation left running).
func (a *attemptTrace) quietAfterReturn(t *testing.T) {
	t.Helper()
	a.mu.Lock()
	defer a.mu.Unlock()
	if a.afterReturn > 0 {
		t.Fatalf("the attempt's work reported progress %d times after its screening had returned", a.afterReturn)
	}
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
