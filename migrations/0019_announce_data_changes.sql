-- Every API process keeps the answers of its busiest reads (the lists) in memory until the data
-- changes (api/http/answer-cache.ts). So that a change made anywhere (another API process, a
-- background job, a script, a hand-written query) empties those caches, every statement that
-- changes one of the application's tables announces the table's name on one channel when its
-- transaction commits (PostgreSQL sends one notification per distinct name and transaction).
-- Left out: tables no cached answer reads and that change on nearly every request (sign-in
-- bookkeeping, the audit trail, the mail queue), and PostGIS's own spatial_ref_sys. A table added
-- later needs the same trigger in its own migration (spec/api/http/answer-cache.spec.ts checks).
CREATE OR REPLACE FUNCTION announce_data_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('descentry_data_changes', TG_TABLE_NAME);
  RETURN NULL;
END;
$$;
--> statement-breakpoint
DO $$
DECLARE
  name text;
BEGIN
  FOR name IN
    SELECT tablename FROM pg_tables
    WHERE schemaname = 'public'
      AND tablename NOT IN ('sessions', 'attempt_throttles', 'audit_log', 'mail_outbox', 'captured_mail', 'spatial_ref_sys')
  LOOP
    EXECUTE format('DROP TRIGGER IF EXISTS %I ON %I', name || '_announce_data_change', name);
    EXECUTE format(
      'CREATE TRIGGER %I AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON %I FOR EACH STATEMENT EXECUTE FUNCTION announce_data_change()',
      name || '_announce_data_change', name);
  END LOOP;
END;
$$;
