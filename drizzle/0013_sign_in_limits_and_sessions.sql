CREATE TABLE "sign_in_limits" (
	"scope" text NOT NULL,
	"key" text NOT NULL,
	"tries" integer DEFAULT 0 NOT NULL,
	"last_try_at" timestamp with time zone DEFAULT now() NOT NULL,
	"open_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sign_in_limits_scope_key_pk" PRIMARY KEY("scope","key")
);
--> statement-breakpoint
DROP TABLE "sign_in_attempts" CASCADE;--> statement-breakpoint
CREATE INDEX "sign_in_limits_last_try" ON "sign_in_limits" USING btree ("last_try_at");--> statement-breakpoint
CREATE INDEX "sessions_user" ON "sessions" USING btree ("user_id");