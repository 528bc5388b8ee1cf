package api

import (
	"strings"
	"testing"
)

// TestExplainFailure: each reason the server records (the formats of
// store/jobs.go, store/reconcile.go and service.CheckMemory, with the
// errors they wrap) is told in words with what to do, never as the raw
// error; an unknown one still says to screen it again.
func TestExplainFailure(t *testing.T) {
	for _, tc := range []struct{ reason, what, todo string }{
		{"attempt 1 of 1: context deadline exceeded", "ran out of time", "longer time limit"},
		{"screening failed after 4 attempts; last error: checks: missing-data: context deadline exceeded",
			"ran out of time", "--job-timeout"},
		{"attempt 1 of 4: permanent\nthe data (100000 rows × 30 columns) need about 1900 MiB to screen; the " +
			"workers are given 900 MiB", "too large for the memory", "--job-memory-mib"},
		{"the worker stopped twice; the package may need more memory than the worker has", "stopped before it finished",
			"more memory"},
		{"the worker stopped for a shutdown; the job went back to the queue", "was shut down", "Nothing to do"},
		{"attempt 1 of 4: permanent\ninvalid package:\n/claims/0/from: no such variable", "did not pass the package checks",
			"new submission"},
		{"internal error: runtime error: index out of range", "internal error", "server log"},
		{"the screening job was cancelled", "cancelled", "Screen it again"},
		{"something new", "did not finish", "Screen it again"},
	} {
		f := explainFailure(tc.reason)
		if !strings.Contains(f.What, tc.what) || !strings.Contains(f.Todo, tc.todo) || f.Short == "" {
			t.Errorf("%q: %+v, want %q and %q", tc.reason, f, tc.what, tc.todo)
		}
		for _, raw := range []string{"deadline exceeded", "attempt 1 of", "permanent"} {
			if strings.Contains(f.Sentence()+f.Short, raw) {
				t.Errorf("%q: the words repeat the raw %q", tc.reason, raw)
			}
		}
	}
}
