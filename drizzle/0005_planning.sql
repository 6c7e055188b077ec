CREATE TABLE "bays" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"name" text NOT NULL,
	"position" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "booking_feeds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"name" text NOT NULL,
	"url" text NOT NULL,
	"kind" text DEFAULT 'hire' NOT NULL,
	"default_model_id" uuid,
	"last_attempt_at" timestamp with time zone,
	"last_good_at" timestamp with time zone,
	"last_error" text,
	"event_count" integer DEFAULT 0 NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "bookings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"bike_id" uuid,
	"model_id" uuid,
	"quantity" integer DEFAULT 1 NOT NULL,
	"start_at" timestamp with time zone NOT NULL,
	"end_at" timestamp with time zone NOT NULL,
	"rrule" text,
	"title" text DEFAULT '' NOT NULL,
	"source" text DEFAULT 'manual' NOT NULL,
	"feed_id" uuid,
	"external_uid" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "bookings_bike_or_model" CHECK (("bookings"."bike_id" is null) <> ("bookings"."model_id" is null)),
	CONSTRAINT "bookings_times" CHECK ("bookings"."end_at" > "bookings"."start_at"),
	CONSTRAINT "bookings_quantity" CHECK ("bookings"."quantity" >= 1)
);
--> statement-breakpoint
CREATE TABLE "site_hours" (
	"site_id" uuid NOT NULL,
	"weekday" integer NOT NULL,
	"opens_at" text NOT NULL,
	"closes_at" text NOT NULL,
	CONSTRAINT "site_hours_site_id_weekday_pk" PRIMARY KEY("site_id","weekday")
);
--> statement-breakpoint
CREATE TABLE "time_off" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"first_day" date NOT NULL,
	"last_day" date NOT NULL,
	"reason" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "unplaced_tasks" (
	"task_id" uuid PRIMARY KEY NOT NULL,
	"bike_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"reason" text NOT NULL,
	"remedy" text NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "visit_tasks" (
	"task_id" uuid PRIMARY KEY NOT NULL,
	"visit_id" uuid NOT NULL
);
--> statement-breakpoint
CREATE TABLE "visits" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"bike_id" uuid NOT NULL,
	"bay_id" uuid NOT NULL,
	"technician_id" uuid NOT NULL,
	"start_at" timestamp with time zone NOT NULL,
	"end_at" timestamp with time zone NOT NULL,
	"latest_date" date NOT NULL,
	"status" text DEFAULT 'planned' NOT NULL,
	"sequence" integer DEFAULT 0 NOT NULL,
	"pinned" boolean DEFAULT false NOT NULL,
	"why" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "work_patterns" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"rrule" text NOT NULL,
	"starts_on" date NOT NULL,
	"ends_on" date,
	"start_time" text NOT NULL,
	"end_time" text NOT NULL,
	"label" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "bays" ADD CONSTRAINT "bays_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_feeds" ADD CONSTRAINT "booking_feeds_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_feeds" ADD CONSTRAINT "booking_feeds_default_model_id_bike_models_id_fk" FOREIGN KEY ("default_model_id") REFERENCES "public"."bike_models"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "booking_feeds" ADD CONSTRAINT "booking_feeds_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_model_id_bike_models_id_fk" FOREIGN KEY ("model_id") REFERENCES "public"."bike_models"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_feed_id_booking_feeds_id_fk" FOREIGN KEY ("feed_id") REFERENCES "public"."booking_feeds"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "bookings" ADD CONSTRAINT "bookings_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_hours" ADD CONSTRAINT "site_hours_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "time_off" ADD CONSTRAINT "time_off_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "time_off" ADD CONSTRAINT "time_off_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "unplaced_tasks" ADD CONSTRAINT "unplaced_tasks_task_id_service_tasks_id_fk" FOREIGN KEY ("task_id") REFERENCES "public"."service_tasks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "unplaced_tasks" ADD CONSTRAINT "unplaced_tasks_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "unplaced_tasks" ADD CONSTRAINT "unplaced_tasks_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_tasks" ADD CONSTRAINT "visit_tasks_task_id_service_tasks_id_fk" FOREIGN KEY ("task_id") REFERENCES "public"."service_tasks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_tasks" ADD CONSTRAINT "visit_tasks_visit_id_visits_id_fk" FOREIGN KEY ("visit_id") REFERENCES "public"."visits"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_bike_id_bikes_id_fk" FOREIGN KEY ("bike_id") REFERENCES "public"."bikes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_bay_id_bays_id_fk" FOREIGN KEY ("bay_id") REFERENCES "public"."bays"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visits" ADD CONSTRAINT "visits_technician_id_users_id_fk" FOREIGN KEY ("technician_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "work_patterns" ADD CONSTRAINT "work_patterns_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "work_patterns" ADD CONSTRAINT "work_patterns_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "bays_site_name" ON "bays" USING btree ("site_id","name");--> statement-breakpoint
CREATE INDEX "bookings_site_start" ON "bookings" USING btree ("site_id","start_at");--> statement-breakpoint
CREATE INDEX "bookings_bike" ON "bookings" USING btree ("bike_id");--> statement-breakpoint
CREATE INDEX "bookings_feed" ON "bookings" USING btree ("feed_id");--> statement-breakpoint
CREATE INDEX "time_off_user" ON "time_off" USING btree ("user_id","first_day");--> statement-breakpoint
CREATE INDEX "visit_tasks_visit" ON "visit_tasks" USING btree ("visit_id");--> statement-breakpoint
CREATE INDEX "visits_site_start" ON "visits" USING btree ("site_id","start_at");--> statement-breakpoint
CREATE INDEX "visits_bike" ON "visits" USING btree ("bike_id");--> statement-breakpoint
CREATE INDEX "visits_technician" ON "visits" USING btree ("technician_id","start_at");--> statement-breakpoint
CREATE INDEX "work_patterns_user" ON "work_patterns" USING btree ("user_id");--> statement-breakpoint
-- Every site gets the bays its count says, named "Bay 1", "Bay 2", …
INSERT INTO "bays" ("site_id", "name", "position")
SELECT s."id", 'Bay ' || n, n FROM "sites" s CROSS JOIN LATERAL generate_series(1, s."bays") AS n;
