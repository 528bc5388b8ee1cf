-- +goose Up
-- How far a running screening is (the worker writes it at most once a
-- second; cleared when the attempt ends), and the package's data cells
-- (rows × columns of raw data, 0 for summary statistics), which scale a
-- job's deadline and are carried into the job of a rerun.
ALTER TABLE submissions ADD COLUMN progress_stage text;
ALTER TABLE submissions ADD COLUMN progress_done integer;
ALTER TABLE submissions ADD COLUMN progress_total integer;
ALTER TABLE submissions ADD COLUMN progress_at timestamptz;
ALTER TABLE submissions ADD COLUMN cells bigint NOT NULL DEFAULT 0;

-- +goose Down
ALTER TABLE submissions DROP COLUMN cells;
ALTER TABLE submissions DROP COLUMN progress_at;
ALTER TABLE submissions DROP COLUMN progress_total;
ALTER TABLE submissions DROP COLUMN progress_done;
ALTER TABLE submissions DROP COLUMN progress_stage;
