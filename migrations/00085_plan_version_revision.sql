-- A draft's revision moves whenever its content does. Every save in the
-- store already counts it up; this makes it hold for any writer, so that
-- (version id, revision) names one content for good and a decoded draft
-- can be kept in memory under that key (and a stale form is still refused
-- after a change made by hand).

-- +goose Up
-- +goose StatementBegin
CREATE FUNCTION plan_versions_revision_moves() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    IF OLD.status = 'draft' AND NEW.revision = OLD.revision
        AND (NEW.request IS DISTINCT FROM OLD.request OR NEW.result IS DISTINCT FROM OLD.result
            OR NEW.body_mass_kg IS DISTINCT FROM OLD.body_mass_kg OR NEW.body_mass_on IS DISTINCT FROM OLD.body_mass_on) THEN
        NEW.revision := OLD.revision + 1;
    END IF;
    RETURN NEW;
END
$$;
-- +goose StatementEnd

CREATE TRIGGER plan_versions_revision_moves BEFORE UPDATE ON plan_versions
    FOR EACH ROW EXECUTE FUNCTION plan_versions_revision_moves();

-- +goose Down
DROP TRIGGER plan_versions_revision_moves ON plan_versions;
DROP FUNCTION plan_versions_revision_moves();
