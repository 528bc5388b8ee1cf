package store

import (
	"log/slog"
	"sync"
)

// gate orders job starts against a stop: once closed no job starts, and
// the log shows every start before the line that says so.
type gate struct {
	mu     sync.Mutex
	closed bool
	logger *slog.Logger
}

func (g *gate) enter(id string, attempt int) bool {
	g.mu.Lock()
	defer g.mu.Unlock()
	if !g.closed {
		g.logger.Info("screening started", "submission_id", id, "attempt", attempt)
	}
	return !g.closed
}

func (g *gate) isClosed() bool {
	g.mu.Lock()
	defer g.mu.Unlock()
	return g.closed
}

func (g *gate) close() {
	g.mu.Lock()
	defer g.mu.Unlock()
	if !g.closed {
		g.closed = true
		g.logger.Info("workers stopping: no job starts from now")
	}
}
