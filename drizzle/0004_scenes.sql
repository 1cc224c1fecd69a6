CREATE TYPE "public"."response_shape" AS ENUM('rise', 'step', 'fall', 'points');--> statement-breakpoint
CREATE TYPE "public"."scene_trigger" AS ENUM('sensor', 'timer', 'manual');--> statement-breakpoint
CREATE TABLE "scene_cues" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"scene_id" uuid NOT NULL,
	"output_id" uuid NOT NULL,
	"start_ms" integer NOT NULL,
	"action" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "scene_responses" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"scene_id" uuid NOT NULL,
	"sensor_id" uuid NOT NULL,
	"output_id" uuid NOT NULL,
	"shape" "response_shape" DEFAULT 'rise' NOT NULL,
	"threshold" double precision,
	"points" jsonb,
	"min_level" double precision DEFAULT 0 NOT NULL,
	"max_level" double precision DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "scenes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"room_id" uuid,
	"name" text NOT NULL,
	"trigger" "scene_trigger" DEFAULT 'manual' NOT NULL,
	"trigger_sensor_id" uuid,
	"loop_ms" integer,
	"length_ms" integer NOT NULL,
	"rearm_ms" integer DEFAULT 0 NOT NULL,
	"runs_on_show_nights" boolean DEFAULT true NOT NULL,
	"notes" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "show_scene_exclusions" (
	"show_id" uuid NOT NULL,
	"scene_id" uuid NOT NULL,
	"venue_id" uuid NOT NULL,
	"reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "show_scene_exclusions_show_id_scene_id_pk" PRIMARY KEY("show_id","scene_id")
);
--> statement-breakpoint
CREATE TABLE "stand_downs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"prop_id" uuid NOT NULL,
	"reason" text NOT NULL,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "sensors" ADD COLUMN "calibration" jsonb;--> statement-breakpoint
ALTER TABLE "scene_cues" ADD CONSTRAINT "scene_cues_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scene_cues" ADD CONSTRAINT "scene_cues_scene_id_scenes_id_fk" FOREIGN KEY ("scene_id") REFERENCES "public"."scenes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scene_cues" ADD CONSTRAINT "scene_cues_output_id_outputs_id_fk" FOREIGN KEY ("output_id") REFERENCES "public"."outputs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scene_responses" ADD CONSTRAINT "scene_responses_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scene_responses" ADD CONSTRAINT "scene_responses_scene_id_scenes_id_fk" FOREIGN KEY ("scene_id") REFERENCES "public"."scenes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scene_responses" ADD CONSTRAINT "scene_responses_sensor_id_sensors_id_fk" FOREIGN KEY ("sensor_id") REFERENCES "public"."sensors"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scene_responses" ADD CONSTRAINT "scene_responses_output_id_outputs_id_fk" FOREIGN KEY ("output_id") REFERENCES "public"."outputs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenes" ADD CONSTRAINT "scenes_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenes" ADD CONSTRAINT "scenes_room_id_rooms_id_fk" FOREIGN KEY ("room_id") REFERENCES "public"."rooms"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenes" ADD CONSTRAINT "scenes_trigger_sensor_id_sensors_id_fk" FOREIGN KEY ("trigger_sensor_id") REFERENCES "public"."sensors"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "show_scene_exclusions" ADD CONSTRAINT "show_scene_exclusions_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "show_scene_exclusions" ADD CONSTRAINT "show_scene_exclusions_scene_id_scenes_id_fk" FOREIGN KEY ("scene_id") REFERENCES "public"."scenes"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "show_scene_exclusions" ADD CONSTRAINT "show_scene_exclusions_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stand_downs" ADD CONSTRAINT "stand_downs_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stand_downs" ADD CONSTRAINT "stand_downs_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stand_downs" ADD CONSTRAINT "stand_downs_prop_id_props_id_fk" FOREIGN KEY ("prop_id") REFERENCES "public"."props"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stand_downs" ADD CONSTRAINT "stand_downs_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "scene_cues_scene" ON "scene_cues" USING btree ("scene_id","start_ms");--> statement-breakpoint
CREATE INDEX "scene_responses_scene" ON "scene_responses" USING btree ("scene_id");--> statement-breakpoint
CREATE INDEX "scenes_venue_room" ON "scenes" USING btree ("venue_id","room_id");--> statement-breakpoint
CREATE UNIQUE INDEX "scenes_venue_name" ON "scenes" USING btree ("venue_id","name");--> statement-breakpoint
CREATE UNIQUE INDEX "stand_downs_show_prop" ON "stand_downs" USING btree ("show_id","prop_id");