-- +goose Up
-- One webhook per office: where to POST when a screening ends, and the
-- secret its bodies are signed with (HMAC-SHA256; kept in clear, as
-- signing needs it).
CREATE TABLE webhooks (
    office_id   bigint PRIMARY KEY REFERENCES offices (id) ON DELETE CASCADE,
    url         text NOT NULL,
    secret      text NOT NULL,
    created_at  timestamptz NOT NULL
);

-- Every notification, with its outcome; sent by the job queue.
CREATE TABLE webhook_deliveries (
    id               bigserial PRIMARY KEY,
    office_id        bigint NOT NULL REFERENCES webhooks (office_id) ON DELETE CASCADE,
    submission_id    uuid NOT NULL,
    payload          bytea NOT NULL,
    status           text NOT NULL CHECK (status IN ('pending', 'delivered', 'failed')),
    attempts         integer NOT NULL DEFAULT 0,
    last_status_code integer,
    last_error       text NOT NULL DEFAULT '',
    created_at       timestamptz NOT NULL,
    finished_at      timestamptz
);
CREATE INDEX webhook_deliveries_office ON webhook_deliveries (office_id, id DESC);

-- +goose Down
DROP TABLE webhook_deliveries;
DROP TABLE webhooks;
