package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"
)

// CacheReads makes KeyByToken and LatestReport keep what they read in
// memory (readCache), for a server that reads them on every request: it
// listens for the database's announcements on a connection of its own
// until ctx ends or Close, and serves nothing from memory while it is not
// listening. Call it before serving.
func (db *DB) CacheReads(ctx context.Context) {
	db.cache = newReadCache(CacheTTL)
	ctx, db.stopCache = context.WithCancel(ctx)
	db.cacheDone = make(chan struct{})
	go func() {
		defer close(db.cacheDone)
		db.listen(ctx)
	}()
}

// listen listens until ctx ends, connecting again (after a pause that
// doubles up to maxListenPause) whenever the connection is lost.
func (db *DB) listen(ctx context.Context) {
	pause := minListenPause
	for ctx.Err() == nil {
		listened := db.listenOnce(ctx)
		db.cache.forget(false)
		if listened {
			pause = minListenPause
		}
		select {
		case <-ctx.Done():
		case <-time.After(pause):
		}
		pause = min(2*pause, maxListenPause)
	}
}

const (
	minListenPause = 100 * time.Millisecond
	maxListenPause = 10 * time.Second
)

// listenOnce connects, listens on both channels and passes on each
// announcement, until the connection fails; it reports whether it got as
// far as listening.
func (db *DB) listenOnce(ctx context.Context) bool {
	conn, err := pgx.ConnectConfig(ctx, db.Pool.Config().ConnConfig.Copy())
	if err != nil {
		return false
	}
	defer func() {
		closing, cancel := context.WithTimeout(context.Background(), time.Second)
		defer cancel()
		_ = conn.Close(closing)
	}()
	if _, err := conn.Exec(ctx, "LISTEN "+keyChannel+"; LISTEN "+reportChannel); err != nil {
		return false
	}
	db.cache.forget(true) // what changed while no one listened is forgotten too
	for {
		n, err := conn.WaitForNotification(ctx)
		if err != nil {
			return true
		}
		db.cache.announced(n.Channel, n.Payload)
	}
}

// stopCaching stops the listener and waits for it.
func (db *DB) stopCaching() {
	if db.stopCache != nil {
		db.stopCache()
		<-db.cacheDone
	}
}
