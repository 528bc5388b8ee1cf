package store

import (
	"context"
	"sync"
	"time"

	"github.com/pathvet/pathvet/checks"
)

// progressEvery is how often at most a job's progress is written; the
// first write comes after it, so a short screening writes none.
const progressEvery = time.Second

// progressWriteTimeout bounds one write of progress: a slow database
// delays the progress shown, never the screening.
const progressWriteTimeout = 2 * time.Second

// progressWriter keeps the latest progress a screening reported and
// writes it to its submission at most once per progressEvery, from a
// goroutine of its own: the callback only stores the value, so it never
// waits for the database.
type progressWriter struct {
	mu     sync.Mutex
	latest progressValue
	dirty  bool
}

type progressValue struct {
	stage       string
	done, total int
}

// report is the screening's callback: it keeps the value, nothing more.
func (p *progressWriter) report(stage string, done, total int) {
	p.mu.Lock()
	p.latest, p.dirty = progressValue{stage, done, total}, true
	p.mu.Unlock()
}

// take returns the latest value if it is new since the last take.
func (p *progressWriter) take() (progressValue, bool) {
	p.mu.Lock()
	defer p.mu.Unlock()
	v, ok := p.latest, p.dirty
	p.dirty = false
	return v, ok
}

// run writes new values with write every progressEvery until ctx ends.
func (p *progressWriter) run(ctx context.Context, write func(context.Context, progressValue) error,
	logErr func(error)) {
	tick := time.NewTicker(progressEvery)
	defer tick.Stop()
	for {
		select {
		case <-ctx.Done():
			return
		case <-tick.C:
		}
		v, ok := p.take()
		if !ok {
			continue
		}
		wctx, cancel := context.WithTimeout(ctx, progressWriteTimeout)
		if err := write(wctx, v); err != nil && ctx.Err() == nil {
			logErr(err)
		}
		cancel()
	}
}

// screen runs the screening with a progress callback whose values are
// written to the submission while it runs; the writer has stopped when
// screen returns, so no write lands after the attempt ends.
func (w *screenWorker) screen(ctx context.Context, id string, pkg, data []byte) (*checks.Report, error) {
	p := &progressWriter{}
	wctx, stop := context.WithCancel(ctx)
	var wg sync.WaitGroup
	wg.Go(func() {
		p.run(wctx, func(ctx context.Context, v progressValue) error {
			return w.db.SetProgress(ctx, id, v.stage, v.done, v.total)
		}, func(err error) { w.logger().Warn("writing progress", "submission_id", id, "error", err) })
	})
	defer wg.Wait()
	defer stop()
	return w.cfg.Screen(ctx, pkg, data, p.report)
}
