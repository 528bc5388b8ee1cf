package main

import (
	"flag"
	"fmt"
	"os"
	"strconv"
	"time"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/mediation"
	"github.com/pathvet/pathvet/store"
)

// Config is the configuration of the server and workers: built here from
// the environment and flags, and passed down as a value.
type Config struct {
	DatabaseURL string
	Addr        string
	// Workers is the number of screening jobs run at once in this process
	// (serve runs them in-process unless it is 0).
	Workers    int
	JobTimeout time.Duration
	// JobTimePer10MCells is added to a job's deadline per 10 million raw
	// data cells (rows × columns).
	JobTimePer10MCells time.Duration
	RescueAfter        time.Duration
	Migrate            bool // apply migrations at start
	Alpha              float64
	// Resamples is the number of bootstrap resamples of an indirect
	// effect with raw rows.
	Resamples int
	Limits    load.Limits
	Shutdown  time.Duration
	// JobMemoryMiB is the memory one screening job may use (the worker's
	// memory divided among its workers, less headroom); LargeIngests the
	// large uploads the API checks and stores at once.
	JobMemoryMiB int64
	LargeIngests int
	// TLSProxy: served behind a TLS-terminating proxy (Secure cookies).
	TLSProxy bool
	// TrustedProxies lists the proxies (CIDRs, addresses) whose
	// X-Forwarded-For entries are believed (api.ParseProxies reads it).
	TrustedProxies string
	// WebhookAllow lists the networks (CIDRs, addresses) and host names a
	// webhook may reach although they are loopback, private, link-local
	// and so on (service.ParseAllow reads it).
	WebhookAllow string
	// checks replaces the pipeline the workers run, and wrapScreen, when
	// set, wraps their screening, to watch what an attempt does (tests
	// only).
	checks     []checks.Check
	wrapScreen func(store.ScreenFunc) store.ScreenFunc
}

// defaultConfig reads PATHVET_* variables over the defaults.
func defaultConfig(getenv func(string) string) Config {
	c := Config{
		DatabaseURL: getenv("PATHVET_DATABASE_URL"),
		Addr:        "127.0.0.1:8080",
		Workers:     2,
		JobTimeout:  2 * time.Minute,
		// The missing-data check's cost on this machine, measured (README,
		// Limits): over a minute of CPU per 10 million cells.
		JobTimePer10MCells: time.Minute,
		RescueAfter:        5 * time.Minute,
		Alpha:              checks.DefaultAlpha,
		Resamples:          mediation.DefaultResamples,
		Limits:             load.DefaultLimits,
		Shutdown:           20 * time.Second,
		// The worker manifest's 2 GiB, 2 workers, 10% headroom.
		JobMemoryMiB: 900,
		LargeIngests: 1,
	}
	c.TLSProxy = getenv("PATHVET_BEHIND_TLS") == "true"
	c.WebhookAllow = getenv("PATHVET_WEBHOOK_ALLOW")
	c.TrustedProxies = getenv("PATHVET_TRUSTED_PROXIES")
	if v := getenv("PATHVET_ADDR"); v != "" {
		c.Addr = v
	}
	if v, err := strconv.Atoi(getenv("PATHVET_WORKERS")); err == nil {
		c.Workers = v
	}
	if v, err := time.ParseDuration(getenv("PATHVET_JOB_TIMEOUT")); err == nil {
		c.JobTimeout = v
	}
	if v, err := time.ParseDuration(getenv("PATHVET_JOB_TIME_PER_10M_CELLS")); err == nil {
		c.JobTimePer10MCells = v
	}
	if v, err := time.ParseDuration(getenv("PATHVET_SHUTDOWN_GRACE")); err == nil {
		c.Shutdown = v
	}
	if v, err := strconv.ParseInt(getenv("PATHVET_JOB_MEMORY_MIB"), 10, 64); err == nil {
		c.JobMemoryMiB = v
	}
	if v, err := strconv.Atoi(getenv("PATHVET_RESAMPLES")); err == nil {
		c.Resamples = v
	}
	return c
}

// bindServerFlags lets flags override the configuration; --addr only
// for serve, which listens. The database URL's default is not shown, so
// that help never prints its password.
func (c *Config) bindServerFlags(fs *flag.FlagSet, serve bool) {
	fs.Func("database-url", "PostgreSQL URL (default $PATHVET_DATABASE_URL)", func(v string) error {
		c.DatabaseURL = v
		return nil
	})
	if serve {
		fs.StringVar(&c.Addr, "addr", c.Addr, "listen address (PATHVET_ADDR)")
		fs.IntVar(
			&c.LargeIngests,
			"large-ingests",
			c.LargeIngests,
			"uploads of 8 MiB or more checked and stored at once, once their bodies have arrived",
		)
		fs.BoolVar(
			&c.TLSProxy,
			"behind-tls",
			c.TLSProxy,
			"served behind a TLS-terminating proxy: Secure cookies (PATHVET_BEHIND_TLS)",
		)
		fs.StringVar(&c.TrustedProxies, "trusted-proxies", c.TrustedProxies, "proxies (CIDRs, addresses, "+
			"comma-separated) whose X-Forwarded-For is read for the client's address (PATHVET_TRUSTED_PROXIES)")
	}
	fs.StringVar(&c.WebhookAllow, "webhook-allow", c.WebhookAllow, "networks (CIDRs) and host names webhooks "+
		"may reach although loopback, private or link-local, comma-separated (PATHVET_WEBHOOK_ALLOW)")
	fs.Int64Var(&c.JobMemoryMiB, "job-memory-mib", c.JobMemoryMiB,
		"memory one screening job may use; larger raw data is refused with the estimate (PATHVET_JOB_MEMORY_MIB)")
	fs.IntVar(&c.Workers, "workers", c.Workers, "screening jobs at once in this process; 0 for none (PATHVET_WORKERS)")
	fs.DurationVar(&c.JobTimeout, "job-timeout", c.JobTimeout,
		"deadline of one screening job, before the term for its size (PATHVET_JOB_TIMEOUT)")
	fs.DurationVar(&c.JobTimePer10MCells, "job-time-per-10m-cells", c.JobTimePer10MCells,
		"added to a job's deadline per 10 million data cells (PATHVET_JOB_TIME_PER_10M_CELLS)")
	fs.DurationVar(&c.RescueAfter, "rescue-after", c.RescueAfter,
		"retry a job still running after this long (its worker died); raised past the largest deadline")
	fs.DurationVar(&c.Shutdown, "shutdown-grace", c.Shutdown,
		"on SIGTERM, how long running jobs and requests may take to finish (PATHVET_SHUTDOWN_GRACE)")
	fs.BoolVar(&c.Migrate, "migrate", c.Migrate, "apply the database migrations before starting")
	fs.Float64Var(&c.Alpha, "alpha", c.Alpha, "significance level")
	fs.IntVar(&c.Resamples, "resamples", c.Resamples,
		"bootstrap resamples of an indirect effect with raw rows, "+resamplesRange+" (PATHVET_RESAMPLES)")
	fs.Int64Var(&c.Limits.PackageBytes, "max-package-bytes", c.Limits.PackageBytes, "largest package JSON")
	fs.Int64Var(&c.Limits.CSVBytes, "max-csv-bytes", c.Limits.CSVBytes, "largest CSV data")
	fs.IntVar(&c.Limits.Rows, "max-rows", c.Limits.Rows, "most data rows")
}

// serveUsage is the usage of serve and work; it names every flag.
var serveUsage = map[string]string{
	"serve": `Usage: pathvet serve [--database-url URL] [--addr HOST:PORT] [--workers N] [--job-timeout D]
       [--job-time-per-10m-cells D] [--rescue-after D] [--shutdown-grace D] [--migrate] [--alpha A]
       [--resamples N] [--large-ingests N] [--job-memory-mib N] [--webhook-allow LIST]
       [--max-package-bytes N] [--max-csv-bytes N] [--max-rows N] [--behind-tls]
       [--trusted-proxies LIST]

Serves the HTTP API and the web workspace and, unless --workers 0, screens submissions in-process.
SIGTERM or an interrupt stops it cleanly within --shutdown-grace; a second
one stops it at once.`,
	"work": `Usage: pathvet work [--database-url URL] [--workers N] [--job-timeout D]
       [--job-time-per-10m-cells D] [--rescue-after D] [--shutdown-grace D] [--migrate] [--alpha A]
       [--resamples N] [--job-memory-mib N] [--webhook-allow LIST]
       [--max-package-bytes N] [--max-csv-bytes N] [--max-rows N]

Screens queued submissions (no HTTP API), for scaling workers out.
SIGTERM or an interrupt stops it cleanly within --shutdown-grace; a second
one stops it at once.`,
}

func (c Config) validate() error {
	switch {
	case c.DatabaseURL == "":
		return fmt.Errorf("no database: set PATHVET_DATABASE_URL or --database-url")
	case c.Alpha <= 0 || c.Alpha >= 1:
		return fmt.Errorf("--alpha must lie strictly between 0 and 1")
	case badResamples(c.Resamples):
		return fmt.Errorf("--resamples must be %s", resamplesRange)
	case c.JobTimeout <= 0:
		return fmt.Errorf("--job-timeout must be positive")
	case c.JobTimePer10MCells < 0:
		return fmt.Errorf("--job-time-per-10m-cells must not be negative")
	}
	if _, err := c.egress(); err != nil {
		return err
	}
	if _, err := api.ParseProxies(c.TrustedProxies); err != nil {
		return fmt.Errorf("--trusted-proxies: %w", err)
	}
	return nil
}

// egress is the webhooks' way out, with the allow-list.
func (c Config) egress() (*service.Egress, error) {
	a, err := service.ParseAllow(c.WebhookAllow)
	if err != nil {
		return nil, fmt.Errorf("--webhook-allow: %w", err)
	}
	return &service.Egress{Allow: a}, nil
}

// maxCells is the most raw data cells a package can have under the
// limits: rows × variables, the CSV bytes (every cell takes at least its
// separator) and, when set, the job memory.
func (c Config) maxCells() int64 {
	n := min(int64(c.Limits.Rows)*int64(c.Limits.Variables), c.Limits.CSVBytes)
	if c.JobMemoryMiB > 0 {
		n = min(n, service.MaxCells(c.JobMemoryMiB<<20))
	}
	return max(n, 0)
}

var getenv = os.Getenv
