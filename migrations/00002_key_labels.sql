-- +goose Up
-- A key names who holds it, and remembers when it was last used (to the
-- minute: KeyByToken writes at most once a minute per key).
ALTER TABLE api_keys ADD COLUMN label text NOT NULL DEFAULT '';
ALTER TABLE api_keys ADD COLUMN last_used_at timestamptz;

-- +goose Down
ALTER TABLE api_keys DROP COLUMN last_used_at;
ALTER TABLE api_keys DROP COLUMN label;
