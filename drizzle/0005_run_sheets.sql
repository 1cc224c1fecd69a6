CREATE TABLE "run_sheet_sends" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"person_id" text NOT NULL,
	"content_hash" text NOT NULL,
	"revision" integer NOT NULL,
	"sequence" integer NOT NULL,
	"snapshot" jsonb NOT NULL,
	"reason" text NOT NULL,
	"mail_message_id" uuid,
	"queued_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "venues" ADD COLUMN "run_sheet_lead_hours" integer DEFAULT 24 NOT NULL;--> statement-breakpoint
ALTER TABLE "run_sheet_sends" ADD CONSTRAINT "run_sheet_sends_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_sheet_sends" ADD CONSTRAINT "run_sheet_sends_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_sheet_sends" ADD CONSTRAINT "run_sheet_sends_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_sheet_sends" ADD CONSTRAINT "run_sheet_sends_mail_message_id_mail_messages_id_fk" FOREIGN KEY ("mail_message_id") REFERENCES "public"."mail_messages"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "run_sheet_sends" ADD CONSTRAINT "run_sheet_sends_queued_by_users_id_fk" FOREIGN KEY ("queued_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "run_sheet_sends_revision" ON "run_sheet_sends" USING btree ("show_id","person_id","revision");--> statement-breakpoint
CREATE INDEX "run_sheet_sends_venue_show" ON "run_sheet_sends" USING btree ("venue_id","show_id");