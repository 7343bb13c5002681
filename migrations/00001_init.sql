-- Larder's foundation: staff, sessions, clients and their records, audit log.
-- Masses are kept in kg; the unit a person typed is remembered for display.
-- CHECK constraints repeat the hard limits of the forms so that no path
-- (script, psql, a bug) can store a value the app would refuse.

-- +goose Up
CREATE TABLE users (
    id            bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    email         text        NOT NULL CHECK (length(email) BETWEEN 3 AND 254 AND position('@' in email) > 1),
    name          text        NOT NULL CHECK (length(btrim(name)) BETWEEN 1 AND 200),
    password_hash text        NOT NULL,
    role          text        NOT NULL CHECK (role IN ('admin', 'dietitian')),
    disabled      boolean     NOT NULL DEFAULT false,
    created_at    timestamptz NOT NULL DEFAULT now()
);
CREATE UNIQUE INDEX users_email_lower_idx ON users (lower(email));

-- Sessions as github.com/alexedwards/scs/pgxstore expects them.
CREATE TABLE sessions (
    token  text        PRIMARY KEY,
    data   bytea       NOT NULL,
    expiry timestamptz NOT NULL
);
CREATE INDEX sessions_expiry_idx ON sessions (expiry);

-- Practice-wide settings such as practice_name.
CREATE TABLE settings (
    key   text PRIMARY KEY CHECK (key ~ '^[a-z][a-z0-9_]*$'),
    value text NOT NULL
);

CREATE TABLE clients (
    id            bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    name          text        NOT NULL CHECK (length(btrim(name)) BETWEEN 1 AND 200),
    date_of_birth date        CHECK (date_of_birth >= DATE '1900-01-01'),
    -- sex as used by physiology equations (muscle mass, lean mass estimates)
    sex           text        NOT NULL CHECK (sex IN ('female', 'male')),
    height_cm     numeric(4,1) CHECK (height_cm BETWEEN 100 AND 250),
    sport         text        NOT NULL DEFAULT '' CHECK (length(sport) <= 100),
    notes         text        NOT NULL DEFAULT '' CHECK (length(notes) <= 5000),
    -- recorded cautions (diabetes, gut history, ...), shown prominently and printed on sheets
    cautions      text        NOT NULL DEFAULT '' CHECK (length(cautions) <= 2000),
    archived_at   timestamptz,
    created_at    timestamptz NOT NULL DEFAULT now(),
    updated_at    timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX clients_name_idx ON clients (lower(name));

CREATE TABLE body_mass (
    id           bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    client_id    bigint       NOT NULL REFERENCES clients (id) ON DELETE CASCADE,
    measured_on  date         NOT NULL,
    mass_kg      numeric(6,2) NOT NULL CHECK (mass_kg BETWEEN 20 AND 300),
    body_fat_pct numeric(4,1) CHECK (body_fat_pct BETWEEN 2 AND 60),
    method       text         NOT NULL DEFAULT '' CHECK (length(method) <= 100),
    entered_unit text         NOT NULL DEFAULT 'kg' CHECK (entered_unit IN ('kg', 'lb')),
    created_at   timestamptz  NOT NULL DEFAULT now()
);
CREATE INDEX body_mass_client_idx ON body_mass (client_id, measured_on DESC, id DESC);

CREATE TABLE training_sessions (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    client_id       bigint       NOT NULL REFERENCES clients (id) ON DELETE CASCADE,
    on_date         date         NOT NULL,
    start_time      time,
    modality        text         NOT NULL CHECK (modality IN ('run', 'cycle', 'swim', 'row', 'ski', 'triathlon', 'team', 'strength', 'other')),
    duration_min    integer      NOT NULL CHECK (duration_min > 0 AND duration_min <= 1440),
    intensity_kind  text         NOT NULL CHECK (intensity_kind IN ('rpe', 'zone', 'pct_vo2max')),
    -- rpe: 1-10; pct_vo2max: 20-120; zone: NULL (the named zone is in intensity_zone)
    intensity_value numeric(5,1),
    intensity_zone  text,
    distance_km     numeric(8,3) CHECK (distance_km > 0 AND distance_km <= 1000),
    status          text         NOT NULL DEFAULT 'done' CHECK (status IN ('planned', 'done')),
    notes           text         NOT NULL DEFAULT '' CHECK (length(notes) <= 2000),
    created_at      timestamptz  NOT NULL DEFAULT now(),
    CHECK (
        (intensity_kind = 'rpe' AND intensity_value BETWEEN 1 AND 10 AND intensity_zone IS NULL) OR
        (intensity_kind = 'pct_vo2max' AND intensity_value BETWEEN 20 AND 120 AND intensity_zone IS NULL) OR
        (intensity_kind = 'zone' AND intensity_value IS NULL AND
         intensity_zone IN ('recovery', 'endurance', 'tempo', 'threshold', 'maximal'))
    )
);
CREATE INDEX training_client_idx ON training_sessions (client_id, on_date DESC, start_time DESC NULLS LAST);

CREATE TABLE events (
    id                    bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    client_id             bigint       NOT NULL REFERENCES clients (id) ON DELETE CASCADE,
    name                  text         NOT NULL CHECK (length(btrim(name)) BETWEEN 1 AND 200),
    starts_at             timestamptz  NOT NULL,
    -- IANA zone the event is held in; feed times are shown in it
    time_zone             text         NOT NULL CHECK (length(time_zone) BETWEEN 1 AND 64),
    modality              text         NOT NULL CHECK (modality IN ('run', 'cycle', 'swim', 'row', 'ski', 'triathlon', 'team', 'strength', 'other')),
    distance_km           numeric(8,3) CHECK (distance_km > 0 AND distance_km <= 1000),
    -- for a multi-day event: the duration of one day's racing (e.g. a stage)
    expected_duration_min integer      NOT NULL CHECK (expected_duration_min > 0 AND expected_duration_min <= 1440),
    days                  integer      NOT NULL DEFAULT 1 CHECK (days BETWEEN 1 AND 30),
    priority              text         NOT NULL CHECK (priority IN ('A', 'B', 'C')),
    notes                 text         NOT NULL DEFAULT '' CHECK (length(notes) <= 2000),
    created_at            timestamptz  NOT NULL DEFAULT now()
);
CREATE INDEX events_client_idx ON events (client_id, starts_at);

CREATE TABLE audit_log (
    id        bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    at        timestamptz NOT NULL DEFAULT now(),
    -- NULL for actions without a signed-in user (command line, demo loader)
    user_id   bigint      REFERENCES users (id) ON DELETE SET NULL,
    action    text        NOT NULL,
    entity    text        NOT NULL,
    entity_id bigint,
    detail    jsonb       NOT NULL DEFAULT '{}'
);
CREATE INDEX audit_log_entity_idx ON audit_log (entity, entity_id, at DESC);
CREATE INDEX audit_log_at_idx ON audit_log (at DESC);

-- +goose Down
DROP TABLE audit_log;
DROP TABLE events;
DROP TABLE training_sessions;
DROP TABLE body_mass;
DROP TABLE clients;
DROP TABLE settings;
DROP TABLE sessions;
DROP TABLE users;
