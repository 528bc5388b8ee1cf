package store

import (
	"cmp"
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
	// Cells counts the package's raw data cells; the deadline grows with
	// it (WorkerConfig.JobTimeout).
	Cells int64 `json:"cells,omitempty"`
}

// Kind names the job kind in the queue.
func (ScreenArgs) Kind() string { return "screen_submission" }

// InsertOpts: a few attempts, with River's exponential backoff between
// them.
func (ScreenArgs) InsertOpts() river.InsertOpts { return river.InsertOpts{MaxAttempts: 4} }

// ScreenFunc runs the pipeline on a stored package and its data, telling
// progress how far it is (a checks.Options.Progress: calls come one at a
// time, from any goroutine, and return at once).
type ScreenFunc func(ctx context.Context, pkg, data []byte, progress ProgressFunc) (*checks.Report, error)

// ProgressFunc hears a screening's stage and how many of its units are
// done.
type ProgressFunc func(stage string, done, total int)

// ErrPermanent marks a screening error that no retry can mend (an invalid
// package, say).
var ErrPermanent = errors.New("permanent")

// WorkerConfig configures the queue's workers.
type WorkerConfig struct {
	Workers int           // concurrent jobs in this process
	Timeout time.Duration // per job, before the term for its size
	// PerTenMillionCells is added to a job's deadline per 10 million data
	// cells, counted up to MaxCells (the most a package can have under the
	// limits; 0 counts none).
	PerTenMillionCells time.Duration
	MaxCells           int64
	// RescueAfter is how long a job may stay running before it counts as
	// stuck (its worker died) and is retried; StartWorkers raises it past
	// the largest deadline.
	RescueAfter time.Duration
	Logger      *slog.Logger
	Screen      ScreenFunc
	// ReconcileEvery is how often a submission whose job the queue gave up
	// on (discarded after its last attempt, or cancelled) is marked failed;
	// default one minute.
	ReconcileEvery time.Duration
	// Egress is the way out to webhook receivers (the allow-list); nil
	// refuses every address of a refused class.
	Egress *service.Egress
	// OnDone, when set, is called after each job ends (for metrics).
	OnDone func(status string, took time.Duration)
	// afterFinish runs after the transaction that ended a screening has
	// committed; its error is the job's (tests stand in a crash there).
	afterFinish func(context.Context) error
}

type screenWorker struct {
	river.WorkerDefaults[ScreenArgs]
	db  *DB
	cfg WorkerConfig
	// gate closes when Stop begins: a job fetched after it is handed back
	// to the queue unstarted.
	gate *gate
}

// Timeout is the job's deadline: the base and the term for its size.
func (w *screenWorker) Timeout(job *river.Job[ScreenArgs]) time.Duration {
	return w.cfg.JobTimeout(job.Args.Cells)
}

// Work screens the submission and stores the report. A submission deleted
// meanwhile ends the job quietly; the last failed attempt marks the
// submission failed with its reason.
func (w *screenWorker) Work(ctx context.Context, job *river.Job[ScreenArgs]) error {
	start := time.Now()
	id := job.Args.SubmissionID
	if !w.gate.enter(id, job.Attempt) {
		return river.JobSnooze(time.Second)
	}
	pkg, data, err := w.db.Claim(ctx, id)
	if service.ErrorCode(err) == service.ENotFound {
		return nil
	}
	if err != nil {
		return err
	}
	rep, err := w.screen(ctx, id, pkg, data)
	if err == nil {
		err = w.finish(ctx, job, rep, start)
	}
	if err == nil {
		w.done(service.StatusDone, start)
		if w.cfg.afterFinish != nil {
			return w.cfg.afterFinish(ctx)
		}
		return nil
	}
	return w.failed(ctx, job, err, start)
}

// finish stores the report, queues its webhook delivery and completes the
// job in one transaction: a worker that dies after it commits leaves
// nothing to run again, and one that dies before leaves nothing done.
func (w *screenWorker) finish(ctx context.Context, job *river.Job[ScreenArgs], rep *checks.Report,
	start time.Time) error {
	return w.db.finishWith(ctx, job.Args.SubmissionID, rep, time.Since(start), func(tx pgx.Tx) error {
		_, err := river.JobCompleteTx[*riverpgxv5.Driver](ctx, tx, job)
		return err
	})
}

// failed records a failed attempt: released unspent when the workers are
// stopping (JobSnooze does not count an attempt), failed for good on a
// permanent error or the last attempt, queued again otherwise.
func (w *screenWorker) failed(ctx context.Context, job *river.Job[ScreenArgs], err error, start time.Time) error {
	id, bg := job.Args.SubmissionID, context.WithoutCancel(ctx)
	if ctx.Err() != nil && w.gate.isClosed() {
		const released = "the worker stopped for a shutdown; the job went back to the queue"
		if nerr := w.db.NoteAttemptError(bg, id, released); nerr != nil {
			w.logger().Error("releasing a job at shutdown", "submission_id", id, "error", nerr)
		}
		return river.JobSnooze(0)
	}
	reason := fmt.Sprintf("attempt %d of %d: %v", job.Attempt, job.MaxAttempts, err)
	if errors.Is(err, ErrPermanent) || job.Attempt >= job.MaxAttempts {
		if ferr := w.db.MarkFailed(bg, id, reason); ferr != nil {
			return ferr
		}
		w.done(service.StatusFailed, start)
		return river.JobCancel(err)
	}
	if nerr := w.db.NoteAttemptError(bg, id, reason); nerr != nil {
		w.logger().Error("recording a failed attempt", "submission_id", id, "attempt", job.Attempt, "error", nerr)
	}
	return err
}

func (w *screenWorker) logger() *slog.Logger {
	if w.cfg.Logger != nil {
		return w.cfg.Logger
	}
	return slog.Default()
}

func (w *screenWorker) done(status string, start time.Time) {
	if w.cfg.OnDone != nil {
		w.cfg.OnDone(status, time.Since(start))
	}
}

// panicHandler turns a worker panic on its last attempt into a failed
// submission, as an error would.
type panicHandler struct {
	db     *DB
	logger *slog.Logger
}

func (h panicHandler) HandleError(context.Context, *rivertype.JobRow, error) *river.ErrorHandlerResult {
	return nil
}

func (h panicHandler) HandlePanic(ctx context.Context, job *rivertype.JobRow, v any,
	trace string) *river.ErrorHandlerResult {
	var args ScreenArgs
	if err := unmarshalArgs(job, &args); err == nil && job.Attempt >= job.MaxAttempts {
		reason := fmt.Sprintf("internal error: %v", v)
		if err := h.db.MarkFailed(context.WithoutCancel(ctx), args.SubmissionID, reason); err != nil {
			h.logger.Error(
				"marking a submission failed after a panic",
				"submission_id",
				args.SubmissionID,
				"error",
				err,
			)
		}
	}
	return nil
}

func unmarshalArgs(job *rivertype.JobRow, v any) error { return json.Unmarshal(job.EncodedArgs, v) }

// Workers is a running set of queue workers.
type Workers struct {
	client *river.Client[pgx.Tx]
	gate   *gate
}

// StartWorkers starts workers that screen queued submissions.
func (db *DB) StartWorkers(ctx context.Context, cfg WorkerConfig) (*Workers, error) {
	ws := river.NewWorkers()
	g := &gate{logger: cmp.Or(cfg.Logger, slog.Default())}
	if err := river.AddWorkerSafely(ws, &screenWorker{db: db, cfg: cfg, gate: g}); err != nil {
		return nil, err
	}
	if err := river.AddWorkerSafely(ws, &reconcileWorker{db: db}); err != nil {
		return nil, err
	}
	deliver := &deliverWorker{db: db, client: webhookClient(cmp.Or(cfg.Egress, &service.Egress{})),
		logger: g.logger}
	if err := river.AddWorkerSafely(ws, deliver); err != nil {
		return nil, err
	}
	every := cmp.Or(cfg.ReconcileEvery, reconcileEvery)
	periodic := river.NewPeriodicJob(
		river.PeriodicInterval(every),
		func() (river.JobArgs, *river.InsertOpts) { return ReconcileArgs{}, nil },
		&river.PeriodicJobOpts{RunOnStart: true},
	)
	rescue := cfg.rescueAfter()
	if cfg.RescueAfter > 0 && rescue != cfg.RescueAfter {
		cmp.Or(cfg.Logger, slog.Default()).Info("rescue-after raised past the largest job deadline",
			"rescue_after", rescue.String(), "largest_deadline", cfg.JobTimeout(cfg.MaxCells).String())
	}
	client, err := river.NewClient(riverpgxv5.New(db.Pool), &river.Config{
		Queues:               map[string]river.QueueConfig{river.QueueDefault: {MaxWorkers: max(cfg.Workers, 1)}},
		Workers:              ws,
		JobTimeout:           cfg.Timeout,
		RescueStuckJobsAfter: rescue,
		ErrorHandler:         panicHandler{db: db, logger: cmp.Or(cfg.Logger, slog.Default())},
		PeriodicJobs:         []*river.PeriodicJob{periodic},
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
	return &Workers{client: client, gate: g}, nil
}

// Stop stops fetching jobs at once (a job fetched meanwhile goes back to
// the queue unstarted), lets running jobs finish up to ctx's deadline,
// then cancels them: they are released to be retried by another worker.
func (w *Workers) Stop(ctx context.Context) error {
	w.gate.close()
	err := w.client.Stop(ctx)
	if errors.Is(err, context.DeadlineExceeded) || errors.Is(err, context.Canceled) {
		release, cancel := context.WithTimeout(context.Background(), releaseTime)
		defer cancel()
		return w.client.StopAndCancel(release)
	}
	return err
}

// releaseTime bounds how long cancelled jobs may take to hand their work
// back when Stop's deadline has passed.
const releaseTime = 5 * time.Second

// Kill cancels running jobs at once, as a crash would leave them to be
// retried; for tests and for a second interrupt.
func (w *Workers) Kill(ctx context.Context) error {
	w.gate.close()
	return w.client.StopAndCancel(ctx)
}
