package store

import (
	"context"

	"github.com/jackc/pgx/v5"

	"github.com/pathvet/pathvet/api/service"
)

// The review's queries: reviewers' decisions on findings (migration
// 00012), every one kept, and the versions of a manuscript with their
// newest reports and decisions.

const annotationColumns = `a.id, a.submission_id::text, a.finding_key, a.decision, a.reason, a.question,
	a.key_label, coalesce(a.key_id, 0), a.created_at`

func scanAnnotation(row pgx.Row) (service.Annotation, error) {
	var a service.Annotation
	err := row.Scan(&a.ID, &a.SubmissionID, &a.Key, &a.Decision, &a.Reason, &a.Question, &a.By, &a.ByKeyID, &a.At)
	a.At = a.At.UTC()
	return a, err
}

// Annotate keeps a decision on a finding of a submission the scope may
// see, made with key k, and returns it as kept.
func (db *DB) Annotate(ctx context.Context, id string, sc service.Scope, k *service.Key, n service.NewAnnotation) (
	*service.Annotation, error) {
	if _, err := db.Submission(ctx, id, sc); err != nil {
		return nil, err
	}
	a, err := scanAnnotation(db.Pool.QueryRow(ctx, `INSERT INTO finding_annotations AS a (submission_id,
		finding_key, decision, reason, question, key_id, key_label, created_at)
		VALUES ($1, $2, $3, $4, $5, $6, $7, $8) RETURNING `+annotationColumns,
		id, n.Key, n.Decision, n.Reason, n.Question, k.ID, k.Label, db.now()))
	if err != nil {
		return nil, dbError(err, "decision")
	}
	return &a, nil
}

// Annotations returns every decision made on a submission the scope may
// see, oldest first.
func (db *DB) Annotations(ctx context.Context, id string, sc service.Scope) ([]service.Annotation, error) {
	if _, err := db.Submission(ctx, id, sc); err != nil {
		return nil, err
	}
	return db.annotations(ctx, `SELECT `+annotationColumns+` FROM finding_annotations a
		WHERE a.submission_id = $1 ORDER BY a.id`, id)
}

func (db *DB) annotations(ctx context.Context, query string, args ...any) ([]service.Annotation, error) {
	rows, err := db.Pool.Query(ctx, query, args...)
	if err != nil {
		return nil, dbError(err, "decisions")
	}
	defer rows.Close()
	out := []service.Annotation{}
	for rows.Next() {
		a, err := scanAnnotation(rows)
		if err != nil {
			return nil, dbError(err, "decisions")
		}
		out = append(out, a)
	}
	return out, dbError(rows.Err(), "decisions")
}

// maxVersions is how many versions of a manuscript a review reads back:
// a decision older than that many versions is not carried over.
const maxVersions = 12

// ReviewChain returns the versions of sub's manuscript that the scope may
// see, up to and including sub, oldest first (at most the newest
// maxVersions; sub alone when it has no manuscript ID), each with its
// newest report and the newest decision on each of its findings.
func (db *DB) ReviewChain(ctx context.Context, sub *service.Submission, sc service.Scope) (
	[]service.ReviewVersion, error) {
	subs := []*service.Submission{sub}
	if sub.ManuscriptID != "" {
		var err error
		if subs, err = db.earlierVersions(ctx, sub, sc); err != nil {
			return nil, err
		}
	}
	out := make([]service.ReviewVersion, len(subs))
	for i, s := range subs {
		v, err := db.reviewVersion(ctx, s, sc)
		if err != nil {
			return nil, err
		}
		out[i] = v
	}
	return out, nil
}

func (db *DB) earlierVersions(ctx context.Context, sub *service.Submission, sc service.Scope) (
	[]*service.Submission, error) {
	rows, err := db.Pool.Query(ctx, `SELECT * FROM (SELECT `+submissionColumns+submissionFrom+` WHERE`+scopeSQL+`
		AND s.manuscript_id = $4 AND (s.created_at, s.id) <= ($5, $6)
		ORDER BY s.created_at DESC, s.id DESC LIMIT $7) v ORDER BY created_at, id`,
		sc.OfficeID, sc.Editor, sc.KeyID, sub.ManuscriptID, sub.CreatedAt, sub.ID, maxVersions)
	if err != nil {
		return nil, dbError(err, "versions")
	}
	defer rows.Close()
	var out []*service.Submission
	for rows.Next() {
		s, err := scanSubmission(rows)
		if err != nil {
			return nil, dbError(err, "versions")
		}
		out = append(out, s)
	}
	return out, dbError(rows.Err(), "versions")
}

func (db *DB) reviewVersion(ctx context.Context, s *service.Submission, sc service.Scope) (
	service.ReviewVersion, error) {
	v := service.ReviewVersion{Submission: s}
	r, err := db.LatestReport(ctx, s.ID, sc, 0)
	switch {
	case service.ErrorCode(err) == service.ENotFound:
	case err != nil:
		return v, err
	default:
		v.Report = r.JSON
	}
	v.Own, err = db.annotations(ctx, `SELECT DISTINCT ON (a.finding_key) `+annotationColumns+`
		FROM finding_annotations a WHERE a.submission_id = $1 ORDER BY a.finding_key, a.id DESC`, s.ID)
	return v, err
}

// Packages returns the package of each listed submission the scope may
// see, with the SHA-256 of its data part (hex; of nothing where the data
// are inline or summary statistics).
func (db *DB) Packages(ctx context.Context, ids []string, sc service.Scope) (map[string]service.PackageBytes, error) {
	rows, err := db.Pool.Query(ctx, `SELECT s.id::text, s.package, encode(sha256(coalesce(s.data, ''::bytea)), 'hex')
		FROM submissions s WHERE`+scopeSQL+` AND s.id::text = ANY($4)`, sc.OfficeID, sc.Editor, sc.KeyID, ids)
	if err != nil {
		return nil, dbError(err, "packages")
	}
	defer rows.Close()
	out := map[string]service.PackageBytes{}
	for rows.Next() {
		var id string
		var p service.PackageBytes
		if err := rows.Scan(&id, &p.Package, &p.DataSHA256); err != nil {
			return nil, dbError(err, "packages")
		}
		out[id] = p
	}
	return out, dbError(rows.Err(), "packages")
}
