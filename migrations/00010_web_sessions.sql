-- +goose Up
-- Sessions of the web workspace: a browser signs in with an API key and
-- gets a session; only the SHA-256 of the session id is kept.
CREATE TABLE web_sessions (
    id_sha256   bytea PRIMARY KEY,
    key_id      bigint NOT NULL REFERENCES api_keys (id) ON DELETE CASCADE,
    created_at  timestamptz NOT NULL,
    expires_at  timestamptz NOT NULL,
    ended_at    timestamptz
);
CREATE INDEX web_sessions_expires ON web_sessions (expires_at);

-- Failed sign-ins per client address, to slow down guessing.
CREATE TABLE web_sign_in_failures (
    address    text PRIMARY KEY,
    failures   integer NOT NULL,
    last_at    timestamptz NOT NULL
);

-- +goose Down
DROP TABLE web_sign_in_failures;
DROP TABLE web_sessions;
