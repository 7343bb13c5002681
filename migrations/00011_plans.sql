-- Plans: a client's loading, race-day, repletion or training-week plan, kept as
-- numbered versions. A version holds the fuel request it was computed from
-- (with the dietitian's overrides) and the computed plan, both as JSON, plus
-- its days and feeds flattened into rows for queries and the plan sheet.
-- A draft is edited in place under optimistic locking (revision); publishing
-- freezes it; revising makes a new draft version. Published and superseded
-- versions are never changed again, and a trigger holds the database to that.

-- +goose Up
CREATE TABLE plans (
    id          bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    client_id   bigint      NOT NULL REFERENCES clients (id) ON DELETE CASCADE,
    -- the event a loading or race plan leads to; NULL for repletion and week plans
    event_id    bigint      REFERENCES events (id) ON DELETE SET NULL,
    kind        text        NOT NULL CHECK (kind IN ('loading', 'race', 'repletion', 'week')),
    protocol    text        NOT NULL DEFAULT '' CHECK (protocol IN ('', 'two-day', 'one-day', 'three-day')),
    title       text        NOT NULL CHECK (length(btrim(title)) BETWEEN 1 AND 200),
    created_by  bigint      REFERENCES users (id) ON DELETE SET NULL,
    created_at  timestamptz NOT NULL DEFAULT now(),
    updated_at  timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX plans_client_idx ON plans (client_id, created_at DESC);

CREATE TABLE plan_versions (
    id           bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    plan_id      bigint       NOT NULL REFERENCES plans (id) ON DELETE CASCADE,
    version      integer      NOT NULL CHECK (version >= 1),
    status       text         NOT NULL CHECK (status IN ('draft', 'published', 'superseded')),
    request      jsonb        NOT NULL, -- fuel.Request, overrides included
    result       jsonb        NOT NULL, -- fuel.Plan as computed from request
    body_mass_kg numeric(6,2) NOT NULL CHECK (body_mass_kg BETWEEN 20 AND 300),
    body_mass_on date,                  -- date of the measurement used; NULL when typed in
    -- optimistic locking: every save of a draft must name the revision it edited
    revision     integer      NOT NULL DEFAULT 1 CHECK (revision >= 1),
    created_by   bigint       REFERENCES users (id) ON DELETE SET NULL,
    created_at   timestamptz  NOT NULL DEFAULT now(),
    updated_by   bigint       REFERENCES users (id) ON DELETE SET NULL,
    updated_at   timestamptz  NOT NULL DEFAULT now(),
    published_by bigint       REFERENCES users (id) ON DELETE SET NULL,
    published_at timestamptz,
    UNIQUE (plan_id, version),
    CHECK ((status = 'draft') = (published_at IS NULL))
);
-- At most one draft and one published version per plan.
CREATE UNIQUE INDEX plan_versions_one_draft_idx ON plan_versions (plan_id) WHERE status = 'draft';
CREATE UNIQUE INDEX plan_versions_one_published_idx ON plan_versions (plan_id) WHERE status = 'published';

-- +goose StatementBegin
CREATE FUNCTION plan_versions_frozen() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    IF TG_OP = 'DELETE' THEN
        IF OLD.status <> 'draft' THEN
            RAISE EXCEPTION 'plan version % is %, it cannot be deleted', OLD.id, OLD.status;
        END IF;
        RETURN OLD;
    END IF;
    IF OLD.status <> 'draft' AND (NEW.request IS DISTINCT FROM OLD.request OR NEW.result IS DISTINCT FROM OLD.result
        OR NEW.body_mass_kg IS DISTINCT FROM OLD.body_mass_kg OR NEW.version IS DISTINCT FROM OLD.version
        OR NEW.plan_id IS DISTINCT FROM OLD.plan_id OR NEW.revision IS DISTINCT FROM OLD.revision) THEN
        RAISE EXCEPTION 'plan version % is %, its content cannot change', OLD.id, OLD.status;
    END IF;
    IF OLD.status = 'superseded' AND NEW.status <> 'superseded' THEN
        RAISE EXCEPTION 'plan version % is superseded for good', OLD.id;
    END IF;
    IF OLD.status = 'published' AND NEW.status NOT IN ('published', 'superseded') THEN
        RAISE EXCEPTION 'published plan version % cannot go back to draft', OLD.id;
    END IF;
    RETURN NEW;
END
$$;
-- +goose StatementEnd

-- Deleting a client (or plan) removes its versions by cascade; the trigger
-- guards only direct edits, so it fires for UPDATE and for DELETE of single
-- versions outside a cascade (pg_trigger_depth() = 0).
CREATE TRIGGER plan_versions_frozen_update BEFORE UPDATE ON plan_versions
    FOR EACH ROW EXECUTE FUNCTION plan_versions_frozen();
CREATE TRIGGER plan_versions_frozen_delete BEFORE DELETE ON plan_versions
    FOR EACH ROW WHEN (pg_trigger_depth() = 0) EXECUTE FUNCTION plan_versions_frozen();

CREATE TABLE plan_days (
    plan_version_id bigint       NOT NULL REFERENCES plan_versions (id) ON DELETE CASCADE,
    on_date         date         NOT NULL,
    role            text         NOT NULL,
    load_band       text         NOT NULL,
    training_min    numeric(6,1) NOT NULL DEFAULT 0,
    cho_g_per_kg    numeric(5,2) NOT NULL,
    cho_g           numeric(7,1) NOT NULL,
    protein_g       numeric(7,1) NOT NULL,
    fat_g           numeric(7,1) NOT NULL,
    energy_kcal     numeric(7,0) NOT NULL,
    low_fibre       boolean      NOT NULL DEFAULT false,
    overridden      boolean      NOT NULL DEFAULT false,
    PRIMARY KEY (plan_version_id, on_date)
);

CREATE TABLE plan_feeds (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    plan_version_id bigint       NOT NULL REFERENCES plan_versions (id) ON DELETE CASCADE,
    -- 'day' for a day's eating occasion, 'pre_event' for the pre-event meal,
    -- 'repletion' for a feed of the speedy-refuelling window
    kind            text         NOT NULL CHECK (kind IN ('day', 'pre_event', 'repletion')),
    on_date         date         NOT NULL,
    feed_index      integer      NOT NULL,
    at              timestamptz  NOT NULL,
    label           text         NOT NULL DEFAULT '',
    cho_g           numeric(7,1) NOT NULL,
    protein_g       numeric(7,1) NOT NULL DEFAULT 0,
    overridden      boolean      NOT NULL DEFAULT false,
    suggestion      text         NOT NULL DEFAULT '', -- food suggestion shown with the feed
    UNIQUE (plan_version_id, kind, on_date, feed_index)
);
CREATE INDEX plan_feeds_at_idx ON plan_feeds (plan_version_id, at);

-- +goose Down
DROP TABLE plan_feeds;
DROP TABLE plan_days;
DROP TABLE plan_versions;
DROP FUNCTION plan_versions_frozen();
DROP TABLE plans;
