-- Every API process keeps live sessions in memory for a moment (api/auth/session-cache.ts). So
-- that sign-out, a password change, a role change or a disabled or deleted account still ends or
-- changes a session at once in every process, the database announces each change to a session or
-- an account on one channel when it commits, whoever made it (the API, a script, a hand-written
-- query): `s:<session id>`, `u:<user id>`, or `*` when a table is emptied.
CREATE FUNCTION announce_session_change() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF TG_LEVEL = 'STATEMENT' THEN
    PERFORM pg_notify('descentry_session_changes', '*');
  ELSIF TG_TABLE_NAME = 'sessions' THEN
    PERFORM pg_notify('descentry_session_changes', 's:' || OLD.id::text);
  ELSE
    PERFORM pg_notify('descentry_session_changes', 'u:' || OLD.id::text);
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER sessions_announce_change
  AFTER UPDATE OR DELETE ON sessions
  FOR EACH ROW EXECUTE FUNCTION announce_session_change();
--> statement-breakpoint
CREATE TRIGGER sessions_announce_truncate
  AFTER TRUNCATE ON sessions
  FOR EACH STATEMENT EXECUTE FUNCTION announce_session_change();
--> statement-breakpoint
CREATE TRIGGER users_announce_change
  AFTER UPDATE OR DELETE ON users
  FOR EACH ROW EXECUTE FUNCTION announce_session_change();
--> statement-breakpoint
CREATE TRIGGER users_announce_truncate
  AFTER TRUNCATE ON users
  FOR EACH STATEMENT EXECUTE FUNCTION announce_session_change();
