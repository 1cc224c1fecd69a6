ALTER TABLE "venues" ADD COLUMN "checklist_inputs_version" bigint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "shows" ADD COLUMN "checklist_version" bigint;