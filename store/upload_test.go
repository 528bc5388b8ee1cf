package store_test

import (
	"bytes"
	"context"
	"crypto/rand"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// A streamed upload is stored byte for byte, in the same transaction as the
// submission, and leaves no large object behind: neither when it is stored
// nor when an idempotent retry replays the first submission. The size is
// not a multiple of the 1 MiB write, so the last short write counts too.
func TestCreateSubmission_StreamedData(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	_, k := storetest.MustKey(t, db, "Office U", service.RoleEditor)
	ctx := context.Background()
	data := make([]byte, 3<<20+12345)
	if _, err := rand.Read(data); err != nil {
		t.Fatal(err)
	}
	n := service.NewSubmission{Key: k, Package: []byte(`{}`), Title: "streamed", PackageSHA256: "s",
		IdempotencyKey: "once", DataReader: bytes.NewReader(data), DataSize: int64(len(data))}
	sub, _, err := db.CreateSubmission(ctx, n)
	if err != nil {
		t.Fatal(err)
	}
	n.DataReader = bytes.NewReader(data)
	again, replayed, err := db.CreateSubmission(ctx, n)
	if err != nil || !replayed || again.ID != sub.ID {
		t.Fatalf("the retry: %v, replayed %v, id %s (want %s)", err, replayed, again.ID, sub.ID)
	}
	var stored []byte
	var objects int
	if err := db.Pool.QueryRow(ctx, `SELECT data, (SELECT count(*) FROM pg_largeobject_metadata)
		FROM submissions WHERE id = $1`, sub.ID).Scan(&stored, &objects); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(stored, data) {
		t.Fatalf("stored %d bytes, not the %d streamed", len(stored), len(data))
	}
	if objects != 0 {
		t.Fatalf("%d large objects left behind", objects)
	}
	n.IdempotencyKey, n.DataReader, n.DataSize = "short", bytes.NewReader(data[:10]), int64(len(data))
	if _, _, err := db.CreateSubmission(ctx, n); err == nil {
		t.Fatal("a stream shorter than its size was stored")
	}
}
