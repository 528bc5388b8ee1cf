-- +goose Up
CREATE TABLE offices (
    id          bigserial PRIMARY KEY,
    name        text NOT NULL UNIQUE,
    created_at  timestamptz NOT NULL DEFAULT now()
);

-- API keys: only the SHA-256 of each token is kept.
CREATE TABLE api_keys (
    id            bigserial PRIMARY KEY,
    office_id     bigint NOT NULL REFERENCES offices (id) ON DELETE CASCADE,
    role          text NOT NULL CHECK (role IN ('editor', 'submitter')),
    token_sha256  bytea NOT NULL UNIQUE,
    created_at    timestamptz NOT NULL DEFAULT now(),
    revoked_at    timestamptz
);

CREATE TABLE submissions (
    id               uuid PRIMARY KEY,
    office_id        bigint NOT NULL REFERENCES offices (id) ON DELETE CASCADE,
    submitter_key_id bigint NOT NULL REFERENCES api_keys (id) ON DELETE CASCADE,
    manuscript_id    text NOT NULL DEFAULT '',
    title            text NOT NULL,
    package          bytea NOT NULL,
    data             bytea,
    package_sha256   text NOT NULL,
    status           text NOT NULL CHECK (status IN ('queued', 'running', 'done', 'failed')),
    error            text NOT NULL DEFAULT '',
    attempts         integer NOT NULL DEFAULT 0,
    idempotency_key  text,
    created_at       timestamptz NOT NULL,
    updated_at       timestamptz NOT NULL,
    UNIQUE (submitter_key_id, idempotency_key)
);
CREATE INDEX submissions_office_created ON submissions (office_id, created_at DESC, id DESC);
CREATE INDEX submissions_office_manuscript ON submissions (office_id, manuscript_id);

-- Every run of the pipeline keeps its report; the newest is the current one.
CREATE TABLE reports (
    id             bigserial PRIMARY KEY,
    submission_id  uuid NOT NULL REFERENCES submissions (id) ON DELETE CASCADE,
    report         json NOT NULL,
    score          integer NOT NULL,
    band           text NOT NULL,
    tool_version   text NOT NULL,
    duration_ms    integer NOT NULL,
    created_at     timestamptz NOT NULL
);
CREATE INDEX reports_submission ON reports (submission_id, id DESC);

-- +goose Down
DROP TABLE reports;
DROP TABLE submissions;
DROP TABLE api_keys;
DROP TABLE offices;
