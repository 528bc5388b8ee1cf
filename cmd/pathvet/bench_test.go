package main

import (
	"bytes"
	"context"
	"encoding/json"
	"io"
	"net"
	"net/http"
	"os"
	"testing"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/store/storetest"
)

// benchClient is a bounded load generator: at most 8 connections.
var benchClient = &http.Client{
	Transport: &http.Transport{MaxIdleConnsPerHost: 8, MaxConnsPerHost: 8},
	Timeout:   30 * time.Second,
}

func benchDo(b *testing.B, req *http.Request, want int) {
	resp, err := benchClient.Do(req)
	if err != nil {
		b.Fatal(err)
	}
	_, _ = io.Copy(io.Discard, resp.Body)
	resp.Body.Close()
	if resp.StatusCode != want {
		b.Fatalf("%s %s: %d", req.Method, req.URL.Path, resp.StatusCode)
	}
}

// BenchmarkServer measures, over loopback against a real PostgreSQL,
// submission ingest (validate, store, queue) and report reads of the API
// without in-process workers, beside a bare Echo handler that serves a
// stored report from memory: the floor set by HTTP and JSON alone.
func BenchmarkServer(b *testing.B) {
	_, url := storetest.MustOpenDB(b)
	cfg := defaultConfig(func(string) string { return "" })
	cfg.DatabaseURL, cfg.Addr, cfg.Workers = url, "127.0.0.1:0", 0
	m := &Main{Config: cfg, Logger: newLogger(io.Discard), serve: true}
	if err := m.Run(context.Background()); err != nil {
		b.Fatal(err)
	}
	defer m.Close()
	token, _ := storetest.MustKey(b, m.DB, "Bench office", service.RoleEditor)
	pkg, err := os.ReadFile("../../testdata/demo/tutoring-anxiety/package.json")
	if err != nil {
		b.Fatal(err)
	}
	report := storedReport(b, m, token, pkg)
	post := func() *http.Request {
		req, _ := http.NewRequest(http.MethodPost, m.URL()+"/v1/submissions", bytes.NewReader(pkg))
		req.Header.Set("Authorization", "Bearer "+token)
		req.Header.Set("Content-Type", "application/json")
		return req
	}
	get := func(u string) *http.Request {
		req, _ := http.NewRequest(http.MethodGet, u, nil)
		req.Header.Set("Authorization", "Bearer "+token)
		return req
	}
	bare := bareEcho(b, report)
	b.Run("ingest", func(b *testing.B) {
		b.ReportAllocs()
		b.SetParallelism(4)
		b.RunParallel(func(pb *testing.PB) {
			for pb.Next() {
				benchDo(b, post(), http.StatusAccepted)
			}
		})
	})
	b.Run("report_read", func(b *testing.B) {
		b.ReportAllocs()
		b.SetParallelism(4)
		b.RunParallel(func(pb *testing.PB) {
			for pb.Next() {
				benchDo(b, get(m.URL()+"/v1/submissions/"+report.id+"/report"), http.StatusOK)
			}
		})
	})
	b.Run("bare_echo_json", func(b *testing.B) {
		b.ReportAllocs()
		b.SetParallelism(4)
		b.RunParallel(func(pb *testing.PB) {
			for pb.Next() {
				benchDo(b, get(bare), http.StatusOK)
			}
		})
	})
}

type stored struct {
	id   string
	body []byte
}

// storedReport screens one package synchronously and stores its report.
func storedReport(b *testing.B, m *Main, token string, pkg []byte) stored {
	k, err := m.DB.KeyByToken(context.Background(), token)
	if err != nil {
		b.Fatal(err)
	}
	s, err := load.Load(pkg, load.Options{})
	if err != nil {
		b.Fatal(err)
	}
	sub, _, err := m.DB.CreateSubmission(
		context.Background(),
		service.NewSubmission{Key: k, Package: pkg, Title: "bench", PackageSHA256: s.SHA256},
	)
	if err != nil {
		b.Fatal(err)
	}
	rep, err := checks.Run(context.Background(), s, checks.Options{})
	if err != nil {
		b.Fatal(err)
	}
	if err := m.DB.SaveReport(context.Background(), sub.ID, rep, time.Millisecond); err != nil {
		b.Fatal(err)
	}
	body, _ := json.Marshal(rep)
	return stored{id: sub.ID, body: body}
}

// bareEcho serves the report bytes from memory with no auth or storage.
func bareEcho(b *testing.B, r stored) string {
	e := echo.New()
	e.HideBanner, e.HidePort = true, true
	e.GET("/report", func(c echo.Context) error { return c.JSONBlob(http.StatusOK, r.body) })
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		b.Fatal(err)
	}
	srv := &http.Server{Handler: e}
	go func() { _ = srv.Serve(ln) }()
	b.Cleanup(func() { _ = srv.Close() })
	return "http://" + ln.Addr().String() + "/report"
}
