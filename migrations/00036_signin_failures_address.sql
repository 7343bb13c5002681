-- Failed sign-ins are now limited per (email, address) and per address, with
-- growing waits, instead of pausing an email for everyone: a stranger's
-- wrong guesses no longer keep the real owner out from their own network.

-- +goose Up
ALTER TABLE signin_failures ADD COLUMN address text NOT NULL DEFAULT '' CHECK (length(address) <= 64);
CREATE INDEX signin_failures_address_at_idx ON signin_failures (address, at);

-- +goose Down
DROP INDEX signin_failures_address_at_idx;
ALTER TABLE signin_failures DROP COLUMN address;
