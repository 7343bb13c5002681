-- A row per signed-in staff session. The cookie's session (table sessions,
-- kept by the session library as an opaque blob) names one of these rows; a
-- session whose row is gone no longer signs anyone in. So a password change
-- or reset can end every other session of the user with one DELETE, and a
-- staff member can list and end their own sessions, without reading the
-- library's blobs. Existing sign-ins end with this migration (they have no
-- row): everyone signs in once more.

-- +goose Up
CREATE TABLE staff_sessions (
    id         bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    user_id    bigint      NOT NULL REFERENCES users (id) ON DELETE CASCADE,
    started_at timestamptz NOT NULL DEFAULT now(),
    expires_at timestamptz NOT NULL,
    -- where the sign-in came from, so a person can tell their devices apart
    address    text        NOT NULL DEFAULT '' CHECK (length(address) <= 64),
    agent      text        NOT NULL DEFAULT '' CHECK (length(agent) <= 300)
);
CREATE INDEX staff_sessions_user_idx ON staff_sessions (user_id, started_at DESC);

-- +goose Down
DROP TABLE staff_sessions;
