CREATE TABLE "board_keys" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"venue_id" uuid NOT NULL,
	"controller_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"hint" text NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	CONSTRAINT "board_keys_token_hash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "reading_minutes" (
	"venue_id" uuid NOT NULL,
	"sensor_id" uuid NOT NULL,
	"minute" timestamp with time zone NOT NULL,
	"count" integer NOT NULL,
	"mean" double precision NOT NULL,
	"sigma" double precision NOT NULL,
	"min" double precision NOT NULL,
	"max" double precision NOT NULL,
	"last_seq" bigint NOT NULL,
	CONSTRAINT "reading_minutes_sensor_id_minute_pk" PRIMARY KEY("sensor_id","minute")
);
--> statement-breakpoint
CREATE TABLE "reading_rollup_state" (
	"id" integer PRIMARY KEY NOT NULL,
	"through" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "board_keys" ADD CONSTRAINT "board_keys_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "board_keys" ADD CONSTRAINT "board_keys_controller_id_controllers_id_fk" FOREIGN KEY ("controller_id") REFERENCES "public"."controllers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "board_keys" ADD CONSTRAINT "board_keys_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_minutes" ADD CONSTRAINT "reading_minutes_venue_id_venues_id_fk" FOREIGN KEY ("venue_id") REFERENCES "public"."venues"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_minutes" ADD CONSTRAINT "reading_minutes_sensor_id_sensors_id_fk" FOREIGN KEY ("sensor_id") REFERENCES "public"."sensors"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "board_keys_controller" ON "board_keys" USING btree ("venue_id","controller_id");--> statement-breakpoint
CREATE INDEX "reading_minutes_venue" ON "reading_minutes" USING btree ("venue_id","minute");