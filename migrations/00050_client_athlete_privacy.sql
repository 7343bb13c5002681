-- What of a client's record reaches the athlete's own surfaces (phone page,
-- calendar feed, athlete's sheet). Recorded cautions never do; the
-- dietitian writes, in plain words, the health note the athlete may see.
-- Energy and body-mass figures stay off those surfaces unless the dietitian
-- chooses to show them (practice with athletes with a history of
-- disordered eating).

-- +goose Up
ALTER TABLE clients
    ADD COLUMN shared_note text NOT NULL DEFAULT '' CHECK (length(shared_note) <= 2000),
    ADD COLUMN athlete_sees_energy_mass boolean NOT NULL DEFAULT false;

-- +goose Down
ALTER TABLE clients DROP COLUMN athlete_sees_energy_mass, DROP COLUMN shared_note;
