// Package storetest gives tests a real PostgreSQL database of their own.
package storetest

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"net/url"
	"os"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
)

// DefaultURL is the server the tests use when PATHVET_TEST_DATABASE_URL
// is unset: the machine's own PostgreSQL.
const DefaultURL = "postgres://postgres@127.0.0.1:5432/postgres?sslmode=disable"

// AdminURL is the URL of a database on the test server from which test
// databases are created.
func AdminURL() string {
	if u := os.Getenv("PATHVET_TEST_DATABASE_URL"); u != "" {
		return u
	}
	return DefaultURL
}

// MustOpenDB creates an empty, migrated database for one test (or test
// binary) and drops it when tb ends. It fails the test, never skips it,
// when the server cannot be reached.
func MustOpenDB(tb testing.TB) (*store.DB, string) {
	tb.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	dbURL := MustCreateDB(tb)
	db, err := store.Open(ctx, dbURL)
	if err != nil {
		tb.Fatalf("open test database: %v", err)
	}
	tb.Cleanup(db.Close)
	if err := db.Migrate(ctx); err != nil {
		tb.Fatalf("migrate test database: %v", err)
	}
	return db, dbURL
}

// MustCreateDB creates an empty database, not migrated, for one test and
// drops it when tb ends; it returns its URL.
func MustCreateDB(tb testing.TB) string {
	tb.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	admin, err := pgx.Connect(ctx, AdminURL())
	if err != nil {
		tb.Fatalf(
			"PostgreSQL for the tests is unreachable at %s (set PATHVET_TEST_DATABASE_URL; bash .ci/run starts one): %v",
			AdminURL(),
			err,
		)
	}
	defer admin.Close(ctx)
	suffix := make([]byte, 6)
	_, _ = rand.Read(suffix)
	name := "pathvet_test_" + hex.EncodeToString(suffix)
	if _, err := admin.Exec(ctx, "CREATE DATABASE "+name); err != nil {
		tb.Fatalf("create test database: %v", err)
	}
	dbURL, err := replaceDatabase(AdminURL(), name)
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() {
		c, err := pgx.Connect(context.Background(), AdminURL())
		if err == nil {
			_, _ = c.Exec(context.Background(), "DROP DATABASE IF EXISTS "+name+" WITH (FORCE)")
			_ = c.Close(context.Background())
		}
	})
	return dbURL
}

// replaceDatabase returns the URL with its database name replaced.
func replaceDatabase(raw, name string) (string, error) {
	u, err := url.Parse(raw)
	if err != nil || (u.Scheme != "postgres" && u.Scheme != "postgresql") {
		return "", fmt.Errorf("PATHVET_TEST_DATABASE_URL must be a postgres:// URL, not %q", raw)
	}
	u.Path = "/" + name
	return u.String(), nil
}

// Outage cuts the database at dbURL off for real: it refuses new
// connections and every open one is terminated. The returned function
// (also run when tb ends) lets connections in again.
func Outage(tb testing.TB, dbURL string) (restore func()) {
	tb.Helper()
	ctx := context.Background()
	u, err := url.Parse(dbURL)
	if err != nil {
		tb.Fatal(err)
	}
	name := pgx.Identifier{u.Path[1:]}.Sanitize()
	admin, err := pgx.Connect(ctx, AdminURL())
	if err != nil {
		tb.Fatalf("outage: %v", err)
	}
	defer admin.Close(ctx)
	if _, err := admin.Exec(ctx, "ALTER DATABASE "+name+" ALLOW_CONNECTIONS false"); err != nil {
		tb.Fatalf("outage: %v", err)
	}
	if _, err := admin.Exec(ctx, `SELECT pg_terminate_backend(pid) FROM pg_stat_activity
		WHERE datname = $1 AND pid <> pg_backend_pid()`, u.Path[1:]); err != nil {
		tb.Fatalf("outage: %v", err)
	}
	restore = func() {
		c, err := pgx.Connect(ctx, AdminURL())
		if err != nil {
			tb.Errorf("end of outage: %v", err)
			return
		}
		defer c.Close(ctx)
		if _, err := c.Exec(ctx, "ALTER DATABASE "+name+" ALLOW_CONNECTIONS true"); err != nil {
			tb.Errorf("end of outage: %v", err)
		}
	}
	tb.Cleanup(restore)
	return restore
}

// MustKey makes a key for the office, with its role as its label,
// creating the office first when it is new.
func MustKey(tb testing.TB, db *store.DB, office, role string) (token string, k *service.Key) {
	tb.Helper()
	ctx := context.Background()
	if _, err := db.CreateOffice(ctx, office); err != nil && service.ErrorCode(err) != service.EConflict {
		tb.Fatalf("create office: %v", err)
	}
	token, k, err := db.CreateKey(ctx, service.NewKey{Office: office, Role: role, Label: role + " of " + office})
	if err != nil {
		tb.Fatalf("create key: %v", err)
	}
	return token, k
}
