CREATE TABLE "data_versions" (
	"scope" text PRIMARY KEY NOT NULL,
	"n" bigint DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE INDEX "odometer_readings_bike_resets" ON "odometer_readings" USING btree ("bike_id","odometer_km") WHERE "odometer_readings"."reset";
--> statement-breakpoint
INSERT INTO "data_versions" ("scope", "n") VALUES ('fleet', 1), ('people', 1), ('valves', 1);
--> statement-breakpoint
CREATE FUNCTION "lashline_data_changed"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  -- Moves the named data versions on in the writing transaction; cached reads compare against them.
  UPDATE "data_versions" SET "n" = "n" + 1 WHERE "scope" = ANY (TG_ARGV);
  RETURN NULL;
END
$$;
--> statement-breakpoint
CREATE TRIGGER "attachments_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "attachments" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "bike_models_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "bike_models" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'valves');
--> statement-breakpoint
CREATE TRIGGER "bikes_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "bikes" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "bikes_added_or_removed" AFTER INSERT OR DELETE OR TRUNCATE ON "bikes" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('valves');
--> statement-breakpoint
-- Valve trends read a bike's number, model, site, in-service odometer and whether it is retired; a
-- bike grounded or back in service (as check-ins and scans do) leaves them as they were.
CREATE TRIGGER "bikes_valve_facts_changed" AFTER UPDATE ON "bikes" FOR EACH ROW
  WHEN (OLD."fleet_number" IS DISTINCT FROM NEW."fleet_number" OR OLD."model_id" IS DISTINCT FROM NEW."model_id"
     OR OLD."site_id" IS DISTINCT FROM NEW."site_id" OR OLD."in_service_date" IS DISTINCT FROM NEW."in_service_date"
     OR OLD."in_service_odometer" IS DISTINCT FROM NEW."in_service_odometer" OR OLD."odometer_unit" IS DISTINCT FROM NEW."odometer_unit"
     OR ((OLD."status" = 'retired') IS DISTINCT FROM (NEW."status" = 'retired')))
  EXECUTE FUNCTION "lashline_data_changed"('valves');
--> statement-breakpoint
CREATE TRIGGER "defects_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "defects" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "due_states_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "due_states" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "odometer_readings_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "odometer_readings" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "reading_templates_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "reading_templates" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "service_items_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "service_items" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'valves');
--> statement-breakpoint
CREATE TRIGGER "service_readings_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "service_readings" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "service_records_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "service_records" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'valves');
--> statement-breakpoint
CREATE TRIGGER "service_tasks_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "service_tasks" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "settings_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "settings" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "shim_stock_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "shim_stock" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "sites_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "sites" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'people');
--> statement-breakpoint
CREATE TRIGGER "stock_movements_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "stock_movements" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet');
--> statement-breakpoint
CREATE TRIGGER "user_sites_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "user_sites" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'people');
--> statement-breakpoint
CREATE TRIGGER "users_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "users" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'people');
--> statement-breakpoint
CREATE TRIGGER "valve_checks_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "valve_checks" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'valves');
--> statement-breakpoint
CREATE TRIGGER "valve_readings_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "valve_readings" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('fleet', 'valves');
