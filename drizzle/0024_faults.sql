CREATE TYPE "public"."fault_event_kind" AS ENUM('reported', 'repaired', 'retested', 'closed');--> statement-breakpoint
CREATE TYPE "public"."fault_severity" AS ENUM('stops_scene', 'degraded', 'cosmetic');--> statement-breakpoint
CREATE TABLE "fault_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"fault_id" uuid NOT NULL,
	"kind" "fault_event_kind" NOT NULL,
	"action" text,
	"parts" text,
	"minutes" integer,
	"passed" boolean,
	"check_result_id" uuid,
	"note" text,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "faults" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"prop_id" uuid NOT NULL,
	"room_id" uuid,
	"show_id" uuid,
	"check_id" uuid,
	"severity" "fault_severity" NOT NULL,
	"seen" text NOT NULL,
	"photo_key" text,
	"person_id" text,
	"reported_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "fault_events" ADD CONSTRAINT "fault_events_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fault_events" ADD CONSTRAINT "fault_events_fault_id_faults_id_fk" FOREIGN KEY ("fault_id") REFERENCES "public"."faults"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fault_events" ADD CONSTRAINT "fault_events_check_result_id_check_results_id_fk" FOREIGN KEY ("check_result_id") REFERENCES "public"."check_results"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fault_events" ADD CONSTRAINT "fault_events_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "faults" ADD CONSTRAINT "faults_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "faults" ADD CONSTRAINT "faults_prop_id_props_id_fk" FOREIGN KEY ("prop_id") REFERENCES "public"."props"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "faults" ADD CONSTRAINT "faults_room_id_rooms_id_fk" FOREIGN KEY ("room_id") REFERENCES "public"."rooms"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "faults" ADD CONSTRAINT "faults_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "faults" ADD CONSTRAINT "faults_check_id_checks_id_fk" FOREIGN KEY ("check_id") REFERENCES "public"."checks"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "faults" ADD CONSTRAINT "faults_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "fault_events_fault" ON "fault_events" USING btree ("fault_id","at");--> statement-breakpoint
CREATE INDEX "faults_prop" ON "faults" USING btree ("prop_id","reported_at");--> statement-breakpoint
CREATE INDEX "faults_venue" ON "faults" USING btree ("venue_id");