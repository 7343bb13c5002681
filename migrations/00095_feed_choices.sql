-- The dietitian's own food for a feed. On a draft the dietitian may replace
-- a feed's suggestion with lines of their own: a food of the foods list in
-- grams, or a free line in their words ("banana and a rice cake") with its
-- carbohydrate. The lines belong to the plan version and name the feed as
-- the stored suggestions do (kind, date, index), not by a plan_feeds row,
-- because a save of the draft rewrites those rows; a new version made from
-- this one copies them. Each food line keeps the food's name and the
-- carbohydrate and protein it gave when chosen, so the choice reads the
-- same after the foods list changes. Like the version itself, the lines of a
-- published or superseded version never change again.

-- +goose Up
CREATE TABLE plan_feed_choices (
    id              bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    plan_version_id bigint       NOT NULL REFERENCES plan_versions (id) ON DELETE CASCADE,
    kind            text         NOT NULL CHECK (kind IN ('day', 'pre_event', 'repletion')),
    on_date         date         NOT NULL,
    feed_index      integer      NOT NULL CHECK (feed_index >= 0),
    line            integer      NOT NULL CHECK (line >= 0),
    free            boolean      NOT NULL,
    -- the food of a food line; NULL for a free line or once the food is deleted
    food_id         bigint       REFERENCES foods (id) ON DELETE SET NULL,
    -- the food's name when chosen, or the free line's words
    name            text         NOT NULL CHECK (length(btrim(name)) BETWEEN 1 AND 200),
    amount_g        numeric(6,1) CHECK (amount_g > 0 AND amount_g <= 2000),
    cho_g           numeric(6,1) NOT NULL CHECK (cho_g BETWEEN 0 AND 1000),
    protein_g       numeric(6,1) NOT NULL DEFAULT 0 CHECK (protein_g BETWEEN 0 AND 1000),
    created_by      bigint       REFERENCES users (id) ON DELETE SET NULL,
    created_at      timestamptz  NOT NULL DEFAULT now(),
    UNIQUE (plan_version_id, kind, on_date, feed_index, line),
    CHECK (free = (amount_g IS NULL))
);

-- +goose StatementBegin
CREATE FUNCTION plan_feed_choices_frozen() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
    st text;
BEGIN
    SELECT status INTO st FROM plan_versions
        WHERE id = CASE WHEN TG_OP = 'DELETE' THEN OLD.plan_version_id ELSE NEW.plan_version_id END;
    IF st IS DISTINCT FROM 'draft' THEN
        RAISE EXCEPTION 'plan version is %, its food choices cannot change', st;
    END IF;
    IF TG_OP = 'DELETE' THEN
        RETURN OLD;
    END IF;
    RETURN NEW;
END
$$;
-- +goose StatementEnd

-- A cascade from a deleted client, plan or draft removes the lines; the
-- trigger guards only direct writes (pg_trigger_depth() = 0), as for
-- plan_versions.
CREATE TRIGGER plan_feed_choices_frozen BEFORE INSERT OR UPDATE OR DELETE ON plan_feed_choices
    FOR EACH ROW WHEN (pg_trigger_depth() = 0) EXECUTE FUNCTION plan_feed_choices_frozen();

-- +goose Down
DROP TABLE plan_feed_choices;
DROP FUNCTION plan_feed_choices_frozen();
