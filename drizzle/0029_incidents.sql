CREATE TYPE "public"."incident_event_kind" AS ENUM('follow_up', 'closed');--> statement-breakpoint
CREATE TYPE "public"."incident_kind" AS ENUM('guest_injury', 'crew_injury', 'guest_struck_crew', 'evacuation', 'false_alarm', 'near_miss', 'show_stop');--> statement-breakpoint
CREATE TABLE "incident_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"incident_id" uuid NOT NULL,
	"kind" "incident_event_kind" NOT NULL,
	"note" text NOT NULL,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "incidents" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"room_id" uuid,
	"kind" "incident_kind" NOT NULL,
	"happened_at" timestamp with time zone NOT NULL,
	"what_happened" text NOT NULL,
	"what_was_done" text NOT NULL,
	"first_aid" boolean NOT NULL,
	"first_aid_given" text,
	"stopped_minutes" integer DEFAULT 0 NOT NULL,
	"follow_up_by" text,
	"person_id" text,
	"reported_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "incidents_stopped_minutes" CHECK ("incidents"."stopped_minutes" >= 0)
);
--> statement-breakpoint
ALTER TABLE "incident_events" ADD CONSTRAINT "incident_events_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incident_events" ADD CONSTRAINT "incident_events_incident_id_incidents_id_fk" FOREIGN KEY ("incident_id") REFERENCES "public"."incidents"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incident_events" ADD CONSTRAINT "incident_events_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_room_id_rooms_id_fk" FOREIGN KEY ("room_id") REFERENCES "public"."rooms"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_follow_up_by_users_id_fk" FOREIGN KEY ("follow_up_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "incidents" ADD CONSTRAINT "incidents_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "incident_events_incident" ON "incident_events" USING btree ("incident_id","at");--> statement-breakpoint
CREATE UNIQUE INDEX "incident_events_one_close" ON "incident_events" USING btree ("incident_id") WHERE "incident_events"."kind" = 'closed';--> statement-breakpoint
CREATE INDEX "incidents_show" ON "incidents" USING btree ("show_id","happened_at");--> statement-breakpoint
CREATE INDEX "incidents_venue" ON "incidents" USING btree ("venue_id");