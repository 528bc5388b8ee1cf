-- +goose Up
-- Changes that a server may hold in memory are announced when their
-- transaction commits, and the servers' read caches forget what they name
-- (store/cache.go): on pathvet_keys every change to a key or an office
-- (a revocation, a deletion, a rename; not the once-a-minute note of a
-- key's last use), on pathvet_reports, with the submission's id, every
-- report stored or deleted and every submission deleted.
-- +goose StatementBegin
CREATE FUNCTION pathvet_keys_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    PERFORM pg_notify('pathvet_keys', TG_TABLE_NAME);
    RETURN NULL;
END
$$;
-- +goose StatementEnd
-- +goose StatementBegin
CREATE FUNCTION pathvet_report_changed() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    IF TG_TABLE_NAME = 'submissions' THEN
        PERFORM pg_notify('pathvet_reports', OLD.id::text);
    ELSIF TG_OP = 'DELETE' THEN
        PERFORM pg_notify('pathvet_reports', OLD.submission_id::text);
    ELSE
        PERFORM pg_notify('pathvet_reports', NEW.submission_id::text);
    END IF;
    RETURN NULL;
END
$$;
-- +goose StatementEnd
CREATE TRIGGER api_keys_changed AFTER UPDATE OF revoked_at, role, office_id, label, token_sha256 OR DELETE
    ON api_keys FOR EACH STATEMENT EXECUTE FUNCTION pathvet_keys_changed();
CREATE TRIGGER offices_changed AFTER UPDATE OF name OR DELETE
    ON offices FOR EACH STATEMENT EXECUTE FUNCTION pathvet_keys_changed();
CREATE TRIGGER reports_changed AFTER INSERT OR UPDATE OR DELETE
    ON reports FOR EACH ROW EXECUTE FUNCTION pathvet_report_changed();
CREATE TRIGGER submissions_deleted AFTER DELETE OR UPDATE OF office_id, submitter_key_id
    ON submissions FOR EACH ROW EXECUTE FUNCTION pathvet_report_changed();

-- +goose Down
DROP TRIGGER submissions_deleted ON submissions;
DROP TRIGGER reports_changed ON reports;
DROP TRIGGER offices_changed ON offices;
DROP TRIGGER api_keys_changed ON api_keys;
DROP FUNCTION pathvet_report_changed();
DROP FUNCTION pathvet_keys_changed();
