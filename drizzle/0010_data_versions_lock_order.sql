-- Every writer takes the data-version row locks in one order, 'fleet' first, then the others by
-- name: a transaction that holds any of them holds 'fleet', so two writers moving different scopes
-- in different orders (a re-plan: visits, then tasks; deleting a service item: items, then the
-- parts it uses) wait for each other in turn instead of deadlocking.
CREATE OR REPLACE FUNCTION "lashline_data_changed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM 1 FROM "data_versions" WHERE "scope" = 'fleet' OR "scope" = ANY (TG_ARGV) ORDER BY "scope" <> 'fleet', "scope" FOR UPDATE;
  UPDATE "data_versions" SET "n" = "n" + 1 WHERE "scope" = ANY (TG_ARGV);
  PERFORM pg_notify('lashline_data', array_to_string(TG_ARGV, ','));
  RETURN NULL;
END
$$;
