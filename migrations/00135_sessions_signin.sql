-- A session row names the staff member and the staff_sessions row it signs
-- in, copied from its data when it is saved, so that one query finds the
-- session and its user together. Rows saved before this have NULLs there
-- and are read the old way until their next save (within a minute of use).

-- +goose Up
ALTER TABLE sessions
    ADD COLUMN user_id bigint,
    ADD COLUMN staff_session_id bigint;

-- +goose Down
ALTER TABLE sessions
    DROP COLUMN staff_session_id,
    DROP COLUMN user_id;
