CREATE TABLE "part_stock" (
	"site_id" uuid NOT NULL,
	"part_id" uuid NOT NULL,
	"on_hand" double precision DEFAULT 0 NOT NULL,
	"minimum" double precision DEFAULT 0 NOT NULL,
	CONSTRAINT "part_stock_site_id_part_id_pk" PRIMARY KEY("site_id","part_id"),
	CONSTRAINT "part_stock_not_negative" CHECK ("part_stock"."on_hand" >= 0)
);
--> statement-breakpoint
CREATE TABLE "parts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"part_number" text NOT NULL,
	"name" text NOT NULL,
	"family" text NOT NULL,
	"unit" text NOT NULL,
	"pack_size" double precision DEFAULT 1 NOT NULL,
	"supplier_id" uuid,
	"lead_time_days" integer DEFAULT 7 NOT NULL,
	"unit_cost_pence" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "parts_part_number_unique" UNIQUE("part_number")
);
--> statement-breakpoint
CREATE TABLE "purchase_order_lines" (
	"order_id" uuid NOT NULL,
	"part_id" uuid NOT NULL,
	"quantity" double precision NOT NULL,
	"received" double precision DEFAULT 0 NOT NULL,
	CONSTRAINT "purchase_order_lines_order_id_part_id_pk" PRIMARY KEY("order_id","part_id")
);
--> statement-breakpoint
CREATE TABLE "purchase_orders" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"number" integer NOT NULL,
	"site_id" uuid NOT NULL,
	"supplier_id" uuid NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"note" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	"received_at" timestamp with time zone,
	CONSTRAINT "purchase_orders_number_unique" UNIQUE("number")
);
--> statement-breakpoint
CREATE TABLE "service_item_parts" (
	"service_item_id" uuid NOT NULL,
	"part_id" uuid NOT NULL,
	"quantity" double precision NOT NULL,
	"share" double precision DEFAULT 1 NOT NULL,
	CONSTRAINT "service_item_parts_service_item_id_part_id_pk" PRIMARY KEY("service_item_id","part_id")
);
--> statement-breakpoint
CREATE TABLE "suppliers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"email" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "suppliers_name_unique" UNIQUE("name")
);
--> statement-breakpoint
ALTER TABLE "stock_movements" ALTER COLUMN "size_um" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "stock_movements" ALTER COLUMN "condition" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "stock_movements" ALTER COLUMN "delta" SET DATA TYPE double precision;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD COLUMN "part_id" uuid;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD COLUMN "kind" text;--> statement-breakpoint
ALTER TABLE "stock_movements" ADD COLUMN "purchase_order_id" uuid;--> statement-breakpoint
ALTER TABLE "part_stock" ADD CONSTRAINT "part_stock_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "part_stock" ADD CONSTRAINT "part_stock_part_id_parts_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."parts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "parts" ADD CONSTRAINT "parts_supplier_id_suppliers_id_fk" FOREIGN KEY ("supplier_id") REFERENCES "public"."suppliers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchase_order_lines" ADD CONSTRAINT "purchase_order_lines_order_id_purchase_orders_id_fk" FOREIGN KEY ("order_id") REFERENCES "public"."purchase_orders"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchase_order_lines" ADD CONSTRAINT "purchase_order_lines_part_id_parts_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."parts"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchase_orders" ADD CONSTRAINT "purchase_orders_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchase_orders" ADD CONSTRAINT "purchase_orders_supplier_id_suppliers_id_fk" FOREIGN KEY ("supplier_id") REFERENCES "public"."suppliers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "purchase_orders" ADD CONSTRAINT "purchase_orders_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_item_parts" ADD CONSTRAINT "service_item_parts_service_item_id_service_items_id_fk" FOREIGN KEY ("service_item_id") REFERENCES "public"."service_items"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "service_item_parts" ADD CONSTRAINT "service_item_parts_part_id_parts_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."parts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "purchase_orders_site" ON "purchase_orders" USING btree ("site_id","status");--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_part_id_parts_id_fk" FOREIGN KEY ("part_id") REFERENCES "public"."parts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "stock_movements_part" ON "stock_movements" USING btree ("site_id","part_id","at");--> statement-breakpoint
ALTER TABLE "stock_movements" ADD CONSTRAINT "stock_movements_shim_or_part" CHECK (("stock_movements"."part_id" is null) = ("stock_movements"."size_um" is not null));