-- Client links: a personal address that lets one client open their own
-- current plan (phone page and calendar feed) without a staff account. Only
-- the SHA-256 of the link's 256-bit random token is kept; the token itself
-- is shown once to the dietitian who made it and never stored. A link stops
-- working when it expires or is revoked; rows are kept for the audit trail.

-- +goose Up
CREATE TABLE client_links (
    id           bigint GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
    client_id    bigint      NOT NULL REFERENCES clients (id) ON DELETE CASCADE,
    token_hash   bytea       NOT NULL UNIQUE CHECK (length(token_hash) = 32),
    label        text        NOT NULL DEFAULT '' CHECK (length(label) <= 100),
    created_by   bigint      REFERENCES users (id) ON DELETE SET NULL,
    created_at   timestamptz NOT NULL DEFAULT now(),
    expires_at   timestamptz NOT NULL,
    revoked_at   timestamptz,
    last_used_at timestamptz,
    CHECK (expires_at > created_at)
);
CREATE INDEX client_links_client_idx ON client_links (client_id, created_at DESC);

-- +goose Down
DROP TABLE client_links;
