ALTER TABLE "due_states" DROP CONSTRAINT "due_states_bike_id_bikes_id_fk";
--> statement-breakpoint
ALTER TABLE "due_states" DROP CONSTRAINT "due_states_service_item_id_service_items_id_fk";

--> statement-breakpoint
CREATE FUNCTION "lashline_due_states_cascade"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  -- What ON DELETE CASCADE did: a bike or service item gone takes its due states with it.
  IF TG_OP = 'TRUNCATE' THEN
    DELETE FROM "due_states";
  ELSIF TG_TABLE_NAME = 'bikes' THEN
    DELETE FROM "due_states" WHERE "bike_id" = OLD."id";
  ELSE
    DELETE FROM "due_states" WHERE "service_item_id" = OLD."id";
  END IF;
  RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE TRIGGER "bikes_due_states_cascade" AFTER DELETE ON "bikes" FOR EACH ROW EXECUTE FUNCTION "lashline_due_states_cascade"();
--> statement-breakpoint
CREATE TRIGGER "bikes_due_states_emptied" AFTER TRUNCATE ON "bikes" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_due_states_cascade"();
--> statement-breakpoint
CREATE TRIGGER "service_items_due_states_cascade" AFTER DELETE ON "service_items" FOR EACH ROW EXECUTE FUNCTION "lashline_due_states_cascade"();
--> statement-breakpoint
CREATE TRIGGER "service_items_due_states_emptied" AFTER TRUNCATE ON "service_items" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_due_states_cascade"();
