package store

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"log/slog"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/riverqueue/river"
	"github.com/riverqueue/river/riverdriver/riverpgxv5"
	"github.com/riverqueue/river/rivertype"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
)

// ScreenArgs is the job that screens one submission.
type ScreenArgs struct {
	SubmissionID string `json:"submission_id"`
}

// Kind names the job kind in the queue.
func (ScreenArgs) Kind() string { return "screen_submission" }

// InsertOpts: a few attempts, with River's exponential backoff between
// them.
func (ScreenArgs) InsertOpts() river.InsertOpts { return river.InsertOpts{MaxAttempts: 4} }

// ScreenFunc runs the pipeline on a stored package and its data.
type ScreenFunc func(ctx context.Context, pkg, data []byte) (*checks.Report, error)

// ErrPermanent marks a screening error that no retry can mend (an invalid
// package, say).
var ErrPermanent = errors.New("permanent")

// WorkerConfig configures the queue's workers.
type WorkerConfig struct {
	Workers int           // concurrent jobs in this process
	Timeout time.Duration // per job
	// RescueAfter is how long a job may stay running before it counts as
	// stuck (its worker died) and is retried.
	RescueAfter time.Duration
	Logger      *slog.Logger
	Screen      ScreenFunc
	// OnDone, when set, is called after each job ends (for metrics).
	OnDone func(status string, took time.Duration)
}

type screenWorker struct {
	river.WorkerDefaults[ScreenArgs]
	db  *DB
	cfg WorkerConfig
}

func (w *screenWorker) Timeout(*river.Job[ScreenArgs]) time.Duration { return w.cfg.Timeout }

// Work screens the submission and stores the report. A submission deleted
// meanwhile ends the job quietly; the last failed attempt marks the
// submission failed with its reason.
func (w *screenWorker) Work(ctx context.Context, job *river.Job[ScreenArgs]) error {
	start := time.Now()
	id := job.Args.SubmissionID
	pkg, data, err := w.db.Claim(ctx, id)
	if service.ErrorCode(err) == service.ENotFound {
		return nil
	}
	if err != nil {
		return err
	}
	rep, err := w.cfg.Screen(ctx, pkg, data)
	if err == nil {
		err = w.db.SaveReport(ctx, id, rep, time.Since(start))
	}
	if err == nil {
		w.done(service.StatusDone, start)
		return nil
	}
	final := errors.Is(err, ErrPermanent) || job.Attempt >= job.MaxAttempts
	reason := fmt.Sprintf("attempt %d of %d: %v", job.Attempt, job.MaxAttempts, err)
	bg := context.WithoutCancel(ctx)
	if final {
		if ferr := w.db.MarkFailed(bg, id, reason); ferr != nil {
			return ferr
		}
		w.done(service.StatusFailed, start)
		return river.JobCancel(err)
	}
	_ = w.db.NoteAttemptError(bg, id, reason)
	return err
}

func (w *screenWorker) done(status string, start time.Time) {
	if w.cfg.OnDone != nil {
		w.cfg.OnDone(status, time.Since(start))
	}
}

// panicHandler turns a worker panic on its last attempt into a failed
// submission, as an error would.
type panicHandler struct{ db *DB }

func (h panicHandler) HandleError(context.Context, *rivertype.JobRow, error) *river.ErrorHandlerResult {
	return nil
}

func (h panicHandler) HandlePanic(ctx context.Context, job *rivertype.JobRow, v any, trace string) *river.ErrorHandlerResult {
	var args ScreenArgs
	if err := unmarshalArgs(job, &args); err == nil && job.Attempt >= job.MaxAttempts {
		_ = h.db.MarkFailed(context.WithoutCancel(ctx), args.SubmissionID, fmt.Sprintf("internal error: %v", v))
	}
	return nil
}

func unmarshalArgs(job *rivertype.JobRow, v any) error { return json.Unmarshal(job.EncodedArgs, v) }

// Workers is a running set of queue workers.
type Workers struct{ client *river.Client[pgx.Tx] }

// StartWorkers starts workers that screen queued submissions.
func (db *DB) StartWorkers(ctx context.Context, cfg WorkerConfig) (*Workers, error) {
	ws := river.NewWorkers()
	if err := river.AddWorkerSafely(ws, &screenWorker{db: db, cfg: cfg}); err != nil {
		return nil, err
	}
	rescue := cfg.RescueAfter
	if rescue < cfg.Timeout {
		rescue = cfg.Timeout + time.Minute
	}
	client, err := river.NewClient(riverpgxv5.New(db.Pool), &river.Config{
		Queues:               map[string]river.QueueConfig{river.QueueDefault: {MaxWorkers: max(cfg.Workers, 1)}},
		Workers:              ws,
		JobTimeout:           cfg.Timeout,
		RescueStuckJobsAfter: rescue,
		ErrorHandler:         panicHandler{db: db},
		Logger:               cfg.Logger,
		FetchCooldown:        50 * time.Millisecond,
		FetchPollInterval:    500 * time.Millisecond,
	})
	if err != nil {
		return nil, fmt.Errorf("store: workers: %w", err)
	}
	if err := client.Start(ctx); err != nil {
		return nil, fmt.Errorf("store: start workers: %w", err)
	}
	return &Workers{client: client}, nil
}

// Stop lets running jobs finish, up to ctx's deadline, then cancels them
// (they are retried by another worker).
func (w *Workers) Stop(ctx context.Context) error {
	err := w.client.Stop(ctx)
	if errors.Is(err, context.DeadlineExceeded) || errors.Is(err, context.Canceled) {
		return w.client.StopAndCancel(context.Background())
	}
	return err
}

// Kill cancels running jobs at once, as a crash would leave them to be
// retried; for tests and for a second interrupt.
func (w *Workers) Kill(ctx context.Context) error { return w.client.StopAndCancel(ctx) }
