CREATE TYPE "public"."output_kind" AS ENUM('led_string', 'relay');--> statement-breakpoint
CREATE TYPE "public"."prop_file_kind" AS ENUM('photo', 'wiring');--> statement-breakpoint
CREATE TYPE "public"."prop_status" AS ENUM('design', 'bench', 'installed', 'show_ready', 'stood_down', 'retired');--> statement-breakpoint
CREATE TYPE "public"."relay_kind" AS ENUM('pneumatic', 'solenoid', 'fog', 'audio', 'strobe');--> statement-breakpoint
CREATE TYPE "public"."safe_state" AS ENUM('full', 'off', 'de_energised');--> statement-breakpoint
CREATE TYPE "public"."sensor_kind" AS ENUM('capacitive', 'motion', 'break_beam', 'ranging', 'pressure_mat', 'button');--> statement-breakpoint
CREATE TABLE "captures" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"sensor_id" uuid NOT NULL,
	"object_key" text NOT NULL,
	"filename" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"rows" integer NOT NULL,
	"idle_rows" integer NOT NULL,
	"present_rows" integer NOT NULL,
	"summary" jsonb NOT NULL,
	"uploaded_by" text,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "controllers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"name" text NOT NULL,
	"supply_v" double precision NOT NULL,
	"clock_hz" double precision NOT NULL,
	"timer_bits" integer NOT NULL,
	"pwm_bits" integer NOT NULL,
	"prescaler" integer DEFAULT 1 NOT NULL,
	"reference_v" double precision NOT NULL,
	"pin_limit_ma" double precision NOT NULL,
	"supply_rating_a" double precision NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "outputs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"prop_id" uuid NOT NULL,
	"kind" "output_kind" NOT NULL,
	"relay_kind" "relay_kind",
	"name" text NOT NULL,
	"settings" jsonb NOT NULL,
	"safe_state" "safe_state" NOT NULL,
	"curve" jsonb,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "prop_files" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"prop_id" uuid NOT NULL,
	"kind" "prop_file_kind" NOT NULL,
	"object_key" text NOT NULL,
	"filename" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by" text,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "props" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"name" text NOT NULL,
	"room_id" uuid,
	"controller_id" uuid,
	"status" "prop_status" DEFAULT 'design' NOT NULL,
	"notes" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sensors" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"prop_id" uuid NOT NULL,
	"kind" "sensor_kind" NOT NULL,
	"name" text NOT NULL,
	"settings" jsonb NOT NULL,
	"near" double precision,
	"far" double precision,
	"hysteresis" double precision,
	"debounce_ms" integer DEFAULT 0 NOT NULL,
	"rearm_ms" integer DEFAULT 0 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "captures" ADD CONSTRAINT "captures_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "captures" ADD CONSTRAINT "captures_sensor_id_sensors_id_fk" FOREIGN KEY ("sensor_id") REFERENCES "public"."sensors"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "captures" ADD CONSTRAINT "captures_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "controllers" ADD CONSTRAINT "controllers_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outputs" ADD CONSTRAINT "outputs_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outputs" ADD CONSTRAINT "outputs_prop_id_props_id_fk" FOREIGN KEY ("prop_id") REFERENCES "public"."props"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "prop_files" ADD CONSTRAINT "prop_files_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "prop_files" ADD CONSTRAINT "prop_files_prop_id_props_id_fk" FOREIGN KEY ("prop_id") REFERENCES "public"."props"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "prop_files" ADD CONSTRAINT "prop_files_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "props" ADD CONSTRAINT "props_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "props" ADD CONSTRAINT "props_room_id_rooms_id_fk" FOREIGN KEY ("room_id") REFERENCES "public"."rooms"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "props" ADD CONSTRAINT "props_controller_id_controllers_id_fk" FOREIGN KEY ("controller_id") REFERENCES "public"."controllers"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sensors" ADD CONSTRAINT "sensors_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sensors" ADD CONSTRAINT "sensors_prop_id_props_id_fk" FOREIGN KEY ("prop_id") REFERENCES "public"."props"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "captures_sensor" ON "captures" USING btree ("venue_id","sensor_id","uploaded_at");--> statement-breakpoint
CREATE INDEX "controllers_venue" ON "controllers" USING btree ("venue_id","name");--> statement-breakpoint
CREATE INDEX "outputs_prop" ON "outputs" USING btree ("venue_id","prop_id");--> statement-breakpoint
CREATE INDEX "outputs_kind" ON "outputs" USING btree ("venue_id","kind");--> statement-breakpoint
CREATE INDEX "prop_files_prop" ON "prop_files" USING btree ("venue_id","prop_id");--> statement-breakpoint
CREATE INDEX "props_venue_name" ON "props" USING btree ("venue_id","name");--> statement-breakpoint
CREATE INDEX "props_venue_status" ON "props" USING btree ("venue_id","status");--> statement-breakpoint
CREATE INDEX "props_venue_room" ON "props" USING btree ("venue_id","room_id");--> statement-breakpoint
CREATE INDEX "props_venue_updated" ON "props" USING btree ("venue_id","updated_at");--> statement-breakpoint
CREATE INDEX "sensors_prop" ON "sensors" USING btree ("venue_id","prop_id");--> statement-breakpoint
CREATE INDEX "sensors_kind" ON "sensors" USING btree ("venue_id","kind");