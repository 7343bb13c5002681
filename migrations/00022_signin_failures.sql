-- Failed sign-ins, counted per email over a short window, so a password
-- cannot be guessed at speed. Kept in PostgreSQL (not in memory) so every
-- app server behind a load balancer sees the same count.

-- +goose Up
CREATE TABLE signin_failures (
    id    bigserial PRIMARY KEY,
    email text NOT NULL,
    at    timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX signin_failures_email_at_idx ON signin_failures (lower(email), at);

-- +goose Down
DROP TABLE signin_failures;
