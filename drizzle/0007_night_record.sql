CREATE TABLE "check_photos" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"show_id" uuid NOT NULL,
	"key" text NOT NULL,
	"content_type" text NOT NULL,
	"person_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "check_photos_key_unique" UNIQUE("key")
);
--> statement-breakpoint
ALTER TABLE "positions" ADD COLUMN "safety_post" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "check_results" ADD COLUMN "received_at" timestamp with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "check_results" ADD COLUMN "clock_suspect" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "check_results" ADD COLUMN "after_sign_off" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "sign_offs" ADD COLUMN "acknowledged" jsonb DEFAULT '[]'::jsonb NOT NULL;--> statement-breakpoint
ALTER TABLE "check_photos" ADD CONSTRAINT "check_photos_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "check_photos" ADD CONSTRAINT "check_photos_show_id_shows_id_fk" FOREIGN KEY ("show_id") REFERENCES "public"."shows"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "check_photos" ADD CONSTRAINT "check_photos_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "check_photos_show" ON "check_photos" USING btree ("show_id");