package main

import (
	"bufio"
	"context"
	"encoding/json"
	"errors"
	"io"
	"net/http"
	"net/http/httptrace"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// process is a pathvet binary running as a child, its log lines kept.
type process struct {
	cmd   *exec.Cmd
	mu    sync.Mutex
	lines []map[string]any
	seen  chan map[string]any // each log line, as it comes
}

// buildBinary builds pathvet once into a test's temporary folder.
func buildBinary(t *testing.T) string {
	t.Helper()
	bin := filepath.Join(t.TempDir(), "pathvet")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

func startProcess(t *testing.T, bin string, args ...string) *process {
	t.Helper()
	p := &process{cmd: exec.Command(bin, args...), seen: make(chan map[string]any, 1024)}
	stderr, err := p.cmd.StderrPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := p.cmd.Start(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = p.cmd.Process.Kill() })
	go p.read(stderr)
	return p
}

func (p *process) read(r io.Reader) {
	sc := bufio.NewScanner(r)
	for sc.Scan() {
		var line map[string]any
		if json.Unmarshal(sc.Bytes(), &line) != nil {
			line = map[string]any{"msg": sc.Text()}
		}
		p.mu.Lock()
		p.lines = append(p.lines, line)
		p.mu.Unlock()
		select {
		case p.seen <- line:
		default:
		}
	}
	close(p.seen)
}

// waitFor waits for a log message and returns its line (the line itself:
// later lines may have been read meanwhile).
func (p *process) waitFor(t *testing.T, msg string) map[string]any {
	t.Helper()
	for line := range p.seen {
		if m, _ := line["msg"].(string); m == msg {
			return line
		}
	}
	t.Fatalf("the process ended without logging %q", msg)
	return nil
}

// messages returns the log messages in order.
func (p *process) messages() []string {
	p.mu.Lock()
	defer p.mu.Unlock()
	out := make([]string, len(p.lines))
	for i, l := range p.lines {
		out[i], _ = l["msg"].(string)
	}
	return out
}

// SIGTERM to a real `pathvet serve` in the middle of a queue: it stops
// taking jobs at once, the running job finishes or is released, an open
// long poll answers with the current status, and the process exits 0
// within the grace, leaving no submission running.
func TestServe_SIGTERMShutsDownCleanly(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	token, k := storetest.MustKey(t, db, "Office S", service.RoleEditor)
	pkg := readFile(t, "../../testdata/demo/tutoring-anxiety/package.json")
	var last string
	for i := range 30 {
		s, _, err := db.CreateSubmission(context.Background(), service.NewSubmission{Key: k, Package: pkg,
			Title: "queued", PackageSHA256: strings.Repeat("0", 60) + string(rune('a'+i%26)) + "xyz"})
		if err != nil {
			t.Fatal(err)
		}
		last = s.ID
	}
	p := startProcess(t, buildBinary(t), "serve", "--database-url", url, "--addr", "127.0.0.1:0", "--workers", "1",
		"--shutdown-grace", "20s")
	addr, _ := p.waitFor(t, "serving")["addr"].(string)
	p.waitFor(t, "screening started")
	poll := longPoll(t, "http://"+addr+"/v1/submissions/"+last+"?wait=30s", token)
	time.Sleep(500 * time.Millisecond) // the request has been written; let the server start serving it
	if err := p.cmd.Process.Signal(syscall.SIGTERM); err != nil {
		t.Fatal(err)
	}
	signalled := time.Now()
	if err := p.cmd.Wait(); err != nil {
		t.Fatalf("exit: %v; log %q", err, p.messages())
	}
	t.Logf("exited %v after SIGTERM", time.Since(signalled).Round(time.Millisecond))
	if v := <-poll; v.err != nil || v.code != http.StatusOK || v.status == "" {
		t.Fatalf("the open long poll: %+v (%v)", v, v.err)
	}
	checkNoStartAfterStop(t, p.messages())
	var running, queued int
	if err := db.Pool.QueryRow(context.Background(), `SELECT count(*) FILTER (WHERE status = 'running'),
		count(*) FILTER (WHERE status = 'queued') FROM submissions`).Scan(&running, &queued); err != nil || running != 0 || queued == 0 {
		t.Fatalf("after shutdown %d running, %d queued (%v): want none running, some left queued", running, queued, err)
	}
}

// checkNoStartAfterStop: no job started after the workers began to stop.
func checkNoStartAfterStop(t *testing.T, msgs []string) {
	t.Helper()
	stopped := false
	for _, m := range msgs {
		switch {
		case m == "workers stopping: no job starts from now":
			stopped = true
		case m == "screening started" && stopped:
			t.Fatalf("a job started after the workers began to stop: %q", msgs)
		}
	}
	if !stopped {
		t.Fatalf("the workers never said they stopped: %q", msgs)
	}
}

type pollResult struct {
	code   int
	status string
	err    error
}

// longPoll starts a GET and delivers its outcome. It returns once the
// request has been written to the server (or has failed), so that a signal
// sent afterwards cannot beat the request to the server's listener.
func longPoll(t *testing.T, url, token string) <-chan pollResult {
	out := make(chan pollResult, 1)
	written := make(chan struct{})
	var once sync.Once
	done := func() { once.Do(func() { close(written) }) }
	go func() {
		defer done()
		trace := &httptrace.ClientTrace{WroteRequest: func(httptrace.WroteRequestInfo) { done() }}
		req, _ := http.NewRequestWithContext(httptrace.WithClientTrace(context.Background(), trace),
			http.MethodGet, url, nil)
		req.Header.Set("Authorization", "Bearer "+token)
		resp, err := http.DefaultClient.Do(req)
		if err != nil {
			out <- pollResult{err: err}
			return
		}
		defer resp.Body.Close()
		var v struct{ Status string }
		err = json.NewDecoder(resp.Body).Decode(&v)
		out <- pollResult{code: resp.StatusCode, status: v.Status, err: err}
	}()
	<-written
	return out
}

// A second SIGTERM while a long job still runs stops the process at once,
// with exit status 3, instead of waiting out the grace.
func TestServe_SecondSignalForcesExit(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	_, k := storetest.MustKey(t, db, "Office F", service.RoleEditor)
	pkg, csv := slowPackage(t, 60_000)
	if _, _, err := db.CreateSubmission(context.Background(), service.NewSubmission{Key: k, Package: pkg,
		Data: csv, Title: "long", PackageSHA256: "h"}); err != nil {
		t.Fatal(err)
	}
	p := startProcess(t, buildBinary(t), "work", "--database-url", url, "--workers", "1", "--shutdown-grace", "10m")
	p.waitFor(t, "screening started")
	for _, msg := range []string{"workers stopping: no job starts from now", "second signal: stopping at once"} {
		if err := p.cmd.Process.Signal(syscall.SIGTERM); err != nil {
			t.Fatal(err)
		}
		p.waitFor(t, msg)
	}
	err := p.cmd.Wait()
	var exit *exec.ExitError
	if !errors.As(err, &exit) || exit.ExitCode() != exitInternal {
		t.Fatalf("exit %v, want status %d; log %q", err, exitInternal, p.messages())
	}
}
