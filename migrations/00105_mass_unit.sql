-- The unit body masses are typed and shown in: a practice default (the
-- settings row mass_unit, kg when absent) and a client's own choice (NULL:
-- the practice default). Masses stay stored in kg; only what people type and
-- read changes.

-- +goose Up
ALTER TABLE clients
    ADD COLUMN mass_unit text CHECK (mass_unit IN ('kg', 'lb'));
ALTER TABLE settings
    ADD CONSTRAINT settings_mass_unit_check CHECK (key <> 'mass_unit' OR value IN ('kg', 'lb'));

-- +goose Down
ALTER TABLE settings DROP CONSTRAINT settings_mass_unit_check;
ALTER TABLE clients DROP COLUMN mass_unit;
