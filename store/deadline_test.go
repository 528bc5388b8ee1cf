package store

import (
	"testing"
	"time"

	"github.com/riverqueue/river"
)

// The deadline is the base plus a minute per 10 million cells, capped at
// the largest package; worked by hand.
var jobTimeoutTests = []struct {
	cells int64
	want  time.Duration
}{
	{0, 2 * time.Minute},
	{-5, 2 * time.Minute},
	{5_000_000, 2*time.Minute + 30*time.Second},
	{10_000_000, 3 * time.Minute},
	{60_000_000, 8 * time.Minute},                   // 2,000,000 rows × 30 variables
	{1_000_000_000, 7*time.Minute + 12*time.Second}, // capped at MaxCells, 52 million cells: 5.2 min
}

func TestWorkerConfig_JobTimeout(t *testing.T) {
	c := WorkerConfig{Timeout: 2 * time.Minute, PerTenMillionCells: time.Minute, MaxCells: 80_000_000}
	for _, tc := range jobTimeoutTests[:5] {
		if got := c.JobTimeout(tc.cells); got != tc.want {
			t.Errorf("JobTimeout(%d) = %v, want %v", tc.cells, got, tc.want)
		}
		w := &screenWorker{cfg: c}
		if got := w.Timeout(&river.Job[ScreenArgs]{Args: ScreenArgs{Cells: tc.cells}}); got != tc.want {
			t.Errorf("the worker's Timeout for %d cells = %v, want %v", tc.cells, got, tc.want)
		}
	}
	c.MaxCells = 52_000_000
	if tc := jobTimeoutTests[5]; c.JobTimeout(tc.cells) != tc.want {
		t.Errorf("JobTimeout(%d) past MaxCells = %v, want %v", tc.cells, c.JobTimeout(tc.cells), tc.want)
	}
}

// RescueAfter is kept when it is past the largest deadline, else raised
// to it and a minute; without MaxCells no cells are counted.
func TestWorkerConfig_RescueAfter(t *testing.T) {
	for _, tc := range []struct {
		cfg  WorkerConfig
		want time.Duration
	}{
		{WorkerConfig{Timeout: 2 * time.Minute, RescueAfter: 5 * time.Minute}, 5 * time.Minute},
		{WorkerConfig{Timeout: 2 * time.Minute}, 3 * time.Minute},
		{WorkerConfig{Timeout: 2 * time.Minute, RescueAfter: 5 * time.Minute, PerTenMillionCells: time.Minute,
			MaxCells: 50_000_000}, 8 * time.Minute},
		{WorkerConfig{Timeout: 2 * time.Minute, RescueAfter: 7 * time.Minute, PerTenMillionCells: time.Minute,
			MaxCells: 50_000_000}, 8 * time.Minute},
		{WorkerConfig{Timeout: 2 * time.Minute, RescueAfter: 20 * time.Minute, PerTenMillionCells: time.Minute,
			MaxCells: 50_000_000}, 20 * time.Minute},
	} {
		if got := tc.cfg.rescueAfter(); got != tc.want {
			t.Errorf("%+v: rescue after %v, want %v", tc.cfg, got, tc.want)
		}
	}
	if got := (WorkerConfig{Timeout: time.Minute, PerTenMillionCells: time.Minute}).JobTimeout(1e9); got != time.Minute {
		t.Errorf("without MaxCells the deadline grew to %v", got)
	}
}
