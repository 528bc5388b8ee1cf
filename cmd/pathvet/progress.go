package main

import (
	"fmt"
	"io"
	"os"
	"sync"
	"time"
)

// progressLine draws how far a screening is on one line of a terminal,
// redrawn at most ten times a second, and wipes it when done.
type progressLine struct {
	w     io.Writer
	mu    sync.Mutex
	last  time.Time
	drawn bool
}

// newProgressLine returns a progress line on w, or nil when w is not a
// terminal or quiet is set.
func newProgressLine(w io.Writer, quiet bool) *progressLine {
	if quiet || !isTerminal(w) {
		return nil
	}
	return &progressLine{w: w}
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// update is a checks.Options.Progress.
func (p *progressLine) update(stage string, done, total int) {
	p.mu.Lock()
	defer p.mu.Unlock()
	if now := time.Now(); done == 0 || done == total || now.Sub(p.last) >= 100*time.Millisecond {
		p.last, p.drawn = now, true
		fmt.Fprintf(p.w, "\r\033[Kpathvet: %s: %d of %d done", stage, done, total)
	}
}

// clear wipes the line, so that what follows starts on a clean one.
func (p *progressLine) clear() {
	if p == nil {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.drawn {
		fmt.Fprint(p.w, "\r\033[K")
	}
}

// callback returns the checks' progress callback: nil without a line.
func (p *progressLine) callback() func(string, int, int) {
	if p == nil {
		return nil
	}
	return p.update
}
