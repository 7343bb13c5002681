-- Notes to the athlete: the dietitian's words for the whole plan and for
-- single days, shown on the athlete's phone page and the athlete's sheet.
-- They are part of a version like its figures: written while it is a draft,
-- frozen once it is published (a new version carries them over).
-- Shape: {"plan": "...", "days": {"2027-04-16": "..."}}.

-- +goose Up
ALTER TABLE plan_versions
    ADD COLUMN athlete_notes jsonb NOT NULL DEFAULT '{}'::jsonb
        CHECK (jsonb_typeof(athlete_notes) = 'object' AND length(athlete_notes::text) <= 60000);

-- +goose StatementBegin
CREATE FUNCTION plan_versions_notes_frozen() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    IF OLD.status <> 'draft' AND NEW.athlete_notes IS DISTINCT FROM OLD.athlete_notes THEN
        RAISE EXCEPTION 'plan version % is %, its notes to the athlete cannot change', OLD.id, OLD.status;
    END IF;
    RETURN NEW;
END
$$;
-- +goose StatementEnd

CREATE TRIGGER plan_versions_notes_frozen BEFORE UPDATE ON plan_versions
    FOR EACH ROW EXECUTE FUNCTION plan_versions_notes_frozen();

-- +goose Down
DROP TRIGGER plan_versions_notes_frozen ON plan_versions;
DROP FUNCTION plan_versions_notes_frozen();
ALTER TABLE plan_versions DROP COLUMN athlete_notes;
