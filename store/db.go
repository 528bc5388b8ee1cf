// Package store keeps pathvet's state in PostgreSQL through pgx: editorial
// offices and their API keys, submissions, their reports, and the job
// queue (River, on the same database) that screens them.
package store

import (
	"context"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgxpool"
	"github.com/jackc/pgx/v5/stdlib"
	"github.com/pressly/goose/v3"
	"github.com/riverqueue/river"
	"github.com/riverqueue/river/riverdriver/riverpgxv5"
	"github.com/riverqueue/river/rivermigrate"

	"github.com/pathvet/pathvet/migrations"
)

// DB is the database: a pgx pool and an insert-only River client that
// queues screening jobs in the same transactions as the submissions.
type DB struct {
	Pool *pgxpool.Pool
	// Now is the clock; tests may fix it.
	Now func() time.Time

	queue *river.Client[pgx.Tx]
	// cache keeps keys and reports once CacheReads has started its
	// listener.
	cache     *readCache
	stopCache context.CancelFunc
	cacheDone chan struct{}
}

// Open connects to the database at url.
func Open(ctx context.Context, url string) (*DB, error) {
	cfg, err := pgxpool.ParseConfig(url)
	if err != nil {
		return nil, fmt.Errorf("store: database URL: %w", err)
	}
	pool, err := pgxpool.NewWithConfig(ctx, cfg)
	if err != nil {
		return nil, fmt.Errorf("store: connect: %w", err)
	}
	if err := pool.Ping(ctx); err != nil {
		pool.Close()
		return nil, fmt.Errorf("store: connect: %w", err)
	}
	q, err := river.NewClient(riverpgxv5.New(pool), &river.Config{})
	if err != nil {
		pool.Close()
		return nil, fmt.Errorf("store: queue client: %w", err)
	}
	return &DB{Pool: pool, Now: time.Now, queue: q}, nil
}

// Close stops the read cache's listener and closes the pool.
func (db *DB) Close() {
	db.stopCaching()
	db.Pool.Close()
}

// Ping checks that the database answers.
func (db *DB) Ping(ctx context.Context) error { return db.Pool.Ping(ctx) }

func (db *DB) now() time.Time { return db.Now().UTC() }

// MigrationStep is one applied or pending migration.
type MigrationStep struct {
	Source  string
	Applied bool
	At      time.Time
}

func (db *DB) goose() (*goose.Provider, error) {
	return goose.NewProvider(goose.DialectPostgres, stdlib.OpenDBFromPool(db.Pool), migrations.FS)
}

// migrateLock is the key of the advisory lock that migrations hold
// ("pathvet migrate" in ASCII, folded to 63 bits).
const migrateLock int64 = 0x70617468766574

// Migrate applies pathvet's migrations and the job queue's, under a
// session advisory lock, so that any number of processes may migrate at
// once: one applies, the others wait and find nothing left to do.
func (db *DB) Migrate(ctx context.Context) error {
	conn, err := db.Pool.Acquire(ctx)
	if err != nil {
		return fmt.Errorf("store: migrate: %w", dbError(err, "migration lock"))
	}
	defer conn.Release()
	if _, err := conn.Exec(ctx, `SELECT pg_advisory_lock($1)`, migrateLock); err != nil {
		return fmt.Errorf("store: migration lock: %w", err)
	}
	defer func() {
		bg := context.WithoutCancel(ctx)
		if _, err := conn.Exec(bg, `SELECT pg_advisory_unlock($1)`, migrateLock); err != nil {
			_ = conn.Conn().Close(bg) // ending the session ends its lock
		}
	}()
	return db.migrate(ctx)
}

func (db *DB) migrate(ctx context.Context) error {
	p, err := db.goose()
	if err != nil {
		return fmt.Errorf("store: migrations: %w", err)
	}
	if _, err := p.Up(ctx); err != nil {
		return fmt.Errorf("store: migrate: %w", err)
	}
	m, err := rivermigrate.New(riverpgxv5.New(db.Pool), nil)
	if err != nil {
		return fmt.Errorf("store: queue migrations: %w", err)
	}
	if _, err := m.Migrate(ctx, rivermigrate.DirectionUp, nil); err != nil {
		return fmt.Errorf("store: migrate queue: %w", err)
	}
	return nil
}

// MigrationStatus lists pathvet's migrations, applied or not.
func (db *DB) MigrationStatus(ctx context.Context) ([]MigrationStep, error) {
	p, err := db.goose()
	if err != nil {
		return nil, fmt.Errorf("store: migrations: %w", err)
	}
	st, err := p.Status(ctx)
	if err != nil {
		return nil, fmt.Errorf("store: migration status: %w", err)
	}
	out := make([]MigrationStep, len(st))
	for i, s := range st {
		out[i] = MigrationStep{Source: s.Source.Path, Applied: s.State == goose.StateApplied, At: s.AppliedAt}
	}
	return out, nil
}
