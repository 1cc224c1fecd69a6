-- Results stored before received_at existed were stored when they arrived: their received time is
-- their recorded time. The append-only trigger is paused for this one backfill only.
ALTER TABLE check_results DISABLE TRIGGER check_results_append_only;
--> statement-breakpoint
UPDATE check_results SET received_at = recorded_at;
--> statement-breakpoint
ALTER TABLE check_results ENABLE TRIGGER check_results_append_only;
