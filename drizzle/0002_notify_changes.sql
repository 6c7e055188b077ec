-- A server on embedded PGlite keeps the data versions and the sessions it has read in memory and
-- listens for these notifications to drop them. NOTIFY is delivered when the writing transaction
-- commits, and identical notifications of one transaction arrive once.
CREATE OR REPLACE FUNCTION "lashline_data_changed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  -- Moves the named data versions on in the writing transaction; cached reads compare against them.
  UPDATE "data_versions" SET "n" = "n" + 1 WHERE "scope" = ANY (TG_ARGV);
  PERFORM pg_notify('lashline_data', array_to_string(TG_ARGV, ','));
  RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE FUNCTION "lashline_session_changed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  -- The session id that changed or went; '*' when the whole table was emptied.
  IF TG_LEVEL = 'STATEMENT' THEN
    PERFORM pg_notify('lashline_session', '*');
  ELSE
    PERFORM pg_notify('lashline_session', OLD."sid");
  END IF;
  RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE TRIGGER "sessions_changed" AFTER UPDATE OR DELETE ON "sessions" FOR EACH ROW EXECUTE FUNCTION "lashline_session_changed"();
--> statement-breakpoint
CREATE TRIGGER "sessions_emptied" AFTER TRUNCATE ON "sessions" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_session_changed"();
