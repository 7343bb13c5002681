-- +goose Up
-- A multi-sport event's legs and a stage race's stages, as the engine's
-- JSON (fuel.Segment / fuel.Stage); an event has one or the other or neither.
ALTER TABLE events
    ADD COLUMN segments jsonb NOT NULL DEFAULT '[]'
        CHECK (jsonb_typeof(segments) = 'array' AND jsonb_array_length(segments) <= 12),
    ADD COLUMN stages jsonb NOT NULL DEFAULT '[]'
        CHECK (jsonb_typeof(stages) = 'array' AND jsonb_array_length(stages) <= 21),
    ADD CONSTRAINT events_segments_or_stages
        CHECK (jsonb_array_length(segments) = 0 OR jsonb_array_length(stages) = 0);

-- Events over a day (24–48 h ultras) are raced as one event.
ALTER TABLE events DROP CONSTRAINT events_expected_duration_min_check,
    ADD CONSTRAINT events_expected_duration_min_check CHECK (expected_duration_min > 0 AND expected_duration_min <= 2880);

-- +goose Down
ALTER TABLE events DROP CONSTRAINT events_expected_duration_min_check,
    ADD CONSTRAINT events_expected_duration_min_check CHECK (expected_duration_min > 0 AND expected_duration_min <= 1440);
ALTER TABLE events DROP CONSTRAINT events_segments_or_stages, DROP COLUMN stages, DROP COLUMN segments;
