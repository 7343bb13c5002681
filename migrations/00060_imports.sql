-- Imports of body mass and training from files. A session read from a
-- watch or bike computer file keeps its average heart rate and power when
-- the file recorded them, and the file it came from. An upload is kept
-- between its preview and its confirmation (the server keeps no state of
-- its own), then deleted; uploads left unconfirmed are purged after a day.

-- +goose Up
ALTER TABLE training_sessions
    ADD COLUMN avg_heart_rate smallint CHECK (avg_heart_rate BETWEEN 30 AND 250),
    ADD COLUMN avg_power_w    smallint CHECK (avg_power_w BETWEEN 1 AND 2000),
    ADD COLUMN source         text     NOT NULL DEFAULT '' CHECK (length(source) <= 255);

CREATE TABLE import_uploads (
    id         bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    created_by bigint      NOT NULL REFERENCES users (id) ON DELETE CASCADE,
    -- NULL for a practice-wide file, whose rows name their clients
    client_id  bigint      REFERENCES clients (id) ON DELETE CASCADE,
    kind       text        NOT NULL CHECK (kind IN ('body_mass', 'training', 'activity')),
    created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX import_uploads_created_idx ON import_uploads (created_at);

CREATE TABLE import_upload_files (
    upload_id bigint  NOT NULL REFERENCES import_uploads (id) ON DELETE CASCADE,
    seq       integer NOT NULL,
    name      text    NOT NULL CHECK (length(name) <= 255),
    content   bytea   NOT NULL,
    PRIMARY KEY (upload_id, seq)
);

-- +goose Down
DROP TABLE import_upload_files;
DROP TABLE import_uploads;
ALTER TABLE training_sessions DROP COLUMN source, DROP COLUMN avg_power_w, DROP COLUMN avg_heart_rate;
