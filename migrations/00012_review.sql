-- +goose Up
-- The review of a submission. Every decision a reviewer makes on a finding
-- (ask the authors, note for the editor, dismiss with a reason; a reworded
-- question) is a new row, so that the history says who decided what and
-- when; the newest row of a finding is the decision in force. The label of
-- the deciding key is kept as it was, and stays when the key is deleted.
CREATE TABLE finding_annotations (
    id             bigserial PRIMARY KEY,
    submission_id  uuid NOT NULL REFERENCES submissions (id) ON DELETE CASCADE,
    finding_key    text NOT NULL,
    decision       text NOT NULL CHECK (decision IN ('ask', 'note', 'dismiss')),
    reason         text NOT NULL DEFAULT '',
    question       text NOT NULL DEFAULT '',
    key_id         bigint REFERENCES api_keys (id) ON DELETE SET NULL,
    key_label      text NOT NULL,
    created_at     timestamptz NOT NULL,
    CHECK (decision <> 'dismiss' OR reason <> '')
);
CREATE INDEX finding_annotations_submission ON finding_annotations (submission_id, finding_key, id DESC);

-- A comment an office publishes on a submission: the asked points as they
-- were when published, at an address whose secret part (token) is
-- looked up by its SHA-256; withdrawn by deleting the row.
CREATE TABLE published_comments (
    submission_id  uuid PRIMARY KEY REFERENCES submissions (id) ON DELETE CASCADE,
    office_id      bigint NOT NULL REFERENCES offices (id) ON DELETE CASCADE,
    token          text NOT NULL,
    token_sha256   bytea NOT NULL UNIQUE,
    letter         json NOT NULL,
    indexable      boolean NOT NULL DEFAULT false,
    key_label      text NOT NULL,
    published_at   timestamptz NOT NULL
);
CREATE INDEX published_comments_office ON published_comments (office_id, published_at DESC);

-- What an office deleted, so that the dashboard can say so: the
-- submission's title and manuscript ID, how many reports went with it,
-- whether a published comment was withdrawn, who deleted it and when.
CREATE TABLE deleted_submissions (
    submission_id  uuid PRIMARY KEY,
    office_id      bigint NOT NULL REFERENCES offices (id) ON DELETE CASCADE,
    title          text NOT NULL,
    manuscript_id  text NOT NULL,
    reports        integer NOT NULL,
    had_comment    boolean NOT NULL,
    key_id         bigint,
    key_label      text NOT NULL,
    deleted_at     timestamptz NOT NULL
);
CREATE INDEX deleted_submissions_office ON deleted_submissions (office_id, deleted_at DESC);

-- +goose Down
DROP TABLE deleted_submissions;
DROP TABLE published_comments;
DROP TABLE finding_annotations;
