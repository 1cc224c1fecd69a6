-- Check history and sign-offs are append-only: a correction is a new row, never an edit.
-- Changes made by foreign-key actions (a show or venue removed, a person's account removed: trigger
-- depth 2) are let through; a statement run directly (depth 1) is refused.
CREATE OR REPLACE FUNCTION gloaming_refuse_history_change() RETURNS trigger AS $$
BEGIN
	IF pg_trigger_depth() > 1 AND TG_OP = 'DELETE' THEN
		RETURN OLD;
	END IF;
	IF pg_trigger_depth() > 1 THEN
		RETURN NEW;
	END IF;
	RAISE EXCEPTION '% is append-only: record a new entry instead of changing one', TG_TABLE_NAME
		USING ERRCODE = 'restrict_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER check_results_append_only BEFORE UPDATE OR DELETE ON check_results
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
--> statement-breakpoint
CREATE TRIGGER sign_offs_append_only BEFORE UPDATE OR DELETE ON sign_offs
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
--> statement-breakpoint
CREATE TRIGGER stand_downs_append_only BEFORE UPDATE OR DELETE ON stand_downs
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_history_change();
