-- +goose Up
-- The newest report's score and band, and the number of reports, kept on
-- the submission (SaveReport writes them with the report), so that a list
-- filtered by band reads one index instead of joining every row's reports.
ALTER TABLE submissions ADD COLUMN latest_score integer;
ALTER TABLE submissions ADD COLUMN latest_band text;
ALTER TABLE submissions ADD COLUMN report_count integer NOT NULL DEFAULT 0;
UPDATE submissions s SET latest_score = r.score, latest_band = r.band, report_count = r.n
FROM (SELECT DISTINCT ON (submission_id) submission_id, score, band,
        count(*) OVER (PARTITION BY submission_id) AS n
      FROM reports ORDER BY submission_id, id DESC) r
WHERE r.submission_id = s.id;
CREATE INDEX submissions_office_band_created ON submissions (office_id, latest_band, created_at DESC, id DESC);
CREATE INDEX submissions_office_status_created ON submissions (office_id, status, created_at DESC, id DESC);

-- +goose Down
DROP INDEX submissions_office_status_created;
DROP INDEX submissions_office_band_created;
ALTER TABLE submissions DROP COLUMN report_count;
ALTER TABLE submissions DROP COLUMN latest_band;
ALTER TABLE submissions DROP COLUMN latest_score;
