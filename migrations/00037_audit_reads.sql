-- Reads of health data (a client's record, plan, plan sheet, export) are
-- recorded in audit_log with action 'view'; admins list them newest first,
-- for the whole practice or one client. These partial indexes keep those
-- lists quick however many reads pile up, and keep the change lists (which
-- leave reads out) as they were.

-- +goose Up
CREATE INDEX audit_log_reads_at_idx ON audit_log (at DESC, id DESC) WHERE action = 'view';
CREATE INDEX audit_log_reads_client_idx ON audit_log (((detail->>'client_id')::bigint), at DESC, id DESC) WHERE action = 'view';

-- +goose Down
DROP INDEX audit_log_reads_client_idx;
DROP INDEX audit_log_reads_at_idx;
