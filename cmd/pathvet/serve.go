package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"log/slog"
	"net"
	"net/http"
	"time"

	"github.com/pathvet/pathvet/api"
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
	ln      net.Listener
	serve   bool // run the HTTP API
	done    chan error
}

// screenFunc is the job the workers run: load the stored package and run
// the pipeline on it.
func screenFunc(cfg Config) store.ScreenFunc {
	return func(ctx context.Context, pkg, data []byte) (*checks.Report, error) {
		s, err := load.Load(pkg, load.Options{Limits: cfg.Limits, CSV: data})
		if err != nil {
			return nil, errors.Join(store.ErrPermanent, err)
		}
		return checks.Run(ctx, s, checks.Options{Alpha: cfg.Alpha})
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
	if m.Config.Workers > 0 {
		m.Workers, err = db.StartWorkers(context.WithoutCancel(ctx), store.WorkerConfig{
			Workers: m.Config.Workers, Timeout: m.Config.JobTimeout, RescueAfter: m.Config.RescueAfter,
			Logger: m.Logger, Screen: screenFunc(m.Config), OnDone: metrics.JobDone,
		})
		if err != nil {
			return err
		}
	}
	if !m.serve {
		return nil
	}
	srv := api.New(api.Config{Store: db, Limits: m.Config.Limits, Logger: m.Logger, Metrics: metrics})
	m.ln, err = net.Listen("tcp", m.Config.Addr)
	if err != nil {
		return fmt.Errorf("listen on %s: %w", m.Config.Addr, err)
	}
	m.HTTP = &http.Server{Handler: srv.Echo(), ReadHeaderTimeout: 10 * time.Second,
		ReadTimeout: 5 * time.Minute, WriteTimeout: 2 * time.Minute, IdleTimeout: 2 * time.Minute}
	m.done = make(chan error, 1)
	go func() { m.done <- m.HTTP.Serve(m.ln) }()
	m.Logger.Info("serving", "addr", m.ln.Addr().String(), "workers", m.Config.Workers)
	return nil
}

// URL is the server's base URL.
func (m *Main) URL() string { return "http://" + m.ln.Addr().String() }

// Close shuts down gracefully: no new requests, running requests and jobs
// finish (up to the shutdown timeout; unfinished jobs are retried by
// another worker), then the database closes.
func (m *Main) Close() error {
	ctx, cancel := context.WithTimeout(context.Background(), m.Config.Shutdown)
	defer cancel()
	var errs []error
	if m.HTTP != nil {
		errs = append(errs, m.HTTP.Shutdown(ctx))
		if err := <-m.done; !errors.Is(err, http.ErrServerClosed) {
			errs = append(errs, err)
		}
	}
	if m.Workers != nil {
		errs = append(errs, m.Workers.Stop(ctx))
	}
	if m.DB != nil {
		m.DB.Close()
	}
	return errors.Join(errs...)
}

func newLogger(w io.Writer) *slog.Logger { return slog.New(slog.NewJSONHandler(w, nil)) }

// runServe is `pathvet serve` (API and in-process workers) and
// `pathvet work` (workers only).
func runServe(ctx context.Context, name string, args []string, stderr io.Writer) int {
	cfg := defaultConfig(getenv)
	fs := newFlagSet(name, stderr, "Usage: pathvet "+name+" [flags]")
	cfg.bindServerFlags(fs)
	if code, ok := parseFlags(fs, args); !ok {
		return code
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
	m.Logger.Info("shutting down")
	if err := m.Close(); err != nil {
		fmt.Fprintf(stderr, "pathvet %s: shutdown: %v\n", name, err)
		return exitInternal
	}
	return exitOK
}
