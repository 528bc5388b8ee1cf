package main

import (
	"flag"
	"io"
	"strings"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
)

// The per-size deadline is read from the environment and the flag, and
// the largest package under the limits bounds it: the job memory when
// set, else the CSV bytes (a cell takes at least its separator) or rows
// × variables.
func TestConfig_DeadlineForSize(t *testing.T) {
	env := map[string]string{"PATHVET_JOB_TIME_PER_10M_CELLS": "90s"}
	cfg := defaultConfig(func(k string) string { return env[k] })
	if cfg.JobTimePer10MCells != 90*time.Second {
		t.Fatalf("from the environment: %v", cfg.JobTimePer10MCells)
	}
	fs := flag.NewFlagSet("serve", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	cfg.bindServerFlags(fs, true)
	if err := fs.Parse([]string{"--job-time-per-10m-cells", "2m"}); err != nil ||
		cfg.JobTimePer10MCells != 2*time.Minute {
		t.Fatalf("from the flag: %v (%v)", cfg.JobTimePer10MCells, err)
	}
	if got, want := cfg.maxCells(), service.MaxCells(900<<20); got != want {
		t.Errorf("with the job memory: %d cells, want %d", got, want)
	}
	cfg.JobMemoryMiB = 0
	if got := cfg.maxCells(); got != cfg.Limits.CSVBytes {
		t.Errorf("without a memory bound: %d cells, want the CSV bytes %d", got, cfg.Limits.CSVBytes)
	}
	cfg.Limits.Rows, cfg.Limits.Variables = 1000, 20
	if got := cfg.maxCells(); got != 20_000 {
		t.Errorf("with 1,000 rows of 20 variables: %d cells", got)
	}
	cfg.DatabaseURL, cfg.Alpha, cfg.JobTimePer10MCells = "postgres://x", 0.05, -time.Second
	if cfg.validate() == nil {
		t.Error("a negative time per 10 million cells was accepted")
	}
}

// The bootstrap's resamples come from PATHVET_RESAMPLES, then --resamples
// (serve and work), default 2,000, and are refused outside 200 to 100,000;
// check takes --resamples too.
func TestConfig_Resamples(t *testing.T) {
	if cfg := defaultConfig(func(string) string { return "" }); cfg.Resamples != 2000 {
		t.Fatalf("default %d", cfg.Resamples)
	}
	cfg := defaultConfig(func(k string) string { return map[string]string{"PATHVET_RESAMPLES": "500"}[k] })
	if cfg.Resamples != 500 {
		t.Fatalf("from the environment: %d", cfg.Resamples)
	}
	fs := flag.NewFlagSet("work", flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	cfg.bindServerFlags(fs, false)
	if err := fs.Parse([]string{"--resamples", "5000"}); err != nil || cfg.Resamples != 5000 {
		t.Fatalf("from the flag: %d (%v)", cfg.Resamples, err)
	}
	cfg.DatabaseURL = "postgres://x"
	for n, ok := range map[int]bool{199: false, 200: true, 100_000: true, 100_001: false} {
		cfg.Resamples = n
		if err := cfg.validate(); (err == nil) != ok {
			t.Errorf("--resamples %d: %v", n, err)
		}
	}
	if code, _, errs := runCLI("check", "--resamples", "50", "../../testdata/demo/coding-club/package.json"); code !=
		exitInvalid || !strings.Contains(errs, "--resamples must be from 200 to 100000") {
		t.Errorf("check --resamples 50: exit %d, %s", code, errs)
	}
}
