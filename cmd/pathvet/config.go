package main

import (
	"flag"
	"fmt"
	"os"
	"strconv"
	"time"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// Config is the configuration of the server and workers: built here from
// the environment and flags, and passed down as a value.
type Config struct {
	DatabaseURL string
	Addr        string
	// Workers is the number of screening jobs run at once in this process
	// (serve runs them in-process unless it is 0).
	Workers     int
	JobTimeout  time.Duration
	RescueAfter time.Duration
	Migrate     bool // apply migrations at start
	Alpha       float64
	Limits      load.Limits
	Shutdown    time.Duration
}

// defaultConfig reads PATHVET_* variables over the defaults.
func defaultConfig(getenv func(string) string) Config {
	c := Config{
		DatabaseURL: getenv("PATHVET_DATABASE_URL"),
		Addr:        "127.0.0.1:8080",
		Workers:     2,
		JobTimeout:  2 * time.Minute,
		RescueAfter: 5 * time.Minute,
		Alpha:       checks.DefaultAlpha,
		Limits:      load.DefaultLimits,
		Shutdown:    20 * time.Second,
	}
	if v := getenv("PATHVET_ADDR"); v != "" {
		c.Addr = v
	}
	if v, err := strconv.Atoi(getenv("PATHVET_WORKERS")); err == nil {
		c.Workers = v
	}
	if v, err := time.ParseDuration(getenv("PATHVET_JOB_TIMEOUT")); err == nil {
		c.JobTimeout = v
	}
	return c
}

// bindServerFlags lets flags override the configuration.
func (c *Config) bindServerFlags(fs *flag.FlagSet) {
	fs.StringVar(&c.DatabaseURL, "database-url", c.DatabaseURL, "PostgreSQL URL (PATHVET_DATABASE_URL)")
	fs.StringVar(&c.Addr, "addr", c.Addr, "listen address (PATHVET_ADDR)")
	fs.IntVar(&c.Workers, "workers", c.Workers, "screening jobs at once in this process; 0 for none (PATHVET_WORKERS)")
	fs.DurationVar(&c.JobTimeout, "job-timeout", c.JobTimeout, "deadline of one screening job (PATHVET_JOB_TIMEOUT)")
	fs.DurationVar(&c.RescueAfter, "rescue-after", c.RescueAfter, "retry a job still running after this long (its worker died)")
	fs.BoolVar(&c.Migrate, "migrate", c.Migrate, "apply the database migrations before starting")
	fs.Float64Var(&c.Alpha, "alpha", c.Alpha, "significance level")
	fs.Int64Var(&c.Limits.PackageBytes, "max-package-bytes", c.Limits.PackageBytes, "largest package JSON")
	fs.Int64Var(&c.Limits.CSVBytes, "max-csv-bytes", c.Limits.CSVBytes, "largest CSV data")
	fs.IntVar(&c.Limits.Rows, "max-rows", c.Limits.Rows, "most data rows")
}

func (c Config) validate() error {
	switch {
	case c.DatabaseURL == "":
		return fmt.Errorf("no database: set PATHVET_DATABASE_URL or --database-url")
	case c.Alpha <= 0 || c.Alpha >= 1:
		return fmt.Errorf("--alpha must lie strictly between 0 and 1")
	case c.JobTimeout <= 0:
		return fmt.Errorf("--job-timeout must be positive")
	}
	return nil
}

var getenv = os.Getenv
