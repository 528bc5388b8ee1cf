package store

import (
	"context"
	"time"

	"github.com/pathvet/pathvet/api/service"
)

// Queries of the web workspace: report history, versions of a manuscript,
// counts by band and the recent reports behind the office's recurring
// findings. Each is limited to what a scope may see.

// ReportHistory returns every report of a submission the scope may see,
// newest first.
func (db *DB) ReportHistory(ctx context.Context, id string, sc service.Scope) ([]service.ReportEntry, error) {
	if _, err := db.Submission(ctx, id, sc); err != nil {
		return nil, err
	}
	rows, err := db.Pool.Query(ctx, `SELECT id, created_at, score, band, tool_version, report::text
		FROM reports WHERE submission_id = $1 ORDER BY id DESC`, id)
	if err != nil {
		return nil, dbError(err, "reports")
	}
	defer rows.Close()
	var out []service.ReportEntry
	for rows.Next() {
		var e service.ReportEntry
		var b string
		if err := rows.Scan(&e.ID, &e.CreatedAt, &e.Score, &e.Band, &e.ToolVersion, &b); err != nil {
			return nil, dbError(err, "reports")
		}
		e.Report = []byte(b)
		out = append(out, e)
	}
	return out, dbError(rows.Err(), "reports")
}

// PreviousVersion returns the submission of the same manuscript that came
// just before sub, among those the scope may see, with its newest report
// (nil when it has none); not found when sub is the first version or has
// no manuscript ID.
func (db *DB) PreviousVersion(ctx context.Context, sub *service.Submission, sc service.Scope) (
	*service.Submission, []byte, error) {
	if sub.ManuscriptID == "" {
		return nil, nil, service.Errorf(service.ENotFound, "no manuscript ID, so no earlier version")
	}
	prev, err := scanSubmission(db.Pool.QueryRow(ctx, `SELECT `+submissionColumns+submissionFrom+` WHERE`+scopeSQL+`
		AND s.manuscript_id = $4 AND (s.created_at, s.id) < ($5, $6)
		ORDER BY s.created_at DESC, s.id DESC LIMIT 1`,
		sc.OfficeID, sc.Editor, sc.KeyID, sub.ManuscriptID, sub.CreatedAt, sub.ID))
	if err != nil {
		return nil, nil, dbError(err, "earlier version")
	}
	r, err := db.LatestReport(ctx, prev.ID, sc, 0)
	if service.ErrorCode(err) == service.ENotFound {
		return prev, nil, nil
	}
	if err != nil {
		return nil, nil, err
	}
	return prev, r.JSON, nil
}

// Versions numbers each listed submission among the submissions of its
// manuscript the scope may see, oldest first; submissions without a
// manuscript ID are left out.
func (db *DB) Versions(ctx context.Context, ids []string, sc service.Scope) (map[string]service.Version, error) {
	rows, err := db.Pool.Query(ctx, `
		SELECT s.id::text,
			(SELECT count(*) FROM submissions t WHERE t.office_id = s.office_id AND t.manuscript_id = s.manuscript_id
				AND ($2 OR t.submitter_key_id = $3) AND (t.created_at, t.id) <= (s.created_at, s.id)),
			(SELECT count(*) FROM submissions t WHERE t.office_id = s.office_id AND t.manuscript_id = s.manuscript_id
				AND ($2 OR t.submitter_key_id = $3))
		FROM submissions s WHERE`+scopeSQL+` AND s.manuscript_id <> '' AND s.id::text = ANY($4)`,
		sc.OfficeID, sc.Editor, sc.KeyID, ids)
	if err != nil {
		return nil, dbError(err, "versions")
	}
	defer rows.Close()
	out := map[string]service.Version{}
	for rows.Next() {
		var id string
		var v service.Version
		if err := rows.Scan(&id, &v.N, &v.Of); err != nil {
			return nil, dbError(err, "versions")
		}
		out[id] = v
	}
	return out, dbError(rows.Err(), "versions")
}

// BandCounts counts the scope's submissions by the band of their newest
// report; those without a report count under "failed" when their
// screening failed, and under "" (not screened yet) otherwise.
func (db *DB) BandCounts(ctx context.Context, sc service.Scope) (map[string]int, error) {
	rows, err := db.Pool.Query(ctx, `
		SELECT coalesce((SELECT band FROM reports WHERE submission_id = s.id ORDER BY id DESC LIMIT 1),
			CASE WHEN s.status = 'failed' THEN 'failed' ELSE '' END), count(*)
		FROM submissions s WHERE`+scopeSQL+` GROUP BY 1`, sc.OfficeID, sc.Editor, sc.KeyID)
	if err != nil {
		return nil, dbError(err, "counts")
	}
	defer rows.Close()
	out := map[string]int{}
	for rows.Next() {
		var band string
		var n int
		if err := rows.Scan(&band, &n); err != nil {
			return nil, dbError(err, "counts")
		}
		out[band] = n
	}
	return out, dbError(rows.Err(), "counts")
}

// RecentReports returns the newest report of each of the scope's
// submissions received since the given time, at most limit of them
// (newest submissions first), and whether more were left out. Each is cut
// to what a tally reads: significance_level, checks and claims (not the
// graph section, which lists members and is the largest).
func (db *DB) RecentReports(ctx context.Context, sc service.Scope, since time.Time, limit int) ([][]byte, bool, error) {
	rows, err := db.Pool.Query(ctx, `
		SELECT json_build_object('significance_level', r.report->'significance_level',
			'checks', r.report->'checks', 'claims', r.report->'claims')::text
		FROM submissions s JOIN LATERAL (
			SELECT report FROM reports WHERE submission_id = s.id ORDER BY id DESC LIMIT 1) r ON true
		WHERE`+scopeSQL+` AND s.created_at >= $4
		ORDER BY s.created_at DESC, s.id DESC LIMIT $5`, sc.OfficeID, sc.Editor, sc.KeyID, since, limit+1)
	if err != nil {
		return nil, false, dbError(err, "reports")
	}
	defer rows.Close()
	var out [][]byte
	for rows.Next() {
		var b string
		if err := rows.Scan(&b); err != nil {
			return nil, false, dbError(err, "reports")
		}
		out = append(out, []byte(b))
	}
	if len(out) > limit {
		return out[:limit], true, dbError(rows.Err(), "reports")
	}
	return out, false, dbError(rows.Err(), "reports")
}

// SubmissionPackage returns the package a submission was sent with and the
// data sent beside it as a multipart part (nil when the data were inline
// or summary statistics), for a scope that may see it.
func (db *DB) SubmissionPackage(ctx context.Context, id string, sc service.Scope) ([]byte, []byte, error) {
	if !uuidRE.MatchString(id) {
		return nil, nil, service.Errorf(service.ENotFound, "submission not found")
	}
	var pkg, data []byte
	err := db.Pool.QueryRow(ctx, `SELECT s.package, s.data FROM submissions s WHERE`+scopeSQL+` AND s.id = $4`,
		sc.OfficeID, sc.Editor, sc.KeyID, id).Scan(&pkg, &data)
	if err != nil {
		return nil, nil, dbError(err, "submission")
	}
	return pkg, data, nil
}
