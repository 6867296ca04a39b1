-- The audit log is append-only: rows of "AuditEvent" can be inserted, never changed or removed,
-- whoever holds a connection (the app, the admin CLI, a stray script). Removing an audit row
-- needs a deliberate DROP TRIGGER first (tests/app/api-client.ts clearDatabase does that between
-- test files).
CREATE TRIGGER "AuditEvent_no_update" BEFORE UPDATE ON "AuditEvent"
BEGIN
    SELECT RAISE(ABORT, 'AuditEvent is append-only: audit events cannot be changed');
END;

CREATE TRIGGER "AuditEvent_no_delete" BEFORE DELETE ON "AuditEvent"
BEGIN
    SELECT RAISE(ABORT, 'AuditEvent is append-only: audit events cannot be deleted');
END;
