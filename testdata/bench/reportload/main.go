// Command reportload is the side-by-side benchmark of GET
// /v1/submissions/{id}/report (testdata/bench/report-get.sh runs it):
//
//	reportload setup -admin URL -out DIR   a database with one screened submission
//	reportload bare -file F                a bare Echo serving F's bytes at /report
//	reportload load -url U [-token T] [-etag] [-c 16] [-d 5s]
//	reportload drop -admin URL -db NAME    drop the database
//
// load prints one line: requests per second, the median and 99th
// percentile latency, and the requests that failed.
package main

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"flag"
	"fmt"
	"net"
	"net/http"
	"net/url"
	"os"
	"path/filepath"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/store"
)

func main() {
	if len(os.Args) < 2 {
		fmt.Fprintln(os.Stderr, "usage: reportload setup|bare|load|drop [flags]")
		os.Exit(2)
	}
	fs := flag.NewFlagSet(os.Args[1], flag.ExitOnError)
	var err error
	switch os.Args[1] {
	case "setup":
		admin, out := fs.String("admin", "", "admin database URL"), fs.String("out", ".", "output folder")
		_ = fs.Parse(os.Args[2:])
		err = setup(*admin, *out)
	case "bare":
		file := fs.String("file", "", "the bytes to serve")
		_ = fs.Parse(os.Args[2:])
		err = bare(*file)
	case "load":
		err = runLoad(fs)
	case "drop":
		admin, name := fs.String("admin", "", "admin database URL"), fs.String("db", "", "database")
		_ = fs.Parse(os.Args[2:])
		err = drop(*admin, *name)
	default:
		err = fmt.Errorf("unknown mode %q", os.Args[1])
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "reportload:", err)
		os.Exit(1)
	}
}

// setup makes a database, migrates it, stores the demo package screened,
// and writes env (DBURL, DBNAME, TOKEN, ID) and report.json (the stored
// bytes) to out.
func setup(admin, out string) error {
	ctx := context.Background()
	name, dbURL, err := createDB(ctx, admin)
	if err != nil {
		return err
	}
	db, err := store.Open(ctx, dbURL)
	if err != nil {
		return err
	}
	defer db.Close()
	if err := db.Migrate(ctx); err != nil {
		return err
	}
	token, id, err := screened(ctx, db)
	if err != nil {
		return err
	}
	var stored []byte
	if err := db.Pool.QueryRow(ctx, `SELECT report::text FROM reports`).Scan(&stored); err != nil {
		return err
	}
	env := fmt.Sprintf("DBURL='%s'\nDBNAME=%s\nTOKEN=%s\nID=%s\n", dbURL, name, token, id)
	if err := os.WriteFile(filepath.Join(out, "env"), []byte(env), 0o600); err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(out, "report.json"), stored, 0o644)
}

func createDB(ctx context.Context, admin string) (string, string, error) {
	c, err := pgx.Connect(ctx, admin)
	if err != nil {
		return "", "", err
	}
	defer c.Close(ctx)
	b := make([]byte, 4)
	_, _ = rand.Read(b)
	name := "pathvet_bench_" + hex.EncodeToString(b)
	if _, err := c.Exec(ctx, "CREATE DATABASE "+name); err != nil {
		return "", "", err
	}
	u, err := url.Parse(admin)
	if err != nil {
		return "", "", err
	}
	u.Path = "/" + name
	return name, u.String(), nil
}

// screened stores the tutoring demo and its report, and returns an editor
// key's token and the submission's id.
func screened(ctx context.Context, db *store.DB) (string, string, error) {
	if _, err := db.CreateOffice(ctx, "Bench office"); err != nil {
		return "", "", err
	}
	token, k, err := db.CreateKey(ctx, service.NewKey{Office: "Bench office", Role: service.RoleEditor, Label: "bench"})
	if err != nil {
		return "", "", err
	}
	pkg, err := os.ReadFile("testdata/demo/tutoring-anxiety/package.json")
	if err != nil {
		return "", "", err
	}
	s, err := load.Load(pkg, load.Options{})
	if err != nil {
		return "", "", err
	}
	sub, _, err := db.CreateSubmission(ctx, service.NewSubmission{Key: k, Package: pkg, Title: s.Package.Title,
		PackageSHA256: s.SHA256})
	if err != nil {
		return "", "", err
	}
	rep, err := checks.Run(ctx, s, checks.Options{})
	if err != nil {
		return "", "", err
	}
	return token, sub.ID, db.SaveReport(ctx, sub.ID, rep, time.Millisecond)
}

func drop(admin, name string) error {
	ctx := context.Background()
	c, err := pgx.Connect(ctx, admin)
	if err != nil {
		return err
	}
	defer c.Close(ctx)
	_, err = c.Exec(ctx, "DROP DATABASE IF EXISTS "+pgx.Identifier{name}.Sanitize()+" WITH (FORCE)")
	return err
}

// bare serves the file's bytes as JSON at /report with a bare Echo (no
// middleware, no storage), printing its address.
func bare(file string) error {
	body, err := os.ReadFile(file)
	if err != nil {
		return err
	}
	e := echo.New()
	e.HideBanner, e.HidePort = true, true
	e.GET("/report", func(c echo.Context) error { return c.JSONBlob(http.StatusOK, body) })
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		return err
	}
	fmt.Println(ln.Addr().String())
	return http.Serve(ln, e)
}
