-- 'plan' moves on with what the parts forecast reads beyond the fleet: the workshop's planned
-- visits, the tasks placed on them, and the parts each service uses.
INSERT INTO "data_versions" ("scope", "n") VALUES ('plan', 1) ON CONFLICT ("scope") DO NOTHING;
--> statement-breakpoint
CREATE TRIGGER "visits_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "visits" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('plan');
--> statement-breakpoint
CREATE TRIGGER "visit_tasks_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "visit_tasks" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('plan');
--> statement-breakpoint
CREATE TRIGGER "service_item_parts_data_changed" AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON "service_item_parts" FOR EACH STATEMENT EXECUTE FUNCTION "lashline_data_changed"('plan');
