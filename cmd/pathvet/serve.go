package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net"
	"net/http"
	"os"
	"os/signal"
	"syscall"
	"time"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/store"
)

// Main is a running pathvet server: its database, its workers and its
// HTTP listener. Tests start one on port 0.
type Main struct {
	Config  Config
	Logger  *slog.Logger
	DB      *store.DB
	Workers *store.Workers
	HTTP    *http.Server
	API     *api.Server
	ln      net.Listener
	serve   bool // run the HTTP API
	done    chan error
}

// screenFunc is the job the workers run: refuse data past the job's
// memory (the CSV stored beside the package, or inline in it), load the
// stored package and run the pipeline on it, passing its progress on
// (wrapped by cfg.wrapScreen when a test set it).
func screenFunc(cfg Config) store.ScreenFunc {
	if cfg.wrapScreen != nil {
		wrap := cfg.wrapScreen
		cfg.wrapScreen = nil
		return wrap(screenFunc(cfg))
	}
	return func(ctx context.Context, pkg, data []byte, progress store.ProgressFunc) (*checks.Report, error) {
		if err := service.CheckPackageMemory(pkg, data, cfg.JobMemoryMiB<<20); err != nil {
			return nil, errors.Join(store.ErrPermanent, err)
		}
		s, err := load.Load(pkg, load.Options{Limits: cfg.Limits, CSV: data})
		if err != nil {
			return nil, errors.Join(store.ErrPermanent, err)
		}
		return checks.Run(ctx, s, checks.Options{Alpha: cfg.Alpha, Resamples: cfg.Resamples, Checks: cfg.checks,
			Progress: progress})
	}
}

// Run opens the database, starts the workers and, for serve, the HTTP
// API; it returns once they are running.
func (m *Main) Run(ctx context.Context) error {
	if err := m.Config.validate(); err != nil {
		return err
	}
	db, err := store.Open(ctx, m.Config.DatabaseURL)
	if err != nil {
		return err
	}
	m.DB = db
	if m.Config.Migrate {
		if err := db.Migrate(ctx); err != nil {
			return err
		}
	}
	metrics := api.NewMetrics()
	egress, _ := m.Config.egress() // validated above
	if m.Config.Workers > 0 {
		m.Workers, err = db.StartWorkers(context.WithoutCancel(ctx), store.WorkerConfig{
			Workers: m.Config.Workers, Timeout: m.Config.JobTimeout, RescueAfter: m.Config.RescueAfter,
			PerTenMillionCells: m.Config.JobTimePer10MCells, MaxCells: m.Config.maxCells(),
			Logger: m.Logger, Screen: screenFunc(m.Config), OnDone: metrics.JobDone, Egress: egress,
		})
		if err != nil {
			return err
		}
	}
	if !m.serve {
		return nil
	}
	db.CacheReads(context.WithoutCancel(ctx)) // keys and reports, read on every request; Close stops it
	return m.listen(m.apiConfig(metrics, egress))
}

// apiConfig is the API's configuration from the server's.
func (m *Main) apiConfig(metrics *api.Metrics, egress *service.Egress) api.Config {
	proxies, _ := api.ParseProxies(m.Config.TrustedProxies) // validated by Run
	if m.Config.TLSProxy && len(proxies) == 0 {
		m.Logger.Warn("behind a TLS proxy but no --trusted-proxies: sign-in failures are counted by the " +
			"proxy's address, which every client shares")
	}
	return api.Config{Store: m.DB, Web: m.DB, Review: m.DB, TLSProxy: m.Config.TLSProxy, TrustedProxies: proxies,
		Limits: m.Config.Limits, Logger: m.Logger, Metrics: metrics, LargeIngests: m.Config.LargeIngests,
		Egress: egress, JobMemory: m.Config.JobMemoryMiB << 20}
}

// listen starts the HTTP API on the configured address.
func (m *Main) listen(cfg api.Config) error {
	m.API = api.New(cfg)
	var err error
	m.ln, err = net.Listen("tcp", m.Config.Addr)
	if err != nil {
		return fmt.Errorf("listen on %s: %w", m.Config.Addr, err)
	}
	m.HTTP = &http.Server{Handler: m.API.Echo(), ReadHeaderTimeout: 10 * time.Second,
		MaxHeaderBytes: api.HTTPServerMaxHeaderBytes,
		ReadTimeout:    5 * time.Minute, WriteTimeout: 2 * time.Minute, IdleTimeout: 2 * time.Minute}
	m.done = make(chan error, 1)
	go func() { m.done <- m.HTTP.Serve(m.ln) }()
	m.Logger.Info("serving", "addr", m.ln.Addr().String(), "workers", m.Config.Workers)
	return nil
}

// URL is the server's base URL.
func (m *Main) URL() string { return "http://" + m.ln.Addr().String() }

// Close shuts down cleanly within the configured grace: the workers stop
// fetching at once and running jobs get most of the grace to finish (any
// still running are cancelled and released to another worker); then open
// long polls answer with the current status, the HTTP server finishes
// its requests and stops, and the database closes.
func (m *Main) Close() error {
	grace := m.Config.Shutdown
	ctx, cancel := context.WithTimeout(context.Background(), grace)
	defer cancel()
	var errs []error
	if m.Workers != nil {
		jobs, cancelJobs := context.WithTimeout(ctx, grace-httpReserve(grace))
		errs = append(errs, m.Workers.Stop(jobs))
		cancelJobs()
	}
	if m.HTTP != nil {
		m.API.Drain()
		if err := m.HTTP.Shutdown(ctx); err != nil {
			errs = append(errs, err, m.HTTP.Close())
		}
		if err := <-m.done; !errors.Is(err, http.ErrServerClosed) {
			errs = append(errs, err)
		}
	}
	if m.DB != nil {
		m.DB.Close()
	}
	return errors.Join(errs...)
}

// Kill stops at once: requests are cut and running jobs cancelled, to be
// retried elsewhere (a second signal).
func (m *Main) Kill() {
	if m.HTTP != nil {
		_ = m.HTTP.Close()
	}
	if m.Workers != nil {
		ctx, cancel := context.WithTimeout(context.Background(), time.Second)
		defer cancel()
		_ = m.Workers.Kill(ctx)
	}
}

// httpReserve is the part of the grace kept for the HTTP server after the
// jobs: a quarter, at most 5 s.
func httpReserve(grace time.Duration) time.Duration { return min(grace/4, 5*time.Second) }

func newLogger(w io.Writer) *slog.Logger { return slog.New(slog.NewJSONHandler(w, nil)) }

// runServe is `pathvet serve` (API and in-process workers) and
// `pathvet work` (workers only).
func runServe(ctx context.Context, name string, args []string, stdout, stderr io.Writer) int {
	cfg := defaultConfig(getenv)
	fs := newCommand(name, serveUsage[name], stdout, stderr)
	cfg.bindServerFlags(fs.FlagSet, name == "serve")
	pos, code, ok := fs.parse(args)
	switch {
	case !ok:
		return code
	case len(pos) > 0:
		return fs.misuse("takes no arguments, not %q", pos[0])
	}
	m := &Main{Config: cfg, Logger: newLogger(stderr), serve: name == "serve"}
	if !m.serve && m.Config.Workers == 0 {
		m.Config.Workers = 1
	}
	if err := m.Run(ctx); err != nil {
		fmt.Fprintf(stderr, "pathvet %s: %v\n", name, err)
		_ = m.Close()
		return exitInternal
	}
	<-ctx.Done()
	return shutdown(m, name, stderr)
}

// shutdown closes m after the first signal; a second signal stops at
// once, with exit status 3.
func shutdown(m *Main, name string, stderr io.Writer) int {
	again := make(chan os.Signal, 1)
	signal.Notify(again, os.Interrupt, syscall.SIGTERM)
	defer signal.Stop(again)
	m.Logger.Info("shutting down", "grace", m.Config.Shutdown.String())
	closed := make(chan error, 1)
	go func() { closed <- m.Close() }()
	select {
	case err := <-closed:
		if err != nil {
			fmt.Fprintf(stderr, "pathvet %s: shutdown: %v\n", name, err)
			return exitInternal
		}
		m.Logger.Info("stopped")
		return exitOK
	case <-again:
		m.Logger.Warn("second signal: stopping at once")
		m.Kill()
		return exitInternal
	}
}
