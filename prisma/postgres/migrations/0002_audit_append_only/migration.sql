-- The audit log is append-only: rows of "AuditEvent" can be inserted, never changed or removed,
-- whoever holds a connection (the app, the admin CLI, a stray script). The PostgreSQL twin of
-- prisma/migrations/0002_audit_append_only, with the same messages; TRUNCATE is refused as well.
-- Removing audit rows needs a deliberate `ALTER TABLE "AuditEvent" DISABLE TRIGGER USER` first
-- (tests/app/db-access.ts clearDatabase does that between test files).
CREATE FUNCTION "AuditEvent_append_only"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
    IF TG_OP = 'UPDATE' THEN
        RAISE EXCEPTION 'AuditEvent is append-only: audit events cannot be changed';
    END IF;
    RAISE EXCEPTION 'AuditEvent is append-only: audit events cannot be deleted';
END;
$$;

CREATE TRIGGER "AuditEvent_no_update" BEFORE UPDATE ON "AuditEvent"
    FOR EACH ROW EXECUTE FUNCTION "AuditEvent_append_only"();

CREATE TRIGGER "AuditEvent_no_delete" BEFORE DELETE ON "AuditEvent"
    FOR EACH ROW EXECUTE FUNCTION "AuditEvent_append_only"();

CREATE TRIGGER "AuditEvent_no_truncate" BEFORE TRUNCATE ON "AuditEvent"
    FOR EACH STATEMENT EXECUTE FUNCTION "AuditEvent_append_only"();
