CREATE TYPE "public"."close_kind" AS ENUM('fog', 'air', 'strobe', 'venue', 'guests', 'maintenance');--> statement-breakpoint
CREATE TYPE "public"."wear_kind" AS ENUM('operations', 'seal_cycles', 'fog_hours');--> statement-breakpoint
ALTER TYPE "public"."check_kind" ADD VALUE 'maintenance';--> statement-breakpoint
CREATE TABLE "close_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"key" text NOT NULL,
	"kind" "close_kind" NOT NULL,
	"prop_id" uuid,
	"output_id" uuid,
	"room_id" uuid,
	"label" text NOT NULL,
	"detail" text DEFAULT '' NOT NULL,
	"required" boolean DEFAULT true NOT NULL,
	"sort_key" text NOT NULL,
	"removed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "close_results" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"close_check_id" uuid NOT NULL,
	"passed" boolean NOT NULL,
	"note" text,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "close_sign_offs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"person_id" text,
	"note" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "close_sign_offs_show_id_unique" UNIQUE("show_id")
);
--> statement-breakpoint
CREATE TABLE "guest_counts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"guests" integer NOT NULL,
	"group_size" integer,
	"groups" integer,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "maintenance_records" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"output_id" uuid NOT NULL,
	"note" text NOT NULL,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "wear_settings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"output_id" uuid NOT NULL,
	"kind" "wear_kind" NOT NULL,
	"rated_life" double precision NOT NULL,
	"interval" double precision NOT NULL,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "close_checks" ADD CONSTRAINT "close_checks_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_checks" ADD CONSTRAINT "close_checks_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_checks" ADD CONSTRAINT "close_checks_prop_id_props_id_fk" FOREIGN KEY ("prop_id") REFERENCES "public"."props"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_checks" ADD CONSTRAINT "close_checks_output_id_outputs_id_fk" FOREIGN KEY ("output_id") REFERENCES "public"."outputs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_checks" ADD CONSTRAINT "close_checks_room_id_rooms_id_fk" FOREIGN KEY ("room_id") REFERENCES "public"."rooms"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_results" ADD CONSTRAINT "close_results_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_results" ADD CONSTRAINT "close_results_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_results" ADD CONSTRAINT "close_results_close_check_id_close_checks_id_fk" FOREIGN KEY ("close_check_id") REFERENCES "public"."close_checks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_results" ADD CONSTRAINT "close_results_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_sign_offs" ADD CONSTRAINT "close_sign_offs_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_sign_offs" ADD CONSTRAINT "close_sign_offs_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "close_sign_offs" ADD CONSTRAINT "close_sign_offs_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "guest_counts" ADD CONSTRAINT "guest_counts_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "guest_counts" ADD CONSTRAINT "guest_counts_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "guest_counts" ADD CONSTRAINT "guest_counts_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "maintenance_records" ADD CONSTRAINT "maintenance_records_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "maintenance_records" ADD CONSTRAINT "maintenance_records_output_id_outputs_id_fk" FOREIGN KEY ("output_id") REFERENCES "public"."outputs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "maintenance_records" ADD CONSTRAINT "maintenance_records_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "wear_settings" ADD CONSTRAINT "wear_settings_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "wear_settings" ADD CONSTRAINT "wear_settings_output_id_outputs_id_fk" FOREIGN KEY ("output_id") REFERENCES "public"."outputs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "wear_settings" ADD CONSTRAINT "wear_settings_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "close_checks_show_key" ON "close_checks" USING btree ("show_id","key");--> statement-breakpoint
CREATE INDEX "close_results_show" ON "close_results" USING btree ("show_id","at");--> statement-breakpoint
CREATE INDEX "guest_counts_show" ON "guest_counts" USING btree ("venue_id","show_id","at");--> statement-breakpoint
CREATE INDEX "maintenance_records_output" ON "maintenance_records" USING btree ("venue_id","output_id","at");--> statement-breakpoint
CREATE INDEX "wear_settings_output" ON "wear_settings" USING btree ("venue_id","output_id","at");