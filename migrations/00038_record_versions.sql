-- Every editable record carries a version, raised by one on each update by
-- a trigger (so no UPDATE anywhere can forget it). An edit form carries the
-- version it was opened at; a save whose version is no longer the row's is
-- refused instead of silently undoing someone else's change. Clients have
-- done this with updated_at, plans with their revision; these are the rest.

-- +goose Up
-- +goose StatementBegin
CREATE FUNCTION bump_record_version() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    NEW.version := OLD.version + 1;
    RETURN NEW;
END
$$;
-- +goose StatementEnd

ALTER TABLE body_mass         ADD COLUMN version integer NOT NULL DEFAULT 1;
ALTER TABLE training_sessions ADD COLUMN version integer NOT NULL DEFAULT 1;
ALTER TABLE events            ADD COLUMN version integer NOT NULL DEFAULT 1;
ALTER TABLE foods             ADD COLUMN version integer NOT NULL DEFAULT 1;
ALTER TABLE users             ADD COLUMN version integer NOT NULL DEFAULT 1;
ALTER TABLE settings          ADD COLUMN version integer NOT NULL DEFAULT 1;

CREATE TRIGGER body_mass_version         BEFORE UPDATE ON body_mass         FOR EACH ROW EXECUTE FUNCTION bump_record_version();
CREATE TRIGGER training_sessions_version BEFORE UPDATE ON training_sessions FOR EACH ROW EXECUTE FUNCTION bump_record_version();
CREATE TRIGGER events_version            BEFORE UPDATE ON events            FOR EACH ROW EXECUTE FUNCTION bump_record_version();
CREATE TRIGGER foods_version             BEFORE UPDATE ON foods             FOR EACH ROW EXECUTE FUNCTION bump_record_version();
CREATE TRIGGER users_version             BEFORE UPDATE ON users             FOR EACH ROW EXECUTE FUNCTION bump_record_version();
CREATE TRIGGER settings_version          BEFORE UPDATE ON settings          FOR EACH ROW EXECUTE FUNCTION bump_record_version();

-- +goose Down
DROP TRIGGER settings_version ON settings;
DROP TRIGGER users_version ON users;
DROP TRIGGER foods_version ON foods;
DROP TRIGGER events_version ON events;
DROP TRIGGER training_sessions_version ON training_sessions;
DROP TRIGGER body_mass_version ON body_mass;
ALTER TABLE settings DROP COLUMN version;
ALTER TABLE users DROP COLUMN version;
ALTER TABLE foods DROP COLUMN version;
ALTER TABLE events DROP COLUMN version;
ALTER TABLE training_sessions DROP COLUMN version;
ALTER TABLE body_mass DROP COLUMN version;
DROP FUNCTION bump_record_version();
