ALTER TABLE "check_results" ADD COLUMN "from_board" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "check_results" ADD COLUMN "board_read_at" timestamp with time zone;