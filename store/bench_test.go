package store_test

import (
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// seedOffice fills one office with n screened submissions, a third in
// each band, each with one report, as SaveReport would leave them.
func seedOffice(b *testing.B, db *store.DB, n int) *service.Key {
	b.Helper()
	_, k := storetest.MustKey(b, db, "Office B", service.RoleEditor)
	if _, err := db.Pool.Exec(ctx, `
		INSERT INTO submissions (id, office_id, submitter_key_id, title, package, package_sha256, status,
			latest_score, latest_band, report_count, created_at, updated_at)
		SELECT gen_random_uuid(), $1, $2, 'seeded', '\x7b7d', md5(i::text), 'done', i % 100,
			(ARRAY['low-concern', 'moderate-concern', 'high-concern'])[i % 3 + 1], 1,
			now() - i * interval '1 minute', now()
		FROM generate_series(1, $3) i`, k.OfficeID, k.ID, n); err != nil {
		b.Fatal(err)
	}
	if _, err := db.Pool.Exec(ctx, `
		INSERT INTO reports (submission_id, report, score, band, tool_version, duration_ms, created_at)
		SELECT id, '{}', latest_score, latest_band, 'bench', 1, created_at FROM submissions;
		ANALYZE submissions; ANALYZE reports`); err != nil {
		b.Fatal(err)
	}
	return k
}

// BenchmarkSubmissions_100k lists the first page of an office with
// 100,000 submissions, unfiltered and filtered by band and status; a
// filtered list should cost about as much as an unfiltered one.
func BenchmarkSubmissions_100k(b *testing.B) {
	db, _ := storetest.MustOpenDB(b)
	k := seedOffice(b, db, 100_000)
	for _, bc := range []struct {
		name string
		f    service.Filter
	}{
		{"Unfiltered", service.Filter{Scope: k.Scope()}},
		{"ByBand", service.Filter{Scope: k.Scope(), Band: "high-concern"}},
		{"ByStatus", service.Filter{Scope: k.Scope(), Status: service.StatusDone}},
		{"ByBandAndStatus", service.Filter{Scope: k.Scope(), Band: "low-concern", Status: service.StatusDone}},
	} {
		b.Run(bc.name, func(b *testing.B) {
			for b.Loop() {
				page, _, err := db.Submissions(ctx, bc.f)
				if err != nil || len(page) != 50 {
					b.Fatalf("%d, %v", len(page), err)
				}
			}
		})
	}
	b.Run("ByBandJoiningReports", func(b *testing.B) { // the former query, for comparison
		for b.Loop() {
			rows, err := db.Pool.Query(ctx, `SELECT s.id FROM submissions s LEFT JOIN LATERAL (
				SELECT band FROM reports WHERE submission_id = s.id ORDER BY id DESC LIMIT 1) r ON true
				WHERE s.office_id = $1 AND r.band = 'high-concern' ORDER BY s.created_at DESC, s.id DESC LIMIT 51`, k.OfficeID)
			if err != nil {
				b.Fatal(err)
			}
			rows.Close()
		}
	})
}
