CREATE TABLE "attachments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"bike_id" uuid NOT NULL,
	"defect_id" uuid,
	"task_id" uuid,
	"storage_key" text NOT NULL,
	"thumb_key" text,
	"mime" text NOT NULL,
	"bytes" integer NOT NULL,
	"width" integer,
	"height" integer,
	"original_name" text,
	"uploaded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "attachments_storage_key_unique" UNIQUE("storage_key")
);
--> statement-breakpoint
CREATE TABLE "audit_log" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"user_id" uuid,
	"action" text NOT NULL,
	"entity" text NOT NULL,
	"entity_id" text,
	"changes" jsonb
);
--> statement-breakpoint
CREATE TABLE "bike_models" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"cylinders" integer NOT NULL,
	"intake_valves_per_cylinder" integer NOT NULL,
	"exhaust_valves_per_cylinder" integer NOT NULL,
	"adjuster" text NOT NULL,
	"intake_min_um" integer NOT NULL,
	"intake_max_um" integer NOT NULL,
	"exhaust_min_um" integer NOT NULL,
	"exhaust_max_um" integer NOT NULL,
	"shim_min_um" integer,
	"shim_max_um" integer,
	"shim_step_um" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bike_models_name_unique" UNIQUE("name")
);
--> statement-breakpoint
CREATE TABLE "bikes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"fleet_number" text NOT NULL,
	"vin" text,
	"registration" text,
	"model_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"odometer_unit" text DEFAULT 'km' NOT NULL,
	"in_service_date" date NOT NULL,
	"in_service_odometer" double precision DEFAULT 0 NOT NULL,
	"status" text DEFAULT 'in_service' NOT NULL,
	"status_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bikes_fleet_number_unique" UNIQUE("fleet_number")
);
--> statement-breakpoint
CREATE TABLE "caught_mail" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"to" text NOT NULL,
	"from" text NOT NULL,
	"subject" text NOT NULL,
	"raw" text NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "defects" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"bike_id" uuid NOT NULL,
	"category" text NOT NULL,
	"text" text NOT NULL,
	"safety_critical" boolean DEFAULT false NOT NULL,
	"reported_by" uuid,
	"reported_at" timestamp with time zone DEFAULT now() NOT NULL,
	"resolved_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "due_states" (
	"bike_id" uuid NOT NULL,
	"service_item_id" uuid NOT NULL,
	"status" text NOT NULL,
	"due_at_km" double precision,
	"due_by_date" date,
	"projected_date_for_km" date,
	"due_date" date,
	"trigger" text,
	"current_km" double precision NOT NULL,
	"remaining_km" double precision,
	"remaining_days" integer,
	"usage_km_per_day" double precision,
	"baseline_date" date NOT NULL,
	"baseline_km" double precision NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "due_states_bike_id_service_item_id_pk" PRIMARY KEY("bike_id","service_item_id")
);
--> statement-breakpoint
CREATE TABLE "job_runs" (
	"job" text NOT NULL,
	"slot" text NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	"result" jsonb,
	CONSTRAINT "job_runs_job_slot_pk" PRIMARY KEY("job","slot")
);
--> statement-breakpoint
CREATE TABLE "odometer_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"bike_id" uuid NOT NULL,
	"date" date NOT NULL,
	"value" double precision NOT NULL,
	"unit" text NOT NULL,
	"odometer_km" double precision NOT NULL,
	"reset" boolean DEFAULT false NOT NULL,
	"source" text DEFAULT 'check-in' NOT NULL,
	"recorded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "outbox" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"dedupe_key" text NOT NULL,
	"to" text NOT NULL,
	"subject" text NOT NULL,
	"text" text NOT NULL,
	"html" text NOT NULL,
	"status" text DEFAULT 'pending' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	CONSTRAINT "outbox_dedupe_key_unique" UNIQUE("dedupe_key")
);
--> statement-breakpoint
CREATE TABLE "reading_templates" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"service_item_id" uuid NOT NULL,
	"label" text NOT NULL,
	"kind" text NOT NULL,
	"unit" text,
	"min" double precision,
	"max" double precision,
	"safety_critical" boolean DEFAULT false NOT NULL,
	"position" integer DEFAULT 0 NOT NULL
);
--> statement-breakpoint
CREATE TABLE "service_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"model_id" uuid NOT NULL,
	"name" text NOT NULL,
	"category" text NOT NULL,
	"every_km" integer,
	"every_months" integer,
	"first_at_km" integer,
	"rrule" text,
	"safety_critical" boolean DEFAULT false NOT NULL,
	"estimated_minutes" integer DEFAULT 30 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "service_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"service_record_id" uuid NOT NULL,
	"template_id" uuid,
	"label" text NOT NULL,
	"kind" text NOT NULL,
	"unit" text,
	"value" double precision,
	"done" boolean,
	"date_value" date,
	"min" double precision,
	"max" double precision,
	"out_of_limits" boolean DEFAULT false NOT NULL,
	"safety_critical" boolean DEFAULT false NOT NULL
);
--> statement-breakpoint
CREATE TABLE "service_records" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"bike_id" uuid NOT NULL,
	"service_item_id" uuid NOT NULL,
	"date" date NOT NULL,
	"odometer_km" double precision NOT NULL,
	"task_id" uuid,
	"done_by" uuid,
	"notes" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "service_tasks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"bike_id" uuid NOT NULL,
	"service_item_id" uuid NOT NULL,
	"cycle_key" text NOT NULL,
	"status" text DEFAULT 'open' NOT NULL,
	"origin" text DEFAULT 'due-scan' NOT NULL,
	"assignee_id" uuid,
	"due_date" date,
	"estimated_minutes" integer DEFAULT 30 NOT NULL,
	"note" text,
	"draft" jsonb,
	"version" integer DEFAULT 1 NOT NULL,
	"raised_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"closed_at" timestamp with time zone,
	"closed_by" uuid
);
--> statement-breakpoint
CREATE TABLE "sessions" (
	"sid" text PRIMARY KEY NOT NULL,
	"sess" jsonb NOT NULL,
	"user_id" uuid,
	"expire" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "settings" (
	"key" text PRIMARY KEY NOT NULL,
	"value" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "shim_stock" (
	"site_id" uuid NOT NULL,
	"size_um" integer NOT NULL,
	"condition" text NOT NULL,
	"count" integer DEFAULT 0 NOT NULL,
	"min_count" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "shim_stock_site_id_size_um_condition_pk" PRIMARY KEY("site_id","size_um","condition")
);
--> statement-breakpoint
CREATE TABLE "sites" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"time_zone" text DEFAULT 'Europe/London' NOT NULL,
	"bays" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sites_name_unique" UNIQUE("name")
);
--> statement-breakpoint
CREATE TABLE "stock_movements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"size_um" integer NOT NULL,
	"condition" text NOT NULL,
	"delta" integer NOT NULL,
	"reason" text NOT NULL,
	"task_id" uuid,
	"by" uuid,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "user_sites" (
	"user_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	CONSTRAINT "user_sites_user_id_site_id_pk" PRIMARY KEY("user_id","site_id")
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"role" text NOT NULL,
	"password_hash" text,
	"disabled" boolean DEFAULT false NOT NULL,
	"calendar_feed_version" integer DEFAULT 1 NOT NULL,
	"invite_token_hash" text,
	"invite_expires_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "users_email_unique" UNIQUE("email")
);
--> statement-breakpoint
CREATE TABLE "valve_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"bike_id" uuid NOT NULL,
	"task_id" uuid,
	"date" date NOT NULL,
	"odometer_km" double precision NOT NULL,
	"checked_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "valve_readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"check_id" uuid NOT NULL,
	"cylinder" integer NOT NULL,
	"side" text NOT NULL,
	"position" integer NOT NULL,
	"as_found_um" integer NOT NULL,
	"as_left_um" integer,
	"shim_before_um" integer,
	"shim_after_um" integer,
	"method" text DEFAULT 'feeler' NOT NULL
);
--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_defect_id_defects_id_fk" FOREIGN KEY ("defect_id") REFERENCES "public"."defects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_task_id_service_tasks_id_fk" FOREIGN KEY ("task_id") REFERENCES "public"."service_tasks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_log" ADD CONSTRAINT "audit_log_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bikes" ADD CONSTRAINT "bikes_model_id_bike_models_id_fk" FOREIGN KEY ("model_id") REFERENCES "public"."bike_models"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bikes" ADD CONSTRAINT "bikes_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "defects" ADD CONSTRAINT "defects_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "defects" ADD CONSTRAINT "defects_reported_by_users_id_fk" FOREIGN KEY ("reported_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "due_states" ADD CONSTRAINT "due_states_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "due_states" ADD CONSTRAINT "due_states_service_item_id_service_items_id_fk" FOREIGN KEY ("service_item_id") REFERENCES "public"."service_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "odometer_readings" ADD CONSTRAINT "odometer_readings_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "odometer_readings" ADD CONSTRAINT "odometer_readings_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_templates" ADD CONSTRAINT "reading_templates_service_item_id_service_items_id_fk" FOREIGN KEY ("service_item_id") REFERENCES "public"."service_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_items" ADD CONSTRAINT "service_items_model_id_bike_models_id_fk" FOREIGN KEY ("model_id") REFERENCES "public"."bike_models"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_readings" ADD CONSTRAINT "service_readings_service_record_id_service_records_id_fk" FOREIGN KEY ("service_record_id") REFERENCES "public"."service_records"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_readings" ADD CONSTRAINT "service_readings_template_id_reading_templates_id_fk" FOREIGN KEY ("template_id") REFERENCES "public"."reading_templates"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_records" ADD CONSTRAINT "service_records_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_records" ADD CONSTRAINT "service_records_service_item_id_service_items_id_fk" FOREIGN KEY ("service_item_id") REFERENCES "public"."service_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_records" ADD CONSTRAINT "service_records_done_by_users_id_fk" FOREIGN KEY ("done_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_tasks" ADD CONSTRAINT "service_tasks_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_tasks" ADD CONSTRAINT "service_tasks_service_item_id_service_items_id_fk" FOREIGN KEY ("service_item_id") REFERENCES "public"."service_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_tasks" ADD CONSTRAINT "service_tasks_assignee_id_users_id_fk" FOREIGN KEY ("assignee_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_tasks" ADD CONSTRAINT "service_tasks_closed_by_users_id_fk" FOREIGN KEY ("closed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shim_stock" ADD CONSTRAINT "shim_stock_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_by_users_id_fk" FOREIGN KEY ("by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "user_sites" ADD CONSTRAINT "user_sites_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "user_sites" ADD CONSTRAINT "user_sites_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "valve_checks" ADD CONSTRAINT "valve_checks_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "valve_checks" ADD CONSTRAINT "valve_checks_task_id_service_tasks_id_fk" FOREIGN KEY ("task_id") REFERENCES "public"."service_tasks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "valve_checks" ADD CONSTRAINT "valve_checks_checked_by_users_id_fk" FOREIGN KEY ("checked_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "valve_readings" ADD CONSTRAINT "valve_readings_check_id_valve_checks_id_fk" FOREIGN KEY ("check_id") REFERENCES "public"."valve_checks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "attachments_bike" ON "attachments" USING btree ("bike_id");--> statement-breakpoint
CREATE INDEX "audit_log_entity" ON "audit_log" USING btree ("entity","entity_id");--> statement-breakpoint
CREATE INDEX "bikes_site" ON "bikes" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "bikes_model" ON "bikes" USING btree ("model_id");--> statement-breakpoint
CREATE INDEX "defects_bike" ON "defects" USING btree ("bike_id");--> statement-breakpoint
CREATE INDEX "due_states_due_date" ON "due_states" USING btree ("due_date");--> statement-breakpoint
CREATE INDEX "odometer_readings_bike_date" ON "odometer_readings" USING btree ("bike_id","date","odometer_km");--> statement-breakpoint
CREATE INDEX "odometer_readings_bike_km" ON "odometer_readings" USING btree ("bike_id","odometer_km");--> statement-breakpoint
CREATE INDEX "outbox_pending" ON "outbox" USING btree ("status","next_attempt_at");--> statement-breakpoint
CREATE INDEX "reading_templates_item" ON "reading_templates" USING btree ("service_item_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "service_items_model_name" ON "service_items" USING btree ("model_id","name");--> statement-breakpoint
CREATE INDEX "service_readings_record" ON "service_readings" USING btree ("service_record_id");--> statement-breakpoint
CREATE INDEX "service_records_bike_item" ON "service_records" USING btree ("bike_id","service_item_id","date");--> statement-breakpoint
CREATE UNIQUE INDEX "service_tasks_cycle" ON "service_tasks" USING btree ("bike_id","service_item_id","cycle_key");--> statement-breakpoint
CREATE INDEX "service_tasks_assignee" ON "service_tasks" USING btree ("assignee_id","status");--> statement-breakpoint
CREATE INDEX "sessions_expire" ON "sessions" USING btree ("expire");--> statement-breakpoint
CREATE INDEX "sessions_user" ON "sessions" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "valve_checks_bike" ON "valve_checks" USING btree ("bike_id","odometer_km");--> statement-breakpoint
CREATE UNIQUE INDEX "valve_readings_valve" ON "valve_readings" USING btree ("check_id","cylinder","side","position");