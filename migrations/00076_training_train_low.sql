-- +goose Up
-- A session the dietitian keeps deliberately unfuelled ("train low").
ALTER TABLE training_sessions ADD COLUMN train_low boolean NOT NULL DEFAULT false;

-- +goose Down
ALTER TABLE training_sessions DROP COLUMN train_low;
