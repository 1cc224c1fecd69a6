CREATE TABLE "stand_down_restores" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"stand_down_id" uuid NOT NULL,
	"reason" text NOT NULL,
	"person_id" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "stand_down_restores_stand_down_id_unique" UNIQUE("stand_down_id")
);
--> statement-breakpoint
DROP INDEX "stand_downs_show_prop";--> statement-breakpoint
ALTER TABLE "stand_down_restores" ADD CONSTRAINT "stand_down_restores_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stand_down_restores" ADD CONSTRAINT "stand_down_restores_stand_down_id_stand_downs_id_fk" FOREIGN KEY ("stand_down_id") REFERENCES "public"."stand_downs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "stand_down_restores" ADD CONSTRAINT "stand_down_restores_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "stand_downs_show_prop" ON "stand_downs" USING btree ("show_id","prop_id");