-- Change records are history like check results: never changed, never removed, except with their
-- venue or their prop. A sensor or output removed later only loses its link (ON DELETE SET NULL).
CREATE OR REPLACE FUNCTION gloaming_refuse_change_record_change() RETURNS trigger AS $$
BEGIN
	IF pg_trigger_depth() > 1 AND TG_OP = 'UPDATE' THEN
		RETURN NEW;
	END IF;
	IF pg_trigger_depth() > 1 AND TG_OP = 'DELETE' THEN
		IF NOT EXISTS (SELECT 1 FROM venues WHERE id = OLD.venue_id)
			OR NOT EXISTS (SELECT 1 FROM props WHERE id = OLD.prop_id) THEN
			RETURN OLD;
		END IF;
	END IF;
	RAISE EXCEPTION '% is append-only: record a new entry instead of changing one', TG_TABLE_NAME
		USING ERRCODE = 'restrict_violation';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER change_records_append_only BEFORE UPDATE OR DELETE ON change_records
	FOR EACH ROW EXECUTE FUNCTION gloaming_refuse_change_record_change();
--> statement-breakpoint
-- A sign-off ends the re-test lines of the props it covered on later nights: their checklists
-- are generated again, like after any other change to a checklist's inputs.
CREATE TRIGGER sign_offs_checklist_ins AFTER INSERT ON sign_offs REFERENCING NEW TABLE AS changed_new
	FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_inputs_changed();
--> statement-breakpoint
CREATE TRIGGER change_records_checklist_ins AFTER INSERT ON change_records REFERENCING NEW TABLE AS changed_new
	FOR EACH STATEMENT EXECUTE FUNCTION gloaming_checklist_inputs_changed();
