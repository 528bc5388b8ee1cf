package api

import "strings"

// A failed screening as the pages tell it: what happened and what to do,
// in words, from the reason the server recorded (which the API keeps
// verbatim in a submission's error field, and the pages show beneath).

// failure is a failed screening in words: what happened, what to do, and
// both in a few words for the dashboard.
type failure struct {
	What, Todo, Short string
}

// failures are the recorded reasons pathvet knows, each by a phrase its
// reason contains (store/jobs.go, store/reconcile.go, api/service's
// memory check), in the order they are tried.
var failures = []struct {
	phrase string
	words  failure
}{
	{"stopped for a shutdown", failure{
		What:  "The worker that was screening it was shut down before it finished; the job went back to the queue.",
		Todo:  "Nothing to do: the next worker to start takes it up.",
		Short: "its worker was shut down; it waits for the next one"}},
	{"deadline exceeded", failure{
		What: "The screening ran out of time: it took longer than the server allows a package of this size, " +
			"and was stopped before it finished.",
		Todo: "Screen it again when the server is less busy. If it runs out of time again, ask the " +
			"service's administrator for a longer time limit (pathvet serve --job-timeout and " +
			"--job-time-per-10m-cells).",
		Short: "it ran out of time; screen it again, or ask for a longer time limit"}},
	{"MiB to screen", failure{
		What: "The data are too large for the memory the server gives one screening.",
		Todo: "Send a package with fewer rows or columns, or ask the service's administrator to raise " +
			"the memory per screening (pathvet serve --job-memory-mib).",
		Short: "the data need more memory than a screening is given"}},
	{"the worker stopped", failure{
		What: "The worker that was screening it stopped before it finished; the package may need more " +
			"memory than the worker has.",
		Todo: "Screen it again; if it stops again, ask the service's administrator to give the workers " +
			"more memory.",
		Short: "the worker stopped before it finished; screen it again"}},
	{"invalid package", failure{
		What:  "The stored package did not pass the package checks when the worker read it.",
		Todo:  "Correct the problems listed below and send the package again as a new submission.",
		Short: "the stored package did not pass the package checks"}},
	{"internal error", failure{
		What: "pathvet met an internal error while screening it.",
		Todo: "Screen it again; if it fails again, tell the service's administrator, whose server log " +
			"has the details.",
		Short: "an internal error; screen it again"}},
	{"cancelled", failure{
		What:  "The screening was cancelled on the server before it finished.",
		Todo:  "Screen it again.",
		Short: "it was cancelled; screen it again"}},
}

// otherFailure is the words for a reason pathvet does not know.
var otherFailure = failure{
	What:  "The screening did not finish.",
	Todo:  "Screen it again; if it fails again, tell the service's administrator what the server recorded.",
	Short: "it did not finish; screen it again",
}

// explainFailure turns a recorded reason into words.
func explainFailure(reason string) failure {
	for _, f := range failures {
		if strings.Contains(reason, f.phrase) {
			return f.words
		}
	}
	return otherFailure
}

// Sentence is what happened and what to do, as one paragraph.
func (f failure) Sentence() string { return f.What + " " + f.Todo }
