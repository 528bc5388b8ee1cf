package store_test

import (
	"sync"
	"testing"

	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// Three migrations at once on a fresh database all succeed, each with
// its own connections, and leave every migration applied once.
func TestDB_ConcurrentMigrate(t *testing.T) {
	url := storetest.MustCreateDB(t)
	errs := make([]error, 3)
	var wg sync.WaitGroup
	for i := range errs {
		wg.Go(func() {
			db, err := store.Open(ctx, url)
			if err != nil {
				errs[i] = err
				return
			}
			defer db.Close()
			errs[i] = db.Migrate(ctx)
		})
	}
	wg.Wait()
	for i, err := range errs {
		if err != nil {
			t.Errorf("migration %d: %v", i, err)
		}
	}
	db, err := store.Open(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	steps, err := db.MigrationStatus(ctx)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range steps {
		if !s.Applied {
			t.Errorf("%s not applied", s.Source)
		}
	}
}
